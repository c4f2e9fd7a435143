// The labeling workspace: Wasm buffers for one frame shape, reused frame after frame, so a
// whole movie allocates the memory of one frame. Views returned here are valid until the next
// call on the same workspace (or any call that can grow Wasm memory).
import { kernels } from "./instance";
import type { KernelExports } from "./exports";
import { wasmAlloc, wasmFree, viewU8, viewU16, viewI32, viewU32, viewF32, viewF64 } from "./heap";
import type { FrameData } from "../types";

/** Rule for diagonal pairs: 0 up 8-connected, 1 down 8-connected, 2 saddle (per quad). */
export type RuleCode = 0 | 1 | 2;

// Column order of assembly/measure.ts `bindDomains`: i32 columns, then f64, then components.
const I32_COLUMNS = [
  "area", "minX", "maxX", "minY", "maxY", "euler4", "n0", "n90", "n45", "n135", "flags", "phase",
] as const;
const F64_COLUMNS = ["sx", "sy", "sxx", "syy", "sxy", "cxc", "cxs", "cyc", "cys"] as const;
const COMPONENT_COLUMNS = ["fin", "csx", "csy", "cwf", "cq"] as const;
/** The quad pass's per-domain accumulators: four i32 side by side (see assembly/measure.ts). */
const QUAD_ACCUMULATOR_BYTES = 16;
const BYTES_PER_DOMAIN = (I32_COLUMNS.length + COMPONENT_COLUMNS.length) * 4 + F64_COLUMNS.length * 8 +
  QUAD_ACCUMULATOR_BYTES;

export type DomainI32Column = (typeof I32_COLUMNS)[number];
export type DomainF64Column = (typeof F64_COLUMNS)[number];

/** Raw per-frame statistics from the quad pass (see assembly/measure.ts). */
export interface QuadStats {
  /** 18 bins: quad codes 0..15 (diagonal codes where the up pair joins), 16/17 down-joined 6/9. */
  hist: Int32Array;
  /** [open-side changes, up corners, down corners, last-row changes, last-column changes]. */
  border: Int32Array;
}

export class LabelingWorkspace {
  readonly width: number;
  readonly height: number;
  readonly pixels: number;
  private k: KernelExports;
  private srcPtr = 0;
  private srcBytes = 0;
  private phasePtr: number;
  private labelPtr: number;
  private parentPtr: number;
  private quadPtr = 0;
  private histPtr = 0;
  private histBytes = 0;
  private tablePtr: number;
  private statsPtr: number;
  private trigPtr: number;
  private domainPtr = 0;
  private capacity = 0;
  private columnPtr = new Map<string, number>();
  private disposed = false;
  /** Number of domains of the last labeling. */
  domainCount = 0;
  /** Domains of each phase that the last labeling absorbed into the other (see `label`). */
  absorbed = { up: 0, down: 0 };
  private labelAreaPtr = 0;
  private speckPtr = 0;
  private speckCapacity = 0;

  constructor(width: number, height: number) {
    this.width = width;
    this.height = height;
    this.pixels = width * height;
    this.k = kernels();
    const n = this.pixels;
    this.phasePtr = wasmAlloc(n + 16); // vector loads may read up to 15 bytes past the map
    this.labelPtr = wasmAlloc(4 * n);
    this.parentPtr = wasmAlloc(4 * (n + 1));
    this.tablePtr = wasmAlloc(32 * 4);
    this.statsPtr = wasmAlloc(32 * 4);
    this.trigPtr = wasmAlloc(8 * (2 * (width + 1) + 2 * height));
    this.ensureCapacity(Math.min(n + 1, 1024));
    this.k.setGeometry(width, height, 0, 0, 0);
    this.k.fillTrigTables(); // depends on the shape only
  }

  /** Copies the samples into Wasm memory; returns the kind code (0 u8, 1 u16, 2 f32). */
  loadSamples(data: FrameData): 0 | 1 | 2 {
    this.check();
    const bytes = data.byteLength;
    if (bytes > this.srcBytes) {
      if (this.srcPtr) wasmFree(this.srcPtr);
      this.srcPtr = wasmAlloc(bytes);
      this.srcBytes = bytes;
    }
    if (data instanceof Uint8Array) { viewU8(this.srcPtr, data.length).set(data); return 0; }
    if (data instanceof Uint16Array) { viewU16(this.srcPtr, data.length).set(data); return 1; }
    viewF32(this.srcPtr, data.length).set(data);
    return 2;
  }

  /** Copies a ready phase map (1 up, 0 down) into the workspace. */
  loadPhase(phase: Uint8Array): void {
    this.check();
    viewU8(this.phasePtr, this.pixels).set(phase);
  }

  private hist(bytes: number): number {
    if (bytes > this.histBytes) {
      if (this.histPtr) wasmFree(this.histPtr);
      this.histPtr = wasmAlloc(bytes);
      this.histBytes = bytes;
    }
    return this.histPtr;
  }

  /** Histogram of the loaded integer samples (256 or 65536 bins). */
  integerHistogram(kind: 0 | 1): Int32Array {
    const bins = kind === 0 ? 256 : 65536;
    const ptr = this.hist(bins * 4);
    this.k.histogramInt(this.srcPtr, this.pixels, kind === 0 ? 1 : 2, ptr);
    return viewI32(ptr, bins);
  }

  /** Range of the loaded f32 samples and their NaN count. */
  floatRange(): { lo: number; hi: number; nan: number } {
    const nan = this.k.rangeF32(this.srcPtr, this.pixels, this.statsPtr);
    const out = viewF64(this.statsPtr, 2);
    return { lo: out[0]!, hi: out[1]!, nan };
  }

  floatHistogram(lo: number, hi: number, bins: number): Int32Array {
    const ptr = this.hist(bins * 4);
    this.k.histogramF32(this.srcPtr, this.pixels, lo, hi, bins, ptr);
    return viewI32(ptr, bins);
  }

  /** Integer kinds: up when sample >= cut. Float: up when sample > level; returns NaN count. */
  threshold(kind: 0 | 1 | 2, cutOrLevel: number, invert: boolean): number {
    this.check();
    this.bindPhase();
    const inv = invert ? 1 : 0;
    if (kind === 0) { this.k.thresholdU8(this.srcPtr, this.pixels, cutOrLevel, inv); return 0; }
    if (kind === 1) { this.k.thresholdU16(this.srcPtr, this.pixels, cutOrLevel, inv); return 0; }
    return this.k.thresholdF32(this.srcPtr, this.pixels, cutOrLevel, inv);
  }

  /** Saddle-rule quad decisions from the loaded samples (after `threshold`). */
  saddleDecisions(kind: 0 | 1 | 2, level: number, invert: boolean): void {
    if (!this.quadPtr) this.quadPtr = wasmAlloc(this.pixels);
    this.bindPhase();
    this.k.saddleQuads(this.srcPtr, kind, level, invert ? 1 : 0, this.quadPtr);
  }

  private bindPhase(): void {
    this.k.setGeometry(this.width, this.height, 0, 0, 0);
    this.k.setBuffers(this.phasePtr, this.labelPtr, this.parentPtr, this.quadPtr);
  }

  private ensureCapacity(needed: number): void {
    if (needed <= this.capacity) return;
    const cap = Math.max(needed, Math.ceil(this.capacity * 1.5));
    if (this.domainPtr) wasmFree(this.domainPtr);
    this.domainPtr = wasmAlloc(cap * BYTES_PER_DOMAIN);
    this.capacity = cap;
    const table = viewU32(this.tablePtr, 32);
    let p = this.domainPtr, slot = 0;
    for (const name of I32_COLUMNS) { this.columnPtr.set(name, p); table[slot++] = p; p += 4 * cap; }
    for (const name of F64_COLUMNS) { this.columnPtr.set(name, p); table[slot++] = p; p += 8 * cap; }
    for (const name of COMPONENT_COLUMNS) { this.columnPtr.set(name, p); table[slot++] = p; p += 4 * cap; }
    this.k.bindQuadAccumulators(p);
    const w = this.width, h = this.height;
    table[slot++] = this.trigPtr;
    table[slot++] = this.trigPtr + 8 * (w + 1);
    table[slot++] = this.trigPtr + 16 * (w + 1);
    table[slot++] = this.trigPtr + 16 * (w + 1) + 8 * h;
    table[slot++] = this.statsPtr;
    table[slot++] = this.statsPtr + 18 * 4;
    this.k.bindDomains(this.tablePtr);
    if (slot !== 32) throw new Error("domtopo: internal error, domain column table is off");
  }

  /**
   * Labels both phases of the phase map in the workspace and measures every domain. With
   * `minArea` > 1, domains of fewer pixels are first absorbed into the other phase (the phase
   * map is edited; up ones, then down ones, counted in `absorbed`) and joined to the domains
   * around them, as a labeling of the edited map would find them. Returns the number of
   * domains K (ids 1..K, in raster order of their first pixel).
   */
  label(rule: RuleCode, periodicX: boolean, periodicY: boolean, minArea = 0): number {
    this.check();
    const k = this.k;
    const px = periodicX ? 1 : 0, py = periodicY ? 1 : 0;
    const specks = minArea > 1;
    this.absorbed = { up: 0, down: 0 };
    // With a minimum area the scan also counts each provisional label's pixels.
    if (specks && !this.labelAreaPtr) this.labelAreaPtr = wasmAlloc(4 * (this.pixels + 1));
    k.bindSpecks(specks ? this.labelAreaPtr : 0, 0, 0, 0);
    k.setGeometry(this.width, this.height, px, py, rule);
    k.setBuffers(this.phasePtr, this.labelPtr, this.parentPtr, rule === 2 ? this.quadPtr : 0);
    const components = k.labelScan();
    this.ensureCapacity(components + 1);
    if (specks) { this.bindSpeckColumns(components + 1); k.componentAreas(components); }
    k.bindDomains(this.tablePtr);
    k.setGeometry(this.width, this.height, px, py, rule);
    // Components join into domains across periodic sides, and through absorbed specks.
    const joined = periodicX || periodicY || specks;
    let K = components;
    if (joined) {
      const c = this.columnPtr;
      k.bindComponents(c.get("cq")!, c.get("csx")!, c.get("csy")!, c.get("cwf")!, c.get("fin")!);
      K = k.resolvePeriodic(components);
    }
    if (specks) {
      // Up specks first, then down specks: flipping a speck only merges it into its
      // surroundings, so two rounds leave no domain below the limit (the second sees the
      // domains the first one grew). Saddle decisions stay those of the samples.
      for (const p of [1, 0] as const) {
        const count = k.markSpecks(components, p, minArea);
        if (count === 0) continue;
        if (p === 1) this.absorbed.up = count; else this.absorbed.down = count;
        K = k.absorbMarked(components, p);
      }
      k.bindSpecks(0, 0, 0, 0);
    }
    k.measureRuns(K, joined ? 1 : 0);
    this.domainCount = K;
    return K;
  }

  /** Three i32 columns per component for the speck pass (room for `needed` components). */
  private bindSpeckColumns(needed: number): void {
    if (needed > this.speckCapacity) {
      if (this.speckPtr) wasmFree(this.speckPtr);
      this.speckCapacity = Math.max(needed, Math.ceil(this.speckCapacity * 1.5));
      this.speckPtr = wasmAlloc(12 * this.speckCapacity);
    }
    const cap = this.speckCapacity;
    this.k.bindSpecks(this.labelAreaPtr, this.speckPtr, this.speckPtr + 4 * cap, this.speckPtr + 8 * cap);
  }

  /** Quad pass over the last labeling: Euler contributions, crossings, frame statistics. */
  measureQuads(): QuadStats {
    this.k.measureQuads();
    return {
      hist: viewI32(this.statsPtr, 18).slice(),
      border: viewI32(this.statsPtr + 18 * 4, 5).slice(),
    };
  }

  /** View of an i32 domain column, indices 0..K (0 unused). */
  i32Column(name: DomainI32Column): Int32Array {
    return viewI32(this.columnPtr.get(name)!, this.domainCount + 1);
  }

  f64Column(name: DomainF64Column): Float64Array {
    return viewF64(this.columnPtr.get(name)!, this.domainCount + 1);
  }

  /** View of the labels (domain ids 1..K, row-major). */
  labels(): Int32Array {
    return viewI32(this.labelPtr, this.pixels);
  }

  /** View of the saddle decisions of the last `saddleDecisions` call (undefined before). */
  quads(): Uint8Array | undefined {
    return this.quadPtr ? viewU8(this.quadPtr, this.pixels) : undefined;
  }

  /** View of the phase map (1 up, 0 down). */
  phase(): Uint8Array {
    return viewU8(this.phasePtr, this.pixels);
  }

  /** Bytes of Wasm memory held by this workspace. */
  bytes(): number {
    return this.pixels * 9 + 4 + this.srcBytes + this.histBytes + (this.quadPtr ? this.pixels : 0) +
      this.capacity * BYTES_PER_DOMAIN + 8 * (2 * (this.width + 1) + 2 * this.height) + 256;
  }

  /** Returns the workspace's memory to the shared heap. The workspace is unusable afterwards. */
  dispose(): void {
    if (this.disposed) return;
    this.disposed = true;
    for (const p of [this.srcPtr, this.phasePtr, this.labelPtr, this.parentPtr, this.quadPtr,
      this.histPtr, this.tablePtr, this.statsPtr, this.trigPtr, this.domainPtr, this.labelAreaPtr, this.speckPtr]) {
      if (p) wasmFree(p);
    }
  }

  private check(): void {
    if (this.disposed) throw new Error("domtopo: this workspace was disposed");
  }
}
