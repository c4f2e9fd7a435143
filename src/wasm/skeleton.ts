// The TS side of the skeleton kernels: a workspace sized for one frame shape that thins both
// phases and computes the other-phase distance (local half-width) of every pixel.
import { kernels } from "./instance";
import { wasmAlloc, wasmFree, viewU8, viewI32, viewF32, viewF64 } from "./heap";
import type { KernelExports, SkeletonKernelExports, SkeletonGraphKernelExports } from "./exports";

/** Which phase is 8-connected: 0 up (down 4), 1 down (up 4), 2 saddle decisions per quad. */
export type ConnectivityRule = 0 | 1 | 2;

export interface ThinGeometry {
  periodicX: boolean;
  periodicY: boolean;
  rule: ConnectivityRule;
  /** Saddle decisions per quad (rule 2): 1 up joins, 0 down joins, 2 not a saddle quad. */
  quads?: Uint8Array;
  /**
   * Deletion order: `'directional'` passes over N, S, E, W borders until stable, each pass
   * deleting its side's simple non-end pixels at once (bit-parallel under the fixed rules; one
   * by one with a re-check under the saddle rule): skeletons close to the medial line, exactly
   * shifted with a cyclic shift of a periodic frame; `'distance'` tests each pixel once in order of distance to
   * the other phase (about 4x faster, same topology guarantees, but raster order within a level
   * biases the skeleton and can shorten a thick arm to nothing). @default 'directional'
   */
  order?: "distance" | "directional";
}

export interface ThinResult {
  /** 1 where the pixel is on the skeleton of its own phase. View: valid until the next run. */
  skeleton: Uint8Array;
  /** Distance (px, centre to centre) to the nearest pixel of the other phase. View. */
  distance: Float32Array;
  /** 2x2 blocks the thinning could not break (0 in every case measured). */
  blocksLeft: number;
}

type K = KernelExports & SkeletonKernelExports;
let tablePtr = 0;

/** Reusable Wasm memory for thinning frames of one shape. */
export class SkeletonWorkspace {
  readonly width: number;
  readonly height: number;
  private readonly ph: number;
  private readonly qm: number;
  private readonly sk: number;
  private readonly list: number;
  private readonly cand: number;
  private readonly dist: number;
  private readonly vert: number;
  private readonly scratch: number;
  private readonly counts: number;
  private readonly levels: number;
  private readonly bits: number;
  private disposed = false;
  private adjacencyBuffers: { deg: number; list: number; nbr: number } | undefined;
  private compactBuffers: { list: number; neighbours: number; degree: number; distance: number; identity: number; label: number } | undefined;
  /** Where the labels given to domainTotals since the last run are in Wasm memory (0: none). */
  private labelsAt = 0;
  private lastGeometry: ThinGeometry | undefined;
  private totals: { ptr: number; capacity: number } | undefined;
  private neighbourBits: number | undefined;
  private compactIndex: number | undefined;

  constructor(width: number, height: number) {
    if (!Number.isInteger(width) || !Number.isInteger(height) || width < 1 || height < 1) {
      throw new RangeError(`domtopo: frame size must be positive integers, got ${width} x ${height}`);
    }
    this.width = width;
    this.height = height;
    const n = width * height;
    if (tablePtr === 0) tablePtr = wasmAlloc(4096);
    this.ph = wasmAlloc(n);
    this.qm = wasmAlloc(n);
    this.sk = wasmAlloc(n);
    this.list = wasmAlloc(4 * n);
    this.cand = wasmAlloc(4 * n);
    this.dist = wasmAlloc(4 * n);
    this.vert = wasmAlloc(4 * n);
    this.scratch = wasmAlloc(32 * (3 * width + 4));
    this.levels = 2 * (width + height) + 2;
    this.counts = wasmAlloc(4 * (this.levels + 1));
    // Bit planes of both phases, row slots and a pass number per row (thinBits).
    this.bits = wasmAlloc((kernels() as K).thinBitsBytes(width, height));
  }

  /** Thins both phases of `phase` (1 up, 0 down) and fills the distance map. */
  run(phase: Uint8Array, geometry: ThinGeometry): ThinResult {
    if (this.disposed) throw new Error("domtopo: this SkeletonWorkspace was disposed");
    const { width, height } = this;
    const n = width * height;
    if (phase.length !== n) {
      throw new RangeError(`domtopo: phase map has ${phase.length} pixels, expected ${width} x ${height} = ${n}`);
    }
    if (geometry.rule === 2 && (!geometry.quads || geometry.quads.length !== n)) {
      throw new RangeError(`domtopo: the saddle rule needs ${n} quad decisions, got ${geometry.quads?.length ?? 0}`);
    }
    const k = kernels() as K;
    const ph = viewU8(this.ph, n);
    ph.set(phase);
    k.binarize(this.ph, n);
    if (geometry.rule === 2) viewU8(this.qm, n).set(geometry.quads!);
    k.setGeometry(width, height, geometry.periodicX ? 1 : 0, geometry.periodicY ? 1 : 0, geometry.rule);
    k.setBuffers(this.ph, 0, 0, this.qm);
    k.bindThin(this.sk, this.list, this.cand, tablePtr);
    k.distancePhases(this.dist, this.vert, this.scratch, width + height);
    const blocksLeft = geometry.order === "distance"
      ? k.thinByDistance(this.dist, this.counts, this.levels)
      : geometry.rule === 2 ? k.thinPhase(1) + k.thinPhase(0) : k.thinBits(this.bits);
    k.thinFinish(n);
    this.lastGeometry = geometry;
    this.labelsAt = 0;
    return { skeleton: viewU8(this.sk, n), distance: viewF32(this.dist, n), blocksLeft };
  }

  /**
   * Adjacency of the skeleton of the last `run` (as skeletonNeighbours would give it for that
   * skeleton, without copying the frame in again). Views: valid until the next call.
   */
  neighbours(): SkeletonNeighbours {
    if (this.disposed) throw new Error("domtopo: this SkeletonWorkspace was disposed");
    const g = this.lastGeometry;
    if (!g) throw new Error("domtopo: SkeletonWorkspace.neighbours() needs a run first");
    const n = this.width * this.height;
    this.adjacencyBuffers ??= { deg: wasmAlloc(n), list: wasmAlloc(4 * n), nbr: wasmAlloc(32 * n) };
    const a = this.adjacencyBuffers;
    return adjacencyOf(this.width, this.height, g, this.ph, this.sk, this.qm, a.deg, a.list, a.nbr);
  }

  /**
   * The same adjacency as `neighbours()`, numbered by skeleton index (raster order) and with
   * each skeleton pixel's distance, without the frame-sized neighbour lists (the skeleton
   * graph's input). Pointers into Wasm memory: valid until the next call. Under a fixed rule
   * the tables come from bit planes of the skeleton; `kernel: 'bytes'` takes the byte-map
   * kernel instead (the saddle rule's; the same tables, for comparison).
   */
  compactNeighbours(kernel: "auto" | "bytes" = "auto"): CompactSkeletonNeighbours {
    if (this.disposed) throw new Error("domtopo: this SkeletonWorkspace was disposed");
    const g = this.lastGeometry;
    if (!g) throw new Error("domtopo: SkeletonWorkspace.compactNeighbours() needs a run first");
    const { width, height } = this;
    const n = width * height;
    // Sized for a skeleton of every pixel (a thinned frame has far fewer; 49 bytes a pixel).
    this.compactBuffers ??= {
      list: wasmAlloc(4 * n), neighbours: wasmAlloc(32 * n), degree: wasmAlloc(n),
      distance: wasmAlloc(4 * n), identity: wasmAlloc(4 * n), label: wasmAlloc(4 * n),
    };
    const c = this.compactBuffers;
    const k = kernels() as K & SkeletonGraphKernelExports;
    k.setGeometry(width, height, g.periodicX ? 1 : 0, g.periodicY ? 1 : 0, g.rule);
    k.setBuffers(this.ph, 0, 0, this.qm);
    const lab = this.labelsAt;
    let count: number;
    if (g.rule !== 2 && kernel === "auto") {
      this.neighbourBits ??= wasmAlloc(k.neighbourBitsBytes(width, height));
      count = k.skeletonNeighboursBits(this.sk, this.dist, this.neighbourBits, c.list, c.neighbours, c.degree, c.distance, c.identity, lab, c.label);
    } else {
      // (its pixel-to-index scratch, frame-sized, only for this kernel)
      this.compactIndex ??= wasmAlloc(4 * n);
      count = k.skeletonNeighboursCompact(this.sk, this.dist, this.compactIndex, c.list, c.neighbours, c.degree, c.distance, c.identity, lab, c.label);
    }
    const out: CompactSkeletonNeighbours = { count, list: c.list, neighbours: c.neighbours, degree: c.degree, distance: c.distance, identity: c.identity };
    if (lab) out.label = c.label;
    return out;
  }

  /**
   * Pixel count, phase and largest distance to the other phase of every domain of `labels`
   * (ids 1..count, the frame of the last `run`), into the given arrays. Returns the first pixel
   * whose label is outside 1..count, or -1. A later `compactNeighbours()` (before the next run)
   * also gives each skeleton index its label.
   */
  domainTotals(labels: Int32Array, count: number, area: Float64Array, maxDistance: Float64Array, domainPhase: Uint8Array): number {
    if (this.disposed) throw new Error("domtopo: this SkeletonWorkspace was disposed");
    const n = this.width * this.height;
    if (labels.length !== n) throw new RangeError(`domtopo: labels have ${labels.length} pixels, expected ${n}`);
    // The candidate list is free after a run: it takes the labels.
    viewI32(this.cand, n).set(labels);
    return this.domainTotalsAt(this.cand, count, area, maxDistance, domainPhase);
  }

  /**
   * domainTotals of labels that are already in Wasm memory at byte offset `labelsPtr` (n i32,
   * e.g. a labeling workspace's), read there; they must stay there until the next run.
   */
  domainTotalsAt(labelsPtr: number, count: number, area: Float64Array, maxDistance: Float64Array, domainPhase: Uint8Array): number {
    if (this.disposed) throw new Error("domtopo: this SkeletonWorkspace was disposed");
    const n = this.width * this.height;
    if (!this.totals || this.totals.capacity < count) {
      if (this.totals) wasmFree(this.totals.ptr);
      const capacity = Math.max(64, 2 * count);
      this.totals = { ptr: wasmAlloc(17 * capacity + 16), capacity };
    }
    const k = kernels() as K & SkeletonGraphKernelExports;
    this.labelsAt = labelsPtr;
    const t = this.totals, cap = t.capacity;
    const bad = k.domainTotals(labelsPtr, this.ph, this.dist, n, count, t.ptr, t.ptr + 8 * cap, t.ptr + 16 * cap);
    area.set(viewF64(t.ptr, count));
    maxDistance.set(viewF64(t.ptr + 8 * cap, count));
    domainPhase.set(viewU8(t.ptr + 16 * cap, count));
    return bad;
  }

  /** The skeleton and distance map of the last run as fresh views (valid until the next run). */
  lastRun(): { skeleton: Uint8Array; distance: Float32Array } {
    const n = this.width * this.height;
    return { skeleton: viewU8(this.sk, n), distance: viewF32(this.dist, n) };
  }

  /** Returns the workspace's memory to the heap. */
  dispose(): void {
    if (this.disposed) return;
    this.disposed = true;
    if (this.totals) wasmFree(this.totals.ptr);
    if (this.adjacencyBuffers) for (const p of [this.adjacencyBuffers.deg, this.adjacencyBuffers.list, this.adjacencyBuffers.nbr]) wasmFree(p);
    if (this.compactBuffers) for (const p of Object.values(this.compactBuffers)) wasmFree(p);
    if (this.neighbourBits !== undefined) wasmFree(this.neighbourBits);
    if (this.compactIndex !== undefined) wasmFree(this.compactIndex);
    for (const p of [this.ph, this.qm, this.sk, this.list, this.cand, this.dist, this.vert, this.scratch, this.counts, this.bits]) wasmFree(p);
  }
}

/** One-shot thinning: copies the skeleton and distance map out of Wasm memory. */
export function thinPhases(
  phase: Uint8Array,
  width: number,
  height: number,
  geometry: ThinGeometry,
): { skeleton: Uint8Array; distance: Float32Array; blocksLeft: number } {
  const ws = new SkeletonWorkspace(width, height);
  try {
    const r = ws.run(phase, geometry);
    return { skeleton: r.skeleton.slice(), distance: r.distance.slice(), blocksLeft: r.blocksLeft };
  } finally {
    ws.dispose();
  }
}

/** Skeleton pixel adjacency of one frame. Views into Wasm memory: valid until the next call. */
export interface SkeletonNeighbours {
  /** Skeleton pixels in raster order (the first `count` entries). */
  list: Int32Array;
  count: number;
  /** Number of skeleton neighbours of each pixel (0 off the skeleton). */
  degree: Uint8Array;
  /** For pixel i: 8 j + direction (0..7 = E, N, W, S, NE, NW, SW, SE) at [8 i, 8 i + degree[i]). */
  neighbours: Int32Array;
}

/**
 * Skeleton adjacency by skeleton index t (raster order), as byte offsets into Wasm memory (valid
 * until the next call): list (i32, the pixel of each index), neighbours (i32, 8 per index:
 * 8 t' + direction code, as SkeletonNeighbours), degree (u8), distance (f32, the pixel's
 * distance to the other phase), identity (i32, t at t).
 */
export interface CompactSkeletonNeighbours {
  count: number;
  list: number;
  neighbours: number;
  degree: number;
  distance: number;
  identity: number;
  /** The domain label of each index (i32), when the workspace had the frame's labels (domainTotals first). */
  label?: number;
}

let adjacency: { n: number; ph: number; sk: number; qm: number; deg: number; list: number; nbr: number } | undefined;

/**
 * Skeleton neighbours of every skeleton pixel (same phase; diagonals as the phase is connected).
 * Memory for one frame size is kept between calls (a movie reuses it).
 */
export function skeletonNeighbours(
  skeleton: Uint8Array, phase: Uint8Array, width: number, height: number, geometry: ThinGeometry,
): SkeletonNeighbours {
  const n = width * height;
  if (skeleton.length !== n || phase.length !== n) {
    throw new RangeError(`domtopo: skeleton and phase need ${n} pixels, got ${skeleton.length} and ${phase.length}`);
  }
  if (geometry.rule === 2 && (!geometry.quads || geometry.quads.length !== n)) {
    throw new RangeError(`domtopo: the saddle rule needs ${n} quad decisions, got ${geometry.quads?.length ?? 0}`);
  }
  if (!adjacency || adjacency.n !== n) {
    if (adjacency) for (const p of [adjacency.ph, adjacency.sk, adjacency.qm, adjacency.deg, adjacency.list, adjacency.nbr]) wasmFree(p);
    adjacency = { n, ph: wasmAlloc(n), sk: wasmAlloc(n), qm: wasmAlloc(n), deg: wasmAlloc(n), list: wasmAlloc(4 * n), nbr: wasmAlloc(32 * n) };
  }
  const a = adjacency;
  const ph = viewU8(a.ph, n);
  ph.set(phase);
  (kernels() as K).binarize(a.ph, n);
  viewU8(a.sk, n).set(skeleton);
  if (geometry.rule === 2) viewU8(a.qm, n).set(geometry.quads!);
  return adjacencyOf(width, height, geometry, a.ph, a.sk, a.qm, a.deg, a.list, a.nbr);
}

/** Runs the adjacency kernel on buffers already in Wasm memory. */
function adjacencyOf(
  width: number, height: number, geometry: ThinGeometry,
  ph: number, sk: number, qm: number, deg: number, list: number, nbr: number,
): SkeletonNeighbours {
  const k = kernels() as K & SkeletonGraphKernelExports;
  const n = width * height;
  k.setGeometry(width, height, geometry.periodicX ? 1 : 0, geometry.periodicY ? 1 : 0, geometry.rule);
  k.setBuffers(ph, 0, 0, qm);
  const count = k.skeletonNeighbours(sk, nbr, deg, list);
  return { list: viewI32(list, count), count, degree: viewU8(deg, n), neighbours: viewI32(nbr, 8 * n) };
}
