// Workspace of the hexagonal-frame kernels (assembly/hex-label.ts, assembly/hex-thin.ts): Wasm
// buffers for one frame shape, reused frame after frame. Views are valid until the next call.
import { kernels } from "./instance";
import type { KernelExports, HexKernelExports } from "./exports";
import { wasmAlloc, wasmFree, viewU8, viewI32, viewF32, viewF64 } from "./heap";
import type { SkeletonNeighbours } from "./skeleton";

type K = KernelExports & HexKernelExports;

/** Column order of assembly/hex-label.ts (f64, K + 1 entries each, index = domain id). */
export const HEX_COLUMN_NAMES = [
  "area", "sx", "sy", "sxx", "syy", "sxy", "minX", "maxX", "minY", "maxY", "euler", "crossings",
  "flags", "phase", "cxc", "cxs", "cyc", "cys",
] as const;
export type HexColumn = (typeof HEX_COLUMN_NAMES)[number];

/** Per-frame totals of the hexagonal measure pass. */
export interface HexFrameStats {
  /** Sites, lattice edges and lattice triangles of the up phase, and of the down phase. */
  up: { v: number; e: number; f: number };
  down: { v: number; e: number; f: number };
  /** Phase changes along the three lattice directions (E, SW, SE). */
  crossings: [number, number, number];
}

/** Lattice vectors sorted by length, up to `radius` (see hexSkeletonDistance). */
function latticeOffsets(radius: number): { ab: Int32Array; length: Float64Array } {
  const rows = Math.ceil(radius / (Math.sqrt(3) / 2));
  const items: Array<[number, number, number]> = [];
  for (let b = -rows; b <= rows; b++) {
    const span = Math.ceil(radius + Math.abs(b) / 2) + 1;
    for (let a = -span; a <= span; a++) {
      if (a === 0 && b === 0) continue;
      const px = a + b / 2, py = (b * Math.sqrt(3)) / 2;
      const d = Math.hypot(px, py);
      if (d <= radius) items.push([a, b, d]);
    }
  }
  items.sort((p, q) => p[2] - q[2] || p[1] - q[1] || p[0] - q[0]);
  const ab = new Int32Array(2 * items.length), length = new Float64Array(items.length);
  items.forEach(([a, b, d], t) => { ab[2 * t] = a; ab[2 * t + 1] = b; length[t] = d; });
  return { ab, length };
}

export class HexWorkspace {
  readonly width: number;
  readonly height: number;
  readonly pixels: number;
  private k: K;
  private phasePtr: number;
  private labelPtr: number;
  private parPtr: number;
  private cqPtr: number;
  private sxPtr: number;
  private syPtr: number;
  private wfPtr: number;
  private finPtr: number;
  private statsPtr: number;
  private trigPtr: number;
  private colPtr = 0;
  private colCap = 0;
  private skPtr = 0;
  private candPtr = 0;
  private listPtr = 0;
  private distPtr = 0;
  private offPtr = 0;
  private lenPtr = 0;
  private offCount = 0;
  private offCap = 0;
  private adj: { deg: number; list: number; nbr: number } | undefined;
  private px = false;
  private py = false;
  private disposed = false;
  /** Domains of the last labeling. */
  domainCount = 0;

  constructor(width: number, height: number) {
    this.width = width;
    this.height = height;
    this.pixels = width * height;
    this.k = kernels() as K;
    const n = this.pixels;
    this.phasePtr = wasmAlloc(n + 16);
    this.labelPtr = wasmAlloc(4 * n);
    this.parPtr = wasmAlloc(4 * (n + 1));
    this.cqPtr = wasmAlloc(4 * (n + 1));
    this.sxPtr = wasmAlloc(4 * (n + 1));
    this.syPtr = wasmAlloc(4 * (n + 1));
    this.wfPtr = wasmAlloc(4 * (n + 1));
    this.finPtr = wasmAlloc(4 * (n + 1));
    this.statsPtr = wasmAlloc(9 * 8);
    this.trigPtr = wasmAlloc(8 * (4 * (width + 1) + 2 * height));
  }

  private bind(): void {
    this.k.setGeometry(this.width, this.height, this.px ? 1 : 0, this.py ? 1 : 0, 0);
    this.k.setBuffers(this.phasePtr, this.labelPtr, 0, 0);
    this.k.hexBindLabel(this.parPtr, this.cqPtr, this.sxPtr, this.syPtr, this.wfPtr, this.finPtr);
  }

  /** Copies a phase map (1 up, 0 down) in. */
  loadPhase(phase: Uint8Array): void {
    this.check();
    const dst = viewU8(this.phasePtr, this.pixels);
    for (let i = 0; i < this.pixels; i++) dst[i] = phase[i] ? 1 : 0;
  }

  /** Labels both phases (six-connected) and measures every domain. Returns K. */
  label(periodicX: boolean, periodicY: boolean): number {
    this.check();
    this.px = periodicX;
    this.py = periodicY;
    this.bind();
    const K = this.k.hexLabel();
    const need = HEX_COLUMN_NAMES.length * (K + 1) * 8;
    if (need > this.colCap) {
      if (this.colPtr) wasmFree(this.colPtr);
      this.colCap = Math.max(need, Math.ceil(this.colCap * 1.5));
      this.colPtr = wasmAlloc(this.colCap);
      this.bind();
    }
    this.k.hexMeasure(K, this.colPtr, this.statsPtr, this.trigPtr);
    this.domainCount = K;
    return K;
  }

  /** Flips the sites of `phase` domains with fewer than `minArea` sites (re-label afterwards). */
  absorb(phase: 0 | 1, minArea: number): number {
    this.bind();
    return this.k.hexAbsorb(phase, minArea);
  }

  /** View of a domain column, indices 0..K (0 unused). */
  column(name: HexColumn): Float64Array {
    const c = HEX_COLUMN_NAMES.indexOf(name);
    const K = this.domainCount;
    return viewF64(this.colPtr + 8 * c * (K + 1), K + 1);
  }

  stats(): HexFrameStats {
    const s = viewF64(this.statsPtr, 9);
    return {
      up: { v: s[0]!, e: s[1]!, f: s[2]! },
      down: { v: s[3]!, e: s[4]!, f: s[5]! },
      crossings: [s[6]!, s[7]!, s[8]!],
    };
  }

  labels(): Int32Array {
    return viewI32(this.labelPtr, this.pixels);
  }

  phase(): Uint8Array {
    return viewU8(this.phasePtr, this.pixels);
  }

  /**
   * Thins both phases of the loaded phase map and measures the distance of every skeleton site to
   * the other phase (lattice units; exact up to `cap`, which sites with no other-phase site in
   * reach get). Views valid until the next call.
   */
  thin(cap: number): { skeleton: Uint8Array; distance: Float32Array } {
    this.check();
    const n = this.pixels;
    this.skPtr ||= wasmAlloc(n);
    this.candPtr ||= wasmAlloc(4 * n);
    this.listPtr ||= wasmAlloc(4 * n);
    this.distPtr ||= wasmAlloc(4 * n);
    if (cap !== this.offCap) {
      const o = latticeOffsets(cap);
      if (this.offPtr) { wasmFree(this.offPtr); wasmFree(this.lenPtr); }
      this.offPtr = wasmAlloc(4 * o.ab.length + 8);
      this.lenPtr = wasmAlloc(8 * o.length.length + 8);
      viewI32(this.offPtr, o.ab.length).set(o.ab);
      viewF64(this.lenPtr, o.length.length).set(o.length);
      this.offCount = o.length.length;
      this.offCap = cap;
    }
    this.bind();
    this.k.hexThin(this.skPtr, this.candPtr, this.listPtr);
    this.k.hexSkeletonDistance(this.skPtr, this.distPtr, this.offPtr, this.lenPtr, this.offCount, cap);
    return { skeleton: viewU8(this.skPtr, n), distance: viewF32(this.distPtr, n) };
  }

  /** Adjacency of the skeleton of the last `thin` (direction codes E 0, NE 1, W 2, SW 3, NW 4, SE 6). */
  neighbours(): SkeletonNeighbours {
    this.check();
    const n = this.pixels;
    this.adj ??= { deg: wasmAlloc(n), list: wasmAlloc(4 * n), nbr: wasmAlloc(32 * n) };
    this.bind();
    const count = this.k.hexSkeletonNeighbours(this.skPtr, this.adj.nbr, this.adj.deg, this.adj.list);
    return {
      list: viewI32(this.adj.list, count), count,
      degree: viewU8(this.adj.deg, n), neighbours: viewI32(this.adj.nbr, 8 * n),
    };
  }

  bytes(): number {
    return this.pixels * 29 + 40 + 8 * (4 * (this.width + 1) + 2 * this.height) + this.colCap + (this.skPtr ? 13 * this.pixels : 0) +
      (this.adj ? 37 * this.pixels : 0) + 12 * this.offCount;
  }

  dispose(): void {
    if (this.disposed) return;
    this.disposed = true;
    for (const p of [this.phasePtr, this.labelPtr, this.parPtr, this.cqPtr, this.sxPtr, this.syPtr, this.wfPtr, this.finPtr,
      this.statsPtr, this.trigPtr, this.colPtr, this.skPtr, this.candPtr, this.listPtr, this.distPtr, this.offPtr, this.lenPtr]) if (p) wasmFree(p);
    if (this.adj) for (const p of [this.adj.deg, this.adj.list, this.adj.nbr]) wasmFree(p);
  }

  private check(): void {
    if (this.disposed) throw new Error("domtopo: this workspace was disposed");
  }
}
