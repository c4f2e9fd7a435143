// Skeletons of every domain of a labeled frame: thinning (Wasm), the pruned skeleton graph,
// the per-domain columns and kinds, and the per-phase summaries.
import { SkeletonWorkspace, type ConnectivityRule } from "../wasm/skeleton";
import { kernels } from "../wasm/instance";
import { viewI32 } from "../wasm/heap";
import { skeletonGraph, prunedSkeletonLater, type SkeletonGraph } from "./skeleton";
import { classifyDomains, summarizePhase, type SkeletonColumns, type PhaseSkeletonSummary } from "./classify";

export type SkeletonBoundary = "open" | "periodic" | "periodic-x" | "periodic-y";

export interface SkeletonOptions {
  /** Sides of the frame, as used for labeling. @default 'open' */
  boundary?: SkeletonBoundary;
  /** Connectivity of the up phase (down gets the other), as used for labeling. @default 8 */
  connectivity?: 8 | 4 | "saddle";
  /** Saddle decisions per quad (1 up joins, 0 down joins, 2 elsewhere); required with 'saddle'. */
  quads?: Uint8Array;
  /** A terminal branch shorter than spurFactor x the half-width at its junction is pruned. @default 3 */
  spurFactor?: number;
  /** Junctions joined by a branch shorter than this x the local width are one junction. @default 1 */
  junctionMergeFactor?: number;
  /** Below this aspect ((length - width) / width, see SkeletonColumns.aspect) an unbranched domain is a bubble. @default 1.25 */
  bubbleMaxAspect?: number;
  /** Length of one pixel in the output unit. @default 1 */
  pixelSize?: number;
  /** Thinning order (see ThinGeometry.order). @default 'directional' */
  thinning?: "directional" | "distance";
}

export interface ResolvedSkeletonOptions {
  boundary: SkeletonBoundary;
  connectivity: 8 | 4 | "saddle";
  spurFactor: number;
  junctionMergeFactor: number;
  bubbleMaxAspect: number;
  pixelSize: number;
  thinning: "directional" | "distance";
}

/** A labeled frame: phase map, labels 1..count (same boundary and connectivity). */
export interface LabeledFrame {
  width: number;
  height: number;
  phase: Uint8Array;
  labels: Int32Array;
  count: number;
}

export interface SkeletonAnalysis {
  options: ResolvedSkeletonOptions;
  columns: SkeletonColumns;
  up: PhaseSkeletonSummary;
  down: PhaseSkeletonSummary;
  /** 1 on the skeleton of each pixel's phase, as thinned (a copy: the caller's `into` buffer when given). */
  skeleton: Uint8Array;
  /** 1 on the skeleton pixels that survive spur pruning (made on first read). */
  pruned: Uint8Array;
  /** Distance to the other phase, px (a copy, as `skeleton`). */
  distance: Float32Array;
  graph: SkeletonGraph;
}

const KNOWN = new Set(["boundary", "connectivity", "quads", "spurFactor", "junctionMergeFactor", "bubbleMaxAspect", "pixelSize", "thinning"]);

function positive(name: string, v: number): number {
  if (typeof v !== "number" || !Number.isFinite(v) || v < 0) {
    throw new Error(`options.${name}: expected a finite number >= 0, got ${String(v)}`);
  }
  return v;
}

export function resolveSkeletonOptions(o: SkeletonOptions = {}): ResolvedSkeletonOptions {
  for (const key of Object.keys(o)) {
    if (!KNOWN.has(key)) throw new Error(`options.${key}: unknown option (known: ${[...KNOWN].join(", ")})`);
  }
  const boundary = o.boundary ?? "open";
  if (!["open", "periodic", "periodic-x", "periodic-y"].includes(boundary)) {
    throw new Error(`options.boundary: expected 'open', 'periodic', 'periodic-x' or 'periodic-y', got ${String(boundary)}`);
  }
  const connectivity = o.connectivity ?? 8;
  if (connectivity !== 8 && connectivity !== 4 && connectivity !== "saddle") {
    throw new Error(`options.connectivity: expected 8, 4 or 'saddle', got ${String(connectivity)}`);
  }
  const pixelSize = positive("pixelSize", o.pixelSize ?? 1);
  if (pixelSize === 0) throw new Error("options.pixelSize: expected a number > 0, got 0");
  return {
    boundary, connectivity,
    spurFactor: positive("spurFactor", o.spurFactor ?? 3),
    junctionMergeFactor: positive("junctionMergeFactor", o.junctionMergeFactor ?? 1),
    bubbleMaxAspect: positive("bubbleMaxAspect", o.bubbleMaxAspect ?? 1.25),
    pixelSize,
    thinning: o.thinning === "distance" ? "distance" : o.thinning === undefined || o.thinning === "directional" ? "directional" : bad("thinning", o.thinning),
  };
}

function bad(name: string, v: unknown): never {
  throw new Error(`options.${name}: expected 'directional' or 'distance', got ${String(v)}`);
}

/**
 * The frame's phase map and labels, copied where they are views into Wasm memory (the skeleton
 * workspaces may grow it, which would detach them), after checking their length; with
 * `labelView`, labels in Wasm memory stay the view they are (the caller reads them by offset).
 */
export function frameMaps(frame: LabeledFrame, cells: "pixels" | "sites", labelView = false): { phase: Uint8Array; labels: Int32Array; n: number } {
  const mem = kernels().memory.buffer;
  const phase = frame.phase.buffer === mem ? frame.phase.slice() : frame.phase;
  const labels = frame.labels.buffer === mem && !labelView ? frame.labels.slice() : frame.labels;
  const n = frame.width * frame.height;
  if (phase.length !== n || labels.length !== n) {
    throw new Error(`frame: expected phase and labels of ${frame.width} x ${frame.height} = ${n} ${cells}, got ${phase.length} and ${labels.length}`);
  }
  return { phase, labels, n };
}

let shared: SkeletonWorkspace | undefined;

/** Skeleton workspace for frames of one shape (reused by `analyzeSkeletons` between equal shapes). */
export function skeletonWorkspace(width: number, height: number): SkeletonWorkspace {
  if (!shared || shared.width !== width || shared.height !== height) {
    shared?.dispose();
    shared = new SkeletonWorkspace(width, height);
  }
  return shared;
}

/**
 * Thins both phases, builds and prunes every domain's skeleton graph, and classifies each domain
 * as bubble, stripe or labyrinth. `frame.labels` must come from the same boundary and connectivity.
 */
export function analyzeSkeletons(
  frame: LabeledFrame, options: SkeletonOptions = {}, workspace?: SkeletonWorkspace,
  /**
   * Buffers of the frame's size to copy the skeleton and distance map into (the caller owns
   * them; else new arrays), or 'views': `skeleton` and `distance` read the workspace itself
   * (fresh views on each read, valid until its next run; for a caller that keeps the workspace).
   */
  into?: { skeleton: Uint8Array; distance: Float32Array } | "views",
): SkeletonAnalysis {
  const o = resolveSkeletonOptions(options);
  const { width, height, count } = frame;
  // Labels that are already in Wasm memory (a labeling workspace's) are read there by offset.
  const labelsAt = frame.labels.buffer === kernels().memory.buffer ? frame.labels.byteOffset : -1;
  const { phase, labels, n } = frameMaps(frame, "pixels", labelsAt >= 0);
  const rule: ConnectivityRule = o.connectivity === 8 ? 0 : o.connectivity === 4 ? 1 : 2;
  const periodicX = o.boundary === "periodic" || o.boundary === "periodic-x";
  const periodicY = o.boundary === "periodic" || o.boundary === "periodic-y";
  const ws = workspace ?? skeletonWorkspace(width, height);
  const r = ws.run(phase, { periodicX, periodicY, rule, quads: options.quads, order: o.thinning });
  const views = into === "views";
  const reuse = !views && into !== undefined && into.skeleton.length === n && into.distance.length === n;
  let skeleton = r.skeleton, distance = r.distance;
  if (reuse) { into.skeleton.set(r.skeleton); into.distance.set(r.distance); skeleton = into.skeleton; distance = into.distance; }
  else if (!views) { skeleton = r.skeleton.slice(); distance = r.distance.slice(); }
  // Area, phase and largest distance of every domain, run by run of one label (Wasm); the labels
  // stay in the workspace (or where they are) and the adjacency carries them by skeleton index.
  const area = new Float64Array(count), maxD = new Float64Array(count), domainPhase = new Uint8Array(count);
  const bad = labelsAt >= 0
    ? ws.domainTotalsAt(labelsAt, count, area, maxD, domainPhase)
    : ws.domainTotals(labels, count, area, maxD, domainPhase);
  if (bad >= 0) {
    const got = labelsAt >= 0 ? viewI32(labelsAt, n)[bad] : labels[bad];
    throw new Error(`frame.labels: expected ids 1..${count}, got ${got} at pixel ${bad}`);
  }
  const compactAdjacency = ws.compactNeighbours();
  // (a fresh view of labels read by offset: the workspace's buffers may have grown the memory)
  const graphLabels = labelsAt >= 0 ? viewI32(labelsAt, n) : labels;
  const maps = views ? ws.lastRun() : { skeleton, distance };
  const graph = skeletonGraph(
    { width, height, phase, labels: graphLabels, count, ...maps, periodicX, periodicY, rule, quads: options.quads, compactAdjacency },
    { spurFactor: o.spurFactor, junctionMergeFactor: o.junctionMergeFactor },
  );
  const columns = classifyDomains(graph, count, maxD, { bubbleMaxAspect: o.bubbleMaxAspect, pixelSize: o.pixelSize });
  const out = {
    options: o, columns,
    up: summarizePhase(columns, domainPhase, area, 1, n, o.pixelSize),
    down: summarizePhase(columns, domainPhase, area, 0, n, o.pixelSize),
    skeleton, pruned: undefined as unknown as Uint8Array, distance, graph,
  };
  if (views) {
    // (fresh views on each read: the workspace's memory may have grown since)
    Object.defineProperty(out, "skeleton", { enumerable: true, get: () => ws.lastRun().skeleton });
    Object.defineProperty(out, "distance", { enumerable: true, get: () => ws.lastRun().distance });
  }
  // The pruned skeleton as the graph is now, its pixels made on first read (assignable).
  lazyPruned(out, prunedSkeletonLater(graph));
  return out;
}

/** `pruned` as an enumerable property made by `make` on first read (assignable like a field). */
export function lazyPruned(target: { pruned?: Uint8Array }, make: () => Uint8Array): void {
  let pruned: Uint8Array | undefined;
  Object.defineProperty(target, "pruned", {
    enumerable: true, configurable: true,
    get: () => (pruned ??= make()),
    set: (v: Uint8Array) => { pruned = v; },
  });
}
