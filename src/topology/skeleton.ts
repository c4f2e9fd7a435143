// The skeleton graph of every domain: end pixels, junction nodes (adjacent junction pixels are
// one node), branches with their length and mean width; then spur pruning and the merging of
// junctions joined by a short branch, so that a crossing counts as one degree-4 junction.
// Pixels are adjacent as the domain's phase is connected: 4-neighbours always, a diagonal pair
// where joinsDiagonal holds for its quad (the 8-phase: always; the 4-phase: never; saddle: per
// quad). So the 4-phase's skeleton is a 4-connected line and its degrees count 4-adjacency.
import { skeletonNeighbours, type ConnectivityRule, type SkeletonNeighbours, type CompactSkeletonNeighbours } from "../wasm/skeleton";
import { kernels } from "../wasm/instance";
import { wasmAlloc, wasmFree, viewU8, viewI32, viewF32, viewF64 } from "../wasm/heap";
import type { SkeletonGraphKernelExports } from "../wasm/exports";

/** The thinned frame and the labels it belongs to. */
export interface SkeletonGraphInput {
  width: number;
  height: number;
  /** 1 up, 0 down. */
  phase: Uint8Array;
  /** Domain ids 1..count per pixel, labeled with the same rule and boundary. */
  labels: Int32Array;
  count: number;
  /** 1 on the skeleton of the pixel's own phase. */
  skeleton: Uint8Array;
  /** Distance to the other phase (px), the local half-width plus half a pixel. */
  distance: Float32Array;
  periodicX: boolean;
  periodicY: boolean;
  rule: ConnectivityRule;
  quads?: Uint8Array;
  /** The skeleton's adjacency, when already at hand (SkeletonWorkspace.neighbours() after the run that gave `skeleton`). */
  adjacency?: SkeletonNeighbours;
  /** The same by skeleton index (SkeletonWorkspace.compactNeighbours() after that run); used before `adjacency`. */
  compactAdjacency?: CompactSkeletonNeighbours;
  /**
   * Step lengths and chords by direction code, for another grid than the square one (the
   * adjacency's codes index these tables). Without it: the square tables of
   * `squareDirectionGeometry` for this frame.
   */
  directionGeometry?: DirectionGeometry;
}

/** Lengths along the skeleton by the adjacency's direction codes (0..7). */
export interface DirectionGeometry {
  /** step[d]: length of one step in direction d (px), 8 entries. */
  step: Float64Array;
  /** chord[8 a + b]: half the chord of a step in direction a followed by one in direction b (px), 64 entries. */
  chord: Float64Array;
}

export interface GraphOptions {
  /** A terminal branch shorter than spurFactor x the half-width at its junction is pruned. */
  spurFactor: number;
  /** Junctions joined by a branch shorter than junctionMergeFactor x the local width merge. */
  junctionMergeFactor: number;
}

/** The pruned graph, flat: nodes and branches of every domain. */
export interface SkeletonGraph {
  /** Per node: pixel index, domain id, degree (0 isolated point, 1 end, >= 3 junction), half-width px. Dead nodes have degree -1. */
  nodePixel: Int32Array;
  nodeDomain: Int32Array;
  nodeDegree: Int32Array;
  nodeHalfWidth: Float64Array;
  /** Per branch: end nodes (-1, -1 for a ring without node), domain, length px, summed distance and pixel count along it; alive flag. */
  branchA: Int32Array;
  branchB: Int32Array;
  branchDomain: Int32Array;
  branchLength: Float64Array;
  branchSumDistance: Float64Array;
  branchPixels: Int32Array;
  /** Largest distance to the other phase along the branch's interior (px). */
  branchMaxDistance: Float64Array;
  branchAlive: Uint8Array;
  nodeCount: number;
  branchCount: number;
  /** Per skeleton pixel: branch id (>= 0), -2 - node id for node pixels, -1 elsewhere (filled in on first read). */
  pixelOwner: Int32Array;
  /** A dead branch or node that was folded into another points at it (itself otherwise). */
  branchParent: Int32Array;
  nodeParent: Int32Array;
  /** A short branch merged into a junction: that node (-1 otherwise). */
  branchIntoNode: Int32Array;
  /** A degree-2 node dissolved into a branch: that branch (-1 otherwise). */
  nodeIntoBranch: Int32Array;
}

function follow(parent: Int32Array, i: number): number {
  while (parent[i] !== i) i = parent[i]!;
  return i;
}

/**
 * 1 on the skeleton pixels that survive pruning (pixels of pruned spurs and their end nodes are
 * 0). `pixels` (the first `count` entries): the skeleton pixels, when at hand; only they are
 * visited (every other pixel is 0 anyway).
 */
export function prunedSkeleton(g: SkeletonGraph, pixels?: ArrayLike<number>, count?: number): Uint8Array {
  return prunedSkeletonLater(g, pixels, count)();
}

/**
 * prunedSkeleton as the graph is now, its pixels made when the returned function is first
 * called (later changes to the graph do not change it: the tables that decide it are copied
 * now, which is cheaper than deciding it for a result that is often never read).
 */
export function prunedSkeletonLater(g: SkeletonGraph, pixels?: ArrayLike<number>, count?: number): () => Uint8Array {
  const nb = g.branchCount, nn = g.nodeCount;
  const branchParent = g.branchParent.slice(0, nb), branchIntoNode = g.branchIntoNode.slice(0, nb);
  const branchAlive = g.branchAlive.slice(0, nb);
  const nodeParent = g.nodeParent.slice(0, nn), nodeIntoBranch = g.nodeIntoBranch.slice(0, nn);
  const nodeDegree = g.nodeDegree.slice(0, nn);
  const known = ownersOf.get(g);
  const owner = known ? undefined : g.pixelOwner.slice();
  const list = !known && pixels ? Int32Array.from({ length: count ?? pixels.length }, (_v, t) => pixels[t]!) : undefined;
  let out: Uint8Array | undefined;
  return () => {
    if (out) return out;
    // Whether each branch's and node's pixels survive, decided once per branch and node.
    const keepBranch = new Uint8Array(nb), keepNode = new Uint8Array(nn);
    for (let b = 0; b < nb; b++) {
      const r = follow(branchParent, b);
      const into = branchIntoNode[r]!;
      keepBranch[b] = branchAlive[r] || (into >= 0 && nodeDegree[follow(nodeParent, into)]! >= 0) ? 1 : 0;
    }
    for (let v = 0; v < nn; v++) {
      const r = follow(nodeParent, v);
      const into = nodeIntoBranch[r]!;
      keepNode[v] = nodeDegree[r]! >= 0 || (into >= 0 && branchAlive[follow(branchParent, into)]) ? 1 : 0;
    }
    const keep = (o: number): number => (o >= 0 ? keepBranch[o] ?? 0 : o !== -1 ? keepNode[-2 - o]! : 0);
    if (known) {
      // A graph made here: owners by skeleton pixel, no frame-sized pass.
      out = new Uint8Array(known.n);
      for (let t = 0; t < known.pixels.length; t++) out[known.pixels[t]!] = keep(known.owners[t]!);
      return out;
    }
    out = new Uint8Array(owner!.length);
    const m = list ? list.length : owner!.length;
    for (let t = 0; t < m; t++) {
      const i = list ? list[t]! : t;
      out[i] = keep(owner![i]!);
    }
    return out;
  };
}

// Square grid: direction codes of the adjacency kernel 0..7 = E, N, W, S, NE, NW, SW, SE (y
// grows downward); a step is 1 along a row or column and sqrt 2 on a diagonal.
const DX = [1, 0, -1, 0, 1, -1, -1, 1];
const DY = [0, -1, 0, 1, -1, -1, 1, 1];
const SQUARE_STEP = Float64Array.from(DX, (dx, d) => Math.hypot(dx, DY[d]!));
const CHORD = Float64Array.from({ length: 9 }, (_v, k) => Math.hypot(Math.floor(k / 3), k % 3) / 2);
let squareCache: { key: string; geometry: DirectionGeometry } | undefined;

/**
 * The square grid's tables for a frame (shared between calls: do not modify). Half the chord to
 * the pixel two steps back: straight runs count 1 a step, diagonal runs sqrt 2, and a
 * 4-connected staircase its diagonal length (not its 1 + 1 steps). Two steps apart, |dx| and
 * |dy| are 0, 1 or 2: CHORD[3 dx + dy] = sqrt(dx^2 + dy^2) / 2; on a periodic axis (3 pixels or
 * more, as the adjacency wraps) the shorter way round counts (a frame 3 pixels wide).
 */
export function squareDirectionGeometry(width: number, height: number, periodicX: boolean, periodicY: boolean): DirectionGeometry {
  const px = periodicX && width >= 3, py = periodicY && height >= 3;
  const key = `${width} ${height} ${px} ${py}`;
  if (squareCache?.key === key) return squareCache.geometry;
  const chord = new Float64Array(64);
  for (let a = 0; a < 8; a++) for (let b = 0; b < 8; b++) {
    let dx = Math.abs(DX[a]! + DX[b]!), dy = Math.abs(DY[a]! + DY[b]!);
    if (px && dx > width / 2) dx = width - dx;
    if (py && dy > height / 2) dy = height - dy;
    chord[8 * a + b] = CHORD[3 * dx + dy]!;
  }
  squareCache = { key, geometry: { step: SQUARE_STEP, chord } };
  return squareCache.geometry;
}

// Wasm blocks of the walk, kept between calls and grown as needed (a movie reuses them; the
// results are fresh arrays copied out of them).
const blocks = new Map<string, { ptr: number; bytes: number }>();
function block(name: string, bytes: number): number {
  const b = blocks.get(name);
  if (b && b.bytes >= bytes) return b.ptr;
  if (b) wasmFree(b.ptr);
  const size = Math.max(bytes, b ? 2 * b.bytes : 0, 64);
  const ptr = wasmAlloc(size);
  blocks.set(name, { ptr, bytes: size });
  return ptr;
}

/** Where `a` lives in Wasm memory (its byte offset), or -1 when it is an ordinary array. */
function wasmOffset(a: ArrayBufferView): number {
  return a.buffer === kernels().memory.buffer ? a.byteOffset : -1;
}

type GraphKernels = SkeletonGraphKernelExports & { memory: WebAssembly.Memory };

/** The adjacency by skeleton index, from the input's pixel adjacency (or a fresh one); `givenDistPtr`: where the distance map is in Wasm memory, or -1. */
function compactAdjacency(input: SkeletonGraphInput, givenDistPtr: number): CompactSkeletonNeighbours {
  const { width: w, height: h, phase, skeleton: sk, distance, periodicX, periodicY, rule, quads } = input;
  const n = w * h;
  // Neighbour lists of skeleton pixels (Wasm), packed: for pixel i, nbr[8i .. 8i + deg - 1],
  // each 8 j + the direction code of the step from i to j.
  const adj = input.adjacency ?? skeletonNeighbours(sk, phase, w, h, { periodicX, periodicY, rule, quads });
  const count = adj.count;
  // Offsets first: allocating below may grow Wasm memory and detach the views.
  let degPtr = wasmOffset(adj.degree), nbrPtr = wasmOffset(adj.neighbours), listPtr = wasmOffset(adj.list);
  let distPtr = givenDistPtr;
  const degCopy = degPtr < 0 ? adj.degree.slice(0, n) : undefined;
  const nbrCopy = nbrPtr < 0 ? adj.neighbours.slice(0, 8 * n) : undefined;
  const listCopy = listPtr < 0 ? adj.list.slice(0, count) : undefined;
  const distCopy = distPtr < 0 ? distance.subarray(0, n) : undefined;
  if (degCopy) { degPtr = block("degree", n); viewU8(degPtr, n).set(degCopy); }
  if (nbrCopy) { nbrPtr = block("neighbours", 32 * n); viewI32(nbrPtr, 8 * n).set(nbrCopy); }
  if (listCopy) { listPtr = block("list", 4 * count + 4); viewI32(listPtr, count).set(listCopy); }
  if (distCopy) { distPtr = block("distance", 4 * n); viewF32(distPtr, n).set(distCopy); }
  const c: CompactSkeletonNeighbours = {
    count, list: listPtr,
    neighbours: block("compactNeighbours", 32 * count + 32), degree: block("compactDegrees", count + 16),
    distance: block("compactDistance", 4 * count + 4), identity: block("identity", 4 * count + 4),
  };
  const index = block("index", 4 * n);
  (kernels() as unknown as GraphKernels).skeletonCompact(nbrPtr, degPtr, listPtr, count, distPtr, index, c.neighbours, c.degree, c.distance, c.identity);
  return c;
}

/** Builds the pixel graph of the skeleton, then prunes and merges it. */
export function skeletonGraph(input: SkeletonGraphInput, options: GraphOptions): SkeletonGraph {
  const { width: w, height: h, periodicX, periodicY } = input;
  let { labels } = input;
  const n = w * h;
  const geometry = input.directionGeometry ?? squareDirectionGeometry(w, h, periodicX, periodicY);
  // Offsets first: allocating below may grow Wasm memory and detach the views.
  const labelsPtr = wasmOffset(labels), givenDistPtr = wasmOffset(input.distance);
  const c = input.compactAdjacency ?? compactAdjacency(input, givenDistPtr);
  const count = c.count;
  const geomPtr = block("geometry", 72 * 8), stackPtr = block("stack", 4 * count + 4), outPtr = block("out", 16);
  const pairsPtr = block("pairs", 8 * count + 8);
  const nodeCap = count + 1;
  const nodesPtr = block("nodes", 12 * nodeCap), ownerPtr = block("compactOwner", 4 * count + 4);
  let branchCap = Math.max(64, 2 * count + 16);
  let branchesPtr = block("branches", 40 * branchCap);
  branchCap = Math.floor(blocks.get("branches")!.bytes / 40);
  // (views given into Wasm memory: fresh views, in case it grew)
  if (labelsPtr >= 0) labels = viewI32(labelsPtr, n);
  const gv = viewF64(geomPtr, 72);
  gv.set(geometry.step.subarray(0, 8), 0);
  gv.set(geometry.chord.subarray(0, 64), 8);
  const k = kernels() as unknown as GraphKernels;
  while (k.skeletonWalk(c.neighbours, c.degree, c.identity, count, c.distance, ownerPtr, geomPtr, nodesPtr, nodeCap, branchesPtr, branchCap, stackPtr, outPtr, pairsPtr) < 0) {
    // More branches than room (at most one per adjacent pixel pair and one ring per pixel).
    branchCap *= 2;
    branchesPtr = block("branches", 40 * branchCap);
    branchCap = Math.floor(blocks.get("branches")!.bytes / 40);
  }
  const counts = viewI32(outPtr, 2);
  const nc = counts[0]!, bc = counts[1]!;
  const list = viewI32(c.list, count);
  const nodeTable = viewI32(nodesPtr, 3 * nodeCap);
  const nodePixel = new Int32Array(nc), nodeDegree = nodeTable.slice(2 * nodeCap, 2 * nodeCap + nc);
  const nodeDomain = new Int32Array(nc), nodeHalf = new Float64Array(nc);
  // Labels and distances by skeleton index where the adjacency has them (small arrays, read in
  // any order), else by pixel (frame-sized ones).
  const cLabel = c.label !== undefined ? viewI32(c.label, count) : undefined, cDist = viewF32(c.distance, count);
  for (let v = 0; v < nc; v++) {
    const best = nodeTable[v]!;
    nodePixel[v] = list[best]!;
    nodeDomain[v] = cLabel ? cLabel[nodeTable[nodeCap + v]!]! : labels[list[nodeTable[nodeCap + v]!]!]!;
    nodeHalf[v] = cDist[best]!;
  }
  const bi = viewI32(branchesPtr, 4 * branchCap), bf = viewF64(branchesPtr + 16 * branchCap, 3 * branchCap);
  const branchDomain = new Int32Array(bc);
  if (cLabel) for (let b = 0; b < bc; b++) branchDomain[b] = cLabel[bi[2 * branchCap + b]!]!;
  else for (let b = 0; b < bc; b++) branchDomain[b] = labels[list[bi[2 * branchCap + b]!]!]!;
  // The owner of every skeleton pixel (the walk touched no other pixel), kept by skeleton index;
  // the frame-sized pixelOwner is filled in on first use.
  const skeletonOwners = { pixels: list.slice(), owners: viewI32(ownerPtr, count).slice() };
  const identity = (m: number) => { const a = new Int32Array(m); for (let i = 0; i < m; i++) a[i] = i; return a; };
  const g: SkeletonGraph = {
    nodePixel, nodeDomain, nodeDegree, nodeHalfWidth: nodeHalf,
    branchA: bi.slice(0, bc), branchB: bi.slice(branchCap, branchCap + bc), branchDomain,
    branchLength: bf.slice(0, bc), branchSumDistance: bf.slice(branchCap, branchCap + bc),
    branchPixels: bi.slice(3 * branchCap, 3 * branchCap + bc), branchMaxDistance: bf.slice(2 * branchCap, 2 * branchCap + bc),
    branchAlive: new Uint8Array(bc).fill(1),
    nodeCount: nc, branchCount: bc,
    pixelOwner: undefined as unknown as Int32Array,
    branchParent: identity(bc),
    nodeParent: identity(nc),
    branchIntoNode: new Int32Array(bc).fill(-1),
    nodeIntoBranch: new Int32Array(nc).fill(-1),
  };
  lazyPixelOwner(g, n, skeletonOwners);
  simplify(g, options);
  return g;
}

// Owners by skeleton pixel of the graphs made here (prunedSkeleton reads them instead of the frame).
const ownersOf = new WeakMap<SkeletonGraph, { n: number; pixels: Int32Array; owners: Int32Array }>();

/** pixelOwner as an enumerable property filled in on first read (assignable like a field). */
function lazyPixelOwner(g: SkeletonGraph, n: number, o: { pixels: Int32Array; owners: Int32Array }): void {
  ownersOf.set(g, { n, ...o });
  let full: Int32Array | undefined;
  Object.defineProperty(g, "pixelOwner", {
    enumerable: true, configurable: true,
    get(): Int32Array {
      if (!full) {
        full = new Int32Array(n).fill(-1);
        for (let t = 0; t < o.pixels.length; t++) full[o.pixels[t]!] = o.owners[t]!;
      }
      return full;
    },
    set(v: Int32Array) { full = v; ownersOf.delete(g); },
  });
}

// Scratch of simplify, kept between calls: the node -> branch incidence as linked lists in
// join order (head, tail per node; value, next per entry), the spur candidates grouped by
// junction, and a per-node mark.
const sp = {
  nodeCap: 0, head: new Int32Array(0), tail: new Int32Array(0), merged: new Uint8Array(0),
  mark: new Int32Array(0), group: new Int32Array(0), groupNode: new Int32Array(0), groupStart: new Int32Array(0),
  entryCap: 0, value: new Int32Array(0), next: new Int32Array(0),
  branchCap: 0, candB: new Int32Array(0), candJ: new Int32Array(0), sorted: new Int32Array(0),
  stamp: 0,
};

function reserveSimplify(nodes: number, branches: number): void {
  if (sp.nodeCap < nodes) {
    const c = Math.max(nodes, 2 * sp.nodeCap, 256);
    sp.nodeCap = c;
    sp.head = new Int32Array(c); sp.tail = new Int32Array(c); sp.merged = new Uint8Array(c);
    sp.mark = new Int32Array(c); sp.group = new Int32Array(c); sp.groupNode = new Int32Array(c); sp.groupStart = new Int32Array(c + 1);
    sp.stamp = 0;
  }
  if (sp.branchCap < branches) {
    const c = Math.max(branches, 2 * sp.branchCap, 256);
    sp.branchCap = c;
    sp.candB = new Int32Array(c); sp.candJ = new Int32Array(c); sp.sorted = new Int32Array(c);
  }
  if (sp.entryCap < 2 * branches + 16) growEntries(2 * branches + 16);
}

function growEntries(m: number): void {
  const c = Math.max(m, 2 * sp.entryCap, 512);
  const v = new Int32Array(c), x = new Int32Array(c);
  v.set(sp.value); x.set(sp.next);
  sp.value = v; sp.next = x; sp.entryCap = c;
}

/**
 * Prunes spurs and merges close junctions until nothing changes. Every step keeps the cycle rank
 * (branches - nodes): a pruned spur takes its end node, a merge its short branch and one of the
 * two junctions, a dissolved degree-2 node joins its two branches into one.
 */
function simplify(g: SkeletonGraph, o: GraphOptions): void {
  const deg = g.nodeDegree, A = g.branchA, B = g.branchB, alive = g.branchAlive;
  const L = g.branchLength, S = g.branchSumDistance, P = g.branchPixels, hw = g.nodeHalfWidth;
  const M = g.branchMaxDistance;
  const nc = g.nodeCount, bc = g.branchCount;
  reserveSimplify(nc, bc);
  const head = sp.head, tail = sp.tail;
  head.fill(-1, 0, nc);
  let entries = 0;
  // Branches at each node, in the order they joined it (a branch can be listed more than once).
  const join = (v: number, b: number) => {
    if (entries === sp.entryCap) growEntries(entries + 1);
    const e = entries++;
    sp.value[e] = b; sp.next[e] = -1;
    if (head[v]! < 0) head[v] = e;
    else sp.next[tail[v]!] = e;
    tail[v] = e;
  };
  for (let b = 0; b < bc; b++) {
    if (A[b]! >= 0) { join(A[b]!, b); join(B[b]!, b); }
  }
  const other = (b: number, v: number) => (A[b] === v ? B[b]! : A[b]!);
  // A node whose degree fell to 2 joins its two branches (or turns its loop into a ring).
  const dissolve = (v: number) => {
    // The first two live branches at v, each once, in the order they joined v.
    let b1 = -1, b2 = -1;
    for (let e = head[v]!; e >= 0; e = sp.next[e]!) {
      const b = sp.value[e]!;
      if (!alive[b] || b === b1) continue;
      if (b1 < 0) b1 = b;
      else { b2 = b; break; }
    }
    deg[v] = -1;
    if (b1 >= 0) g.nodeIntoBranch[v] = b1;
    if (b2 < 0) {
      // Both ends of one branch: a loop through v becomes a ring.
      if (b1 >= 0) { A[b1] = -1; B[b1] = -1; }
      return;
    }
    const u = other(b1, v), x = other(b2, v);
    // b1 takes over b2: u - v - x.
    g.branchParent[b2] = b1;
    L[b1] = L[b1]! + L[b2]!; S[b1] = S[b1]! + S[b2]!; P[b1] = P[b1]! + P[b2]!;
    M[b1] = Math.max(M[b1]!, M[b2]!, hw[v]!);
    A[b1] = u; B[b1] = x;
    alive[b2] = 0;
    join(x, b1);
    if (u === x && u === v) { A[b1] = -1; B[b1] = -1; }
  };
  const merged = sp.merged;
  merged.fill(0, 0, nc);
  const mark = sp.mark, group = sp.group, groupNode = sp.groupNode, groupStart = sp.groupStart;
  const candB = sp.candB, candJ = sp.candJ, sorted = sp.sorted;
  let changed = true;
  let guard = 0;
  while (changed && guard++ < 10000) {
    changed = false;
    // Spurs: every terminal branch shorter than spurFactor x the half-width at its junction
    // goes in the same pass (so the result does not depend on the order of equal spurs; the
    // two corner spurs at a square stripe end both go, leaving the end at the fork). Where
    // every branch of a junction is such a spur (a compact blob), the two longest stay.
    // Candidates are grouped by junction, junctions in the order of their first candidate.
    const stamp = ++sp.stamp;
    let nCand = 0, nGroups = 0;
    for (let b = 0; b < bc; b++) {
      if (!alive[b] || A[b]! < 0) continue;
      const a = A[b]!, c = B[b]!;
      const end = deg[a] === 1 && deg[c]! >= 3 ? a : deg[c] === 1 && deg[a]! >= 3 ? c : -1;
      if (end < 0) continue;
      const j = other(b, end);
      if (L[b]! >= o.spurFactor * hw[j]!) continue;
      if (mark[j] !== stamp) { mark[j] = stamp; group[j] = nGroups; groupNode[nGroups] = j; groupStart[nGroups] = 0; nGroups++; }
      groupStart[group[j]!]!++;
      candB[nCand] = b; candJ[nCand] = j; nCand++;
    }
    if (nCand > 0) {
      // Counts to starts, then each group's candidates in branch order.
      let at = 0;
      for (let q = 0; q < nGroups; q++) { const m = groupStart[q]!; groupStart[q] = at; at += m; }
      groupStart[nGroups] = at;
      for (let t = 0; t < nCand; t++) sorted[groupStart[group[candJ[t]!]!]!++] = candB[t]!;
      for (let q = nGroups; q > 0; q--) groupStart[q] = groupStart[q - 1]!;
      groupStart[0] = 0;
      for (let q = 0; q < nGroups; q++) {
        const j = groupNode[q]!;
        if (deg[j]! < 3) continue;
        const s0 = groupStart[q]!, s1 = groupStart[q + 1]!;
        // Shortest first, ties by branch id (insertion sort: a junction has few spurs).
        for (let t = s0 + 1; t < s1; t++) {
          const b = sorted[t]!, lb = L[b]!;
          let r = t - 1;
          while (r >= s0 && (L[sorted[r]!]! > lb || (L[sorted[r]!]! === lb && sorted[r]! > b))) { sorted[r + 1] = sorted[r]!; r--; }
          sorted[r + 1] = b;
        }
        const size = s1 - s0;
        const cut = size >= deg[j]! ? size - 2 : size;
        for (let t = 0; t < cut; t++) {
          const b = sorted[s0 + t]!;
          alive[b] = 0;
          deg[other(b, j)] = -1;
          deg[j]!--;
          changed = true;
        }
        if (deg[j] === 2) dissolve(j);
      }
    }
    // Junctions joined by a short branch are one junction: two degree-3 nodes whose shortest
    // junction-to-junction branch is the same and shorter than junctionMergeFactor x the local
    // width (2 x the larger half-width of the two). A node merges once, so a network of close
    // junctions does not collapse into one node; a thinned crossing becomes one degree-4 node.
    const shortest = (v: number): number => {
      let best = -1;
      for (let x = head[v]!; x >= 0; x = sp.next[x]!) {
        const e = sp.value[x]!;
        if (!alive[e]) continue; // (a repeated entry cannot change a strict minimum)
        const y = other(e, v);
        if (y === v || y < 0 || deg[y]! < 3) continue;
        if (best < 0 || L[e]! < L[best]!) best = e;
      }
      return best;
    };
    for (let b = 0; b < bc; b++) {
      if (!alive[b] || A[b]! < 0) continue;
      const a = A[b]!, c = B[b]!;
      if (a === c || deg[a] !== 3 || deg[c] !== 3 || merged[a] || merged[c]) continue;
      const width = 2 * Math.max(hw[a]!, hw[c]!);
      if (L[b]! >= o.junctionMergeFactor * width) continue;
      if (shortest(a) !== b || shortest(c) !== b) continue;
      alive[b] = 0;
      merged[a] = 1; merged[c] = 1;
      // c folds into a.
      deg[a] = deg[a]! + deg[c]! - 2;
      hw[a] = Math.max(hw[a]!, hw[c]!);
      deg[c] = -1;
      g.nodeParent[c] = a;
      g.branchIntoNode[b] = a; // the joining branch's pixels are part of the junction now
      for (let x = head[c]!; x >= 0; x = sp.next[x]!) {
        const e = sp.value[x]!;
        if (!alive[e]) continue;
        if (A[e] === c) A[e] = a;
        if (B[e] === c) B[e] = a;
        join(a, e);
      }
      changed = true;
      if (deg[a] === 2) dissolve(a);
    }
  }
}
