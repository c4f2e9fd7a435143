// The skeleton graph of every domain: end pixels, junction nodes (adjacent junction pixels are
// one node), branches with their length and mean width; then spur pruning and the merging of
// junctions joined by a short branch, so that a crossing counts as one degree-4 junction.
// Pixels are adjacent as the domain's phase is connected: 4-neighbours always, a diagonal pair
// where joinsDiagonal holds for its quad (the 8-phase: always; the 4-phase: never; saddle: per
// quad). So the 4-phase's skeleton is a 4-connected line and its degrees count 4-adjacency.
import { skeletonNeighbours, type ConnectivityRule, type SkeletonNeighbours } from "../wasm/skeleton";

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
  /**
   * Step lengths and chords of another lattice's direction codes (a hexagonal frame), used
   * instead of the square grid's: step[code] (8 entries), chord[8 a + b] = half the chord
   * (distance between the pixels before and after) of a step in direction a followed by one in b.
   */
  directionGeometry?: { step: Float64Array; chord: Float64Array };
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
  /** Per skeleton pixel: branch id (>= 0), -2 - node id for node pixels, -1 elsewhere. */
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

/** 1 on the skeleton pixels that survive pruning (pixels of pruned spurs and their end nodes are 0). */
export function prunedSkeleton(g: SkeletonGraph): Uint8Array {
  const out = new Uint8Array(g.pixelOwner.length);
  for (let i = 0; i < out.length; i++) {
    const o = g.pixelOwner[i]!;
    if (o === -1) continue;
    if (o >= 0) {
      const b = follow(g.branchParent, o);
      const into = g.branchIntoNode[b]!;
      out[i] = g.branchAlive[b] || (into >= 0 && g.nodeDegree[follow(g.nodeParent, into)]! >= 0) ? 1 : 0;
    }
    else {
      const v = follow(g.nodeParent, -2 - o);
      const into = g.nodeIntoBranch[v]!;
      out[i] = g.nodeDegree[v]! >= 0 || (into >= 0 && g.branchAlive[follow(g.branchParent, into)]) ? 1 : 0;
    }
  }
  return out;
}

const SQRT2 = Math.SQRT2;
const CHORD = Float64Array.from({ length: 9 }, (_v, k) => Math.hypot(Math.floor(k / 3), k % 3) / 2);

// Per-pixel scratch, kept between calls of one frame size (a movie reuses it).
let pooled: { n: number; node: Int32Array; seen: Uint8Array } | undefined;
function scratch(n: number) {
  if (!pooled || pooled.n !== n) pooled = { n, node: new Int32Array(n), seen: new Uint8Array(n) };
  return pooled;
}

// Direction codes of the adjacency kernel: 0..7 = E, N, W, S, NE, NW, SW, SE (y grows downward).
const DX = [1, 0, -1, 0, 1, -1, -1, 1];
const DY = [0, -1, 0, 1, -1, -1, 1, 1];
const REVERSE = [2, 3, 0, 1, 6, 7, 4, 5];
let chordCache: { key: string; table: Float64Array } | undefined;

/** chords[8 a + b]: half the chord of a step in direction a followed by one in direction b. */
function chordTable(w: number, h: number, px: boolean, py: boolean): Float64Array {
  const key = `${w} ${h} ${px} ${py}`;
  if (chordCache?.key === key) return chordCache.table;
  const table = new Float64Array(64);
  for (let a = 0; a < 8; a++) for (let b = 0; b < 8; b++) {
    let dx = Math.abs(DX[a]! + DX[b]!), dy = Math.abs(DY[a]! + DY[b]!);
    if (px && dx > w / 2) dx = w - dx;
    if (py && dy > h / 2) dy = h - dy;
    table[8 * a + b] = CHORD[3 * dx + dy]!;
  }
  chordCache = { key, table };
  return table;
}

/** Builds the pixel graph of the skeleton, then prunes and merges it. */
export function skeletonGraph(input: SkeletonGraphInput, options: GraphOptions): SkeletonGraph {
  const { width: w, height: h, phase, labels, skeleton: sk, distance, periodicX, periodicY, rule, quads } = input;
  const n = w * h;
  const px = periodicX && w >= 3, py = periodicY && h >= 3;
  // Neighbour lists of skeleton pixels (Wasm), packed: for pixel i, nbr[8i .. 8i + deg - 1],
  // each 8 j + the direction of j (0..7 = E, N, W, S, NE, NW, SW, SE).
  const pool = scratch(n);
  const adj = input.adjacency ?? skeletonNeighbours(sk, phase, w, h, { periodicX, periodicY, rule, quads });
  const deg = adj.degree, nbr = adj.neighbours, skelPixels = adj.list, skelCount = adj.count;
  // Step length by direction: 1 along a row or column, sqrt 2 on a diagonal.
  const STEP = input.directionGeometry?.step ?? [1, 1, 1, 1, SQRT2, SQRT2, SQRT2, SQRT2];
  // Half the chord to the pixel two steps back: straight runs count 1 a step, diagonal runs
  // sqrt 2, and a 4-connected staircase its diagonal length (not its 1 + 1 steps). Two steps
  // apart, |dx| and |dy| are 0, 1 or 2: CHORD[3 dx + dy] = sqrt(dx^2 + dy^2) / 2; on a periodic
  // axis the shorter way round counts (a frame 3 pixels wide). chords[8 a + b]: steps a then b.
  const chords = input.directionGeometry?.chord ?? chordTable(w, h, px, py);
  // Nodes: junction clusters (deg >= 3 pixels, merged over adjacency), ends (deg 1), points (deg 0).
  const node = pool.node;
  node.fill(-1);
  const nodePixel: number[] = [], nodeDomain: number[] = [], nodeDegree: number[] = [], nodeHalf: number[] = [];
  const stack: number[] = [];
  for (let t = 0; t < skelCount; t++) {
    const i = skelPixels[t]!;
    if (node[i] !== -1 || deg[i] === 2) continue;
    const id = nodePixel.length;
    let best = i;
    node[i] = id;
    if (deg[i]! >= 3) {
      stack.push(i);
      while (stack.length) {
        const p = stack.pop()!;
        if (distance[p]! > distance[best]!) best = p;
        for (let k = 0; k < deg[p]!; k++) {
          const q = nbr[8 * p + k]! >>> 3;
          if (node[q] === -1 && deg[q]! >= 3) { node[q] = id; stack.push(q); }
        }
      }
    }
    nodePixel.push(best);
    nodeDomain.push(labels[i]!);
    nodeDegree.push(0);
    nodeHalf.push(distance[best]!);
  }
  // Branches from every node pixel; interior pixels have degree 2.
  const seen = pool.seen;
  seen.fill(0);
  const owner = new Int32Array(n).fill(-1);
  for (let t = 0; t < skelCount; t++) {
    const i = skelPixels[t]!;
    if (node[i] !== -1) owner[i] = -2 - node[i]!;
  }
  const bA: number[] = [], bB: number[] = [], bD: number[] = [], bL: number[] = [], bS: number[] = [], bP: number[] = [], bM: number[] = [];
  const endWeight = (p: number) => (deg[p] === 1 ? 1 : 0);
  for (let t = 0; t < skelCount; t++) {
    const u = skelPixels[t]!;
    const a = node[u]!;
    if (a === -1) continue;
    for (let k = 0; k < deg[u]!; k++) {
      const e0 = nbr[8 * u + k]!;
      const wpx = e0 >>> 3, d0 = e0 & 7;
      const b0 = node[wpx]!;
      if (b0 !== -1) {
        // Node pixel next to node pixel: a branch without interior (once, from the lower index).
        if (b0 === a || wpx < u) continue;
        bA.push(a); bB.push(b0); bD.push(labels[u]!); bL.push(STEP[d0]!);
        bS.push(endWeight(u) * distance[u]! + endWeight(wpx) * distance[wpx]!);
        bP.push(endWeight(u) + endWeight(wpx));
        bM.push(Math.max(distance[u]!, distance[wpx]!));
        // (width from the end pixels only: the branch has no interior)
        nodeDegree[a]!++; nodeDegree[b0]!++;
        continue;
      }
      if (seen[wpx]) continue;
      let prev = u, cur = wpx, din = d0, len = STEP[d0]! / 2;
      // Mean width from interior pixels (end pixels sit at the domain border, junctions widen).
      let sum = 0, cnt = 0, mx = 0;
      let b = -1;
      while (true) {
        seen[cur] = 1;
        owner[cur] = bA.length;
        sum += distance[cur]!; cnt++;
        if (distance[cur]! > mx) mx = distance[cur]!;
        const n0 = nbr[8 * cur]!;
        const e = n0 >>> 3 === prev ? nbr[8 * cur + 1]! : n0;
        const next = e >>> 3, dout = e & 7;
        len += chords[8 * din + dout]!;
        if (node[next] !== -1) {
          b = node[next]!;
          len += STEP[dout]! / 2;
          break;
        }
        if (seen[next]) break; // cannot happen on a clean line; stop rather than loop
        prev = cur; cur = next; din = dout;
      }
      if (b === -1) continue;
      bA.push(a); bB.push(b); bD.push(labels[u]!); bL.push(len); bS.push(sum); bP.push(cnt); bM.push(mx);
      nodeDegree[a]!++; nodeDegree[b]!++;
    }
  }
  // Rings: cycles of degree-2 pixels with no node.
  for (let t = 0; t < skelCount; t++) {
    const i = skelPixels[t]!;
    if (seen[i] || deg[i] !== 2 || node[i] !== -1) continue;
    // Entered from the second neighbour: the step in is the reverse of i's step to it.
    const e1 = nbr[8 * i + 1]!;
    let prev = e1 >>> 3, din = REVERSE[e1 & 7]!, cur = i, len = 0, sum = 0, cnt = 0, mx = 0;
    while (!seen[cur]) {
      seen[cur] = 1;
      owner[cur] = bA.length;
      sum += distance[cur]!; cnt++;
      if (distance[cur]! > mx) mx = distance[cur]!;
      const n0 = nbr[8 * cur]!;
      const e = n0 >>> 3 === prev ? nbr[8 * cur + 1]! : n0;
      len += chords[8 * din + (e & 7)]!;
      prev = cur; cur = e >>> 3; din = e & 7;
    }
    bA.push(-1); bB.push(-1); bD.push(labels[i]!); bL.push(len); bS.push(sum); bP.push(cnt); bM.push(mx);
  }
  const g: SkeletonGraph = {
    nodePixel: Int32Array.from(nodePixel), nodeDomain: Int32Array.from(nodeDomain),
    nodeDegree: Int32Array.from(nodeDegree), nodeHalfWidth: Float64Array.from(nodeHalf),
    branchA: Int32Array.from(bA), branchB: Int32Array.from(bB), branchDomain: Int32Array.from(bD),
    branchLength: Float64Array.from(bL), branchSumDistance: Float64Array.from(bS),
    branchPixels: Int32Array.from(bP), branchMaxDistance: Float64Array.from(bM), branchAlive: new Uint8Array(bA.length).fill(1),
    nodeCount: nodePixel.length, branchCount: bA.length,
    pixelOwner: owner,
    branchParent: Int32Array.from(bA, (_v, i) => i),
    nodeParent: Int32Array.from(nodePixel, (_v, i) => i),
    branchIntoNode: new Int32Array(bA.length).fill(-1),
    nodeIntoBranch: new Int32Array(nodePixel.length).fill(-1),
  };
  simplify(g, options);
  return g;
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
  // Branches at each node (lists rebuilt as the graph changes).
  const at: number[][] = Array.from({ length: g.nodeCount }, () => []);
  for (let b = 0; b < g.branchCount; b++) {
    if (A[b]! >= 0) { at[A[b]!]!.push(b); at[B[b]!]!.push(b); }
  }
  // Live branches at v, each once, in the order they joined v.
  const liveAt = (v: number): number[] => {
    const out: number[] = [];
    for (const b of at[v]!) if (alive[b] && !out.includes(b)) out.push(b);
    return out;
  };
  const other = (b: number, v: number) => (A[b] === v ? B[b]! : A[b]!);
  // A node whose degree fell to 2 joins its two branches (or turns its loop into a ring).
  const dissolve = (v: number) => {
    const bs = liveAt(v);
    deg[v] = -1;
    if (bs.length > 0) g.nodeIntoBranch[v] = bs[0]!;
    if (bs.length === 1) {
      // Both ends of one branch: a loop through v becomes a ring.
      const b = bs[0]!;
      A[b] = -1; B[b] = -1;
      return;
    }
    const [b1, b2] = bs as [number, number];
    const u = other(b1, v), x = other(b2, v);
    // b1 takes over b2: u - v - x.
    g.branchParent[b2] = b1;
    L[b1] = L[b1]! + L[b2]!; S[b1] = S[b1]! + S[b2]!; P[b1] = P[b1]! + P[b2]!;
    M[b1] = Math.max(M[b1]!, M[b2]!, hw[v]!);
    A[b1] = u; B[b1] = x;
    alive[b2] = 0;
    at[x]!.push(b1);
    if (u === x && u === v) { A[b1] = -1; B[b1] = -1; }
  };
  const merged = new Uint8Array(g.nodeCount);
  let changed = true;
  let guard = 0;
  while (changed && guard++ < 10000) {
    changed = false;
    // Spurs: every terminal branch shorter than spurFactor x the half-width at its junction
    // goes in the same pass (so the result does not depend on the order of equal spurs; the
    // two corner spurs at a square stripe end both go, leaving the end at the fork). Where
    // every branch of a junction is such a spur (a compact blob), the two longest stay.
    const spursAt = new Map<number, number[]>();
    for (let b = 0; b < g.branchCount; b++) {
      if (!alive[b] || A[b]! < 0) continue;
      const a = A[b]!, c = B[b]!;
      const end = deg[a] === 1 && deg[c]! >= 3 ? a : deg[c] === 1 && deg[a]! >= 3 ? c : -1;
      if (end < 0) continue;
      const j = other(b, end);
      if (L[b]! >= o.spurFactor * hw[j]!) continue;
      let list = spursAt.get(j);
      if (!list) { list = []; spursAt.set(j, list); }
      list.push(b);
    }
    for (const [j, list] of spursAt) {
      if (deg[j]! < 3) continue;
      list.sort((p, q) => L[p]! - L[q]! || p - q);
      const cut = list.length >= deg[j]! ? list.length - 2 : list.length;
      for (let t = 0; t < cut; t++) {
        const b = list[t]!;
        alive[b] = 0;
        deg[other(b, j)] = -1;
        deg[j]!--;
        changed = true;
      }
      if (deg[j] === 2) dissolve(j);
    }
    // Junctions joined by a short branch are one junction: two degree-3 nodes whose shortest
    // junction-to-junction branch is the same and shorter than junctionMergeFactor x the local
    // width (2 x the larger half-width of the two). A node merges once, so a network of close
    // junctions does not collapse into one node; a thinned crossing becomes one degree-4 node.
    const shortest = (v: number): number => {
      let best = -1;
      for (const e of at[v]!) {
        if (!alive[e]) continue; // (a repeated entry cannot change a strict minimum)
        const x = other(e, v);
        if (x === v || x < 0 || deg[x]! < 3) continue;
        if (best < 0 || L[e]! < L[best]!) best = e;
      }
      return best;
    };
    for (let b = 0; b < g.branchCount; b++) {
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
      for (const e of at[c]!) {
        if (!alive[e]) continue;
        if (A[e] === c) A[e] = a;
        if (B[e] === c) B[e] = a;
        at[a]!.push(e);
      }
      changed = true;
      if (deg[a] === 2) dissolve(a);
    }
  }
}
