// analyzeFrame: a frame in, both phases labeled and measured, plain data out.
import type { Frame } from "../types";
import { checkFrame, checkSize } from "../frame";
import { LabelingWorkspace, type QuadStats, type RuleCode } from "../wasm/labeling";
import { resolveLevel, type ResolvedLevel } from "../prep/threshold";
import { resolveFrameOptions, checkHexShape, type FrameOptions, type ResolvedFrameOptions } from "./options";
import { HexWorkspace } from "../wasm/hex";
import { buildHexDomainTable, hexPhaseEulers, hexFrameWallLength, HEX_SITE_AREA } from "./hex";
import { buildDomainTable, croftonLength, type DomainTable } from "./domains";
import { createSpectrumWorkspace, SPECTRUM_MIN_SIDE, type SpectrumWorkspace } from "../spectrum/workspace";
import { analyzeSpectrum } from "../spectrum/analyze";
import type { SpectrumResult } from "../spectrum/result";
import type { SpectrumOptions } from "../spectrum/options";
import { analyzeSkeletons, lazyPruned, type SkeletonAnalysis, type ResolvedSkeletonOptions } from "./skeleton-analysis";
import type { SkeletonColumns, PhaseSkeletonSummary } from "./classify";
import { SkeletonWorkspace } from "../wasm/skeleton";
import { overlayPixels, type OverlayImage, type OverlayOptions } from "../render/overlay";
import { renderSpectrum, type SpectrumImage } from "../spectrum/render";
import { analyzeHexSkeletons } from "./skeleton-hex";
import { resampleHexToSquare, HEX_SQUARE_SPACING } from "../spectrum/hex";

/** Skeleton results of a frame: per-domain columns (row i = domain id i + 1) and per-phase summaries. */
export interface FrameSkeletons {
  options: ResolvedSkeletonOptions;
  columns: SkeletonColumns;
  up: PhaseSkeletonSummary;
  down: PhaseSkeletonSummary;
  /** 1 on the pruned skeleton pixels (only with `keepLabels`). */
  pruned?: Uint8Array;
}

export interface PhaseSummary {
  /** Number of domains of this phase. */
  domains: number;
  /** Area in unit^2 and as a fraction of the frame. */
  area: number;
  areaFraction: number;
  /** Euler number of the whole phase by bit-quads (in the plane, or on the torus/cylinder). */
  euler: number;
  /** Holes of the non-wrapping domains: the sum of (1 - Euler number) over them. */
  holes: number;
  /** Domains that wind around a periodic side, and domains touching an open side. */
  wrapping: number;
  edge: number;
  /** Euler number per area (unit^-2) and wall length per area (unit^-1, shared by both phases). */
  eulerDensity: number;
  wallLengthDensity: number;
  /** Domains absorbed into the other phase by `minDomainArea`. */
  absorbed: number;
}

export interface FrameResult {
  /** The options that produced this result (with defaults filled in). */
  options: ResolvedFrameOptions;
  width: number;
  height: number;
  /** The level used: a sample is up when above it (before `invert`), and how it was chosen. */
  threshold: ResolvedLevel;
  /** m = (A_up - A_down) / (A_up + A_down). */
  magnetization: number;
  /** Total wall length (Crofton, four directions) in unit, and per frame area in unit^-1. */
  wallLength: number;
  wallLengthDensity: number;
  up: PhaseSummary;
  down: PhaseSummary;
  domains: DomainTable;
  /** Period, correlation length and order from the power spectrum (absent when `spectrum: 'off'`). */
  spectrum?: SpectrumResult;
  /** Skeletons, defects and kinds (absent when `skeleton: 'off'`). */
  skeleton?: FrameSkeletons;
  /** The label image (ids 1..K; row i of `domains` is id i + 1), when `keepLabels` is set. */
  labels?: Int32Array;
  /** Remarks on how the options were applied (e.g. `connectivity` on a hexagonal grid). */
  notes?: string[];
}

function ruleCode(o: ResolvedFrameOptions): RuleCode {
  return o.connectivity === 8 ? 0 : o.connectivity === 4 ? 1 : 2;
}

/** Phase Euler numbers from the quad histogram (Gray 1971): 4 E = Q1 - Q3 -+ 2 QD + border. */
export function phaseEulers(stats: QuadStats): { up: number; down: number } {
  const { hist, border } = stats;
  let q1 = 0, q3 = 0;
  for (let code = 0; code < 16; code++) {
    const n = ((code & 1) + ((code >> 1) & 1) + ((code >> 2) & 1) + ((code >> 3) & 1));
    if (n === 1) q1 += hist[code]!;
    else if (n === 3) q3 += hist[code]!;
  }
  const qdUp = hist[6]! + hist[9]!; // diagonal quads where the up pair joins
  const qdDown = hist[16]! + hist[17]!;
  const b = border[0]!;
  const up = (q1 - q3 - 2 * qdUp + 2 * qdDown + b + border[1]!) / 4;
  const down = (q3 - q1 - 2 * qdDown + 2 * qdUp + b + border[2]!) / 4;
  return { up, down };
}

/** Phase changes along rows, columns and both diagonals, from the quad histogram. */
export function frameCrossings(stats: QuadStats): [number, number, number, number] {
  const { hist, border } = stats;
  let n0 = border[3]!, n90 = border[4]!, n45 = 0, n135 = 0;
  for (let bin = 0; bin < 18; bin++) {
    const code = bin === 16 ? 6 : bin === 17 ? 9 : bin;
    const c = hist[bin]!;
    if (c === 0) continue;
    const a = code & 1, b = (code >> 1) & 1, cc = (code >> 2) & 1, d = (code >> 3) & 1;
    if (a !== b) n0 += c;
    if (a !== cc) n90 += c;
    if (b !== cc) n45 += c;
    if (a !== d) n135 += c;
  }
  return [n0, n90, n45, n135];
}

/**
 * A reusable analysis workspace for frames of one shape: a movie analyzed through it allocates
 * the Wasm memory of one frame. `labels()` and `phase()` are views valid until the next call.
 */
export class FrameAnalyzer {
  readonly width: number;
  readonly height: number;
  private ws: LabelingWorkspace;
  private spectrumWs: SpectrumWorkspace | undefined;
  private phaseCopy: Uint8Array | undefined;
  private skeletonWs: SkeletonWorkspace | undefined;
  private lastSkeleton: SkeletonAnalysis | undefined;
  private lastMaps: { phase: Uint8Array; labels: Int32Array } | undefined;
  private maps: { phase: Uint8Array } | undefined;
  private hexWs: HexWorkspace | undefined;
  private lastGrid: "square" | "hex" = "square";

  constructor(width: number, height: number) {
    checkSize("analyzer width", width);
    checkSize("analyzer height", height);
    this.width = width;
    this.height = height;
    this.ws = new LabelingWorkspace(width, height);
  }

  /** Analyzes one frame (its shape must match the analyzer's). */
  analyze(frame: Frame, options: FrameOptions = {}, where = "frame"): FrameResult {
    checkFrame(frame, where);
    if (frame.width !== this.width || frame.height !== this.height) {
      throw new Error(
        `${where}: expected a ${this.width} x ${this.height} frame for this analyzer, got ${frame.width} x ${frame.height}`,
      );
    }
    const o = resolveFrameOptions(options);
    if (o.grid === "hex") checkHexShape(this.width, this.height, o.boundary, where);
    this.lastGrid = o.grid;
    const ws = this.ws;
    const kind = ws.loadSamples(frame.data);
    const level = resolveLevel(ws, kind, o.threshold, where);
    const nan = ws.threshold(kind, level.cut, o.invert);
    if (nan > 0) throw new Error(`${where}: expected finite samples, got ${nan} NaN sample(s)`);
    if (o.grid === "hex") return this.analyzeHex(frame, o, level);
    const rule = ruleCode(o);
    if (rule === 2) ws.saddleDecisions(kind, level.level, o.invert);
    const px = o.boundary === "periodic" || o.boundary === "periodic-x";
    const py = o.boundary === "periodic" || o.boundary === "periodic-y";
    // Specks below the minimum area go into the other phase within the labeling itself.
    ws.label(rule, px, py, o.minDomainArea);
    const absorbed = ws.absorbed;
    const stats = ws.measureQuads();
    const domains = buildDomainTable(ws, o.pixelSize);
    const [n0, n90, n45, n135] = frameCrossings(stats);
    const result = summarize(this.width, this.height, o, level, phaseEulers(stats),
      croftonLength(n0, n90, n45, n135) * o.pixelSize, this.width * this.height * o.pixelSize ** 2,
      domains, absorbed, o.keepLabels ? ws.labels().slice() : undefined);
    this.lastSkeleton = undefined;
    this.lastMaps = undefined;
    if (o.skeleton !== "off") result.skeleton = this.skeletonsOf(o, rule);
    if (o.spectrum !== "off") result.spectrum = this.spectrumOf(frame, o);
    return result;
  }

  /** The hexagonal path of `analyze`, after thresholding (see Grid in options.ts). */
  private analyzeHex(frame: Frame, o: ResolvedFrameOptions, level: ResolvedLevel): FrameResult {
    const hw = (this.hexWs ??= new HexWorkspace(this.width, this.height));
    hw.loadPhase(this.ws.phase());
    const px = o.boundary === "periodic" || o.boundary === "periodic-x";
    const py = o.boundary === "periodic" || o.boundary === "periodic-y";
    hw.label(px, py);
    const absorbed = { up: 0, down: 0 };
    if (o.minDomainArea > 1) {
      for (const p of [1, 0] as const) {
        const area = hw.column("area"), phase = hw.column("phase");
        let count = 0;
        for (let d = 1; d <= hw.domainCount; d++) if (phase[d] === p && area[d]! < o.minDomainArea) count++;
        if (count === 0) continue;
        hw.absorb(p, o.minDomainArea);
        if (p === 1) absorbed.up = count; else absorbed.down = count;
        hw.label(px, py);
      }
    }
    const s = o.pixelSize;
    const stats = hw.stats();
    const domains = buildHexDomainTable(hw, s);
    const result = summarize(this.width, this.height, o, level, hexPhaseEulers(stats),
      hexFrameWallLength(stats) * s, this.width * this.height * HEX_SITE_AREA * s * s,
      domains, absorbed, o.keepLabels ? hw.labels().slice() : undefined);
    result.notes = ["grid 'hex': both phases are six-connected; options.connectivity is not used"];
    this.lastSkeleton = undefined;
    this.lastMaps = undefined;
    if (o.skeleton !== "off") {
      const phase = hw.phase().slice(), labels = hw.labels().slice();
      const sk = o.skeleton as Exclude<ResolvedFrameOptions["skeleton"], "off">;
      const { thinning: _thinning, ...rest } = sk;
      const a = analyzeHexSkeletons(hw, { width: this.width, height: this.height, phase, labels, count: hw.domainCount },
        { ...rest, boundary: o.boundary, pixelSize: s });
      this.lastSkeleton = a;
      this.lastMaps = { phase, labels };
      result.skeleton = { options: a.options, columns: a.columns, up: a.up, down: a.down };
      // Made when read: a movie with tracking keeps labels and seldom reads it.
      if (o.keepLabels) lazyPruned(result.skeleton, () => a.pruned);
    }
    if (o.spectrum !== "off") {
      const r = this.hexSpectrumOf(frame, o, hw, px, py);
      result.spectrum = r.spectrum;
      result.notes.push(r.note);
    }
    return result;
  }

  private hexSpectrumOf(
    frame: Frame, o: ResolvedFrameOptions, hw: HexWorkspace, px: boolean, py: boolean,
  ): { spectrum: SpectrumResult; note: string } {
    const s = o.spectrum as Exclude<ResolvedFrameOptions["spectrum"], "off">;
    const grey = s.signal === "grey";
    // The phase map as +1 / -1 (as the square route's binary signal), then interpolated.
    const source: ArrayLike<number> = grey ? frame.data : Float32Array.from(hw.phase(), (v) => 2 * v - 1);
    const r = resampleHexToSquare(source, this.width, this.height, px, py);
    const spacing = Math.sqrt(r.dx * r.dy);
    // Lengths given in sites (lattice constants) become square-grid pixels of `spacing`.
    const options: SpectrumOptions = {
      ...s, signal: "grey", pixelSize: o.pixelSize * spacing, lengthUnit: o.unit,
      boundary: o.boundary === "periodic" ? "periodic" : "open",
    };
    if (s.minPeriodPx !== undefined) options.minPeriodPx = s.minPeriodPx / spacing;
    if (s.maxPeriodPx !== undefined) options.maxPeriodPx = s.maxPeriodPx / spacing;
    if (s.ringHalfWidthPx !== undefined) options.ringHalfWidthPx = s.ringHalfWidthPx * spacing;
    if (s.structureSigmaPx !== undefined) options.structureSigmaPx = s.structureSigmaPx / spacing;
    const f = r.frame;
    const note = `spectrum of a hexagonal frame: ${grey ? "samples" : "phase map (+1/-1)"} resampled by linear interpolation ` +
      `(along the two bracketing rows, then between them) onto a ${f.width} x ${f.height} square grid of spacing ` +
      `${(spacing).toFixed(4)} lattice constants (${HEX_SQUARE_SPACING.toFixed(4)} = one sample per site area)`;
    if (f.width < SPECTRUM_MIN_SIDE || f.height < SPECTRUM_MIN_SIDE) {
      const spectrum = analyzeSpectrum(f, options);
      if (spectrum.reason) spectrum.reason += ` (the square resampling of the ${this.width} x ${this.height} hexagonal frame)`;
      return { spectrum, note };
    }
    if (!this.spectrumWs || this.spectrumWs.width !== f.width || this.spectrumWs.height !== f.height) {
      this.spectrumWs?.dispose();
      this.spectrumWs = createSpectrumWorkspace(f.width, f.height);
    }
    return { spectrum: this.spectrumWs.analyze(f, options), note };
  }

  private skeletonsOf(o: ResolvedFrameOptions, rule: RuleCode): FrameSkeletons {
    // The phase map copied (the skeleton kernels share Wasm memory with the labeling workspace)
    // into a buffer kept for the frame shape: it holds the last frame for overlays and the
    // spectrum. The labels are read where the labeling left them (until the next frame), and
    // the skeleton and distance map stay in the skeleton workspace.
    const n = this.width * this.height;
    const m = (this.maps ??= { phase: new Uint8Array(n) });
    const phase = m.phase;
    phase.set(this.ws.phase());
    const quads = rule === 2 ? this.ws.quads()!.slice() : undefined;
    this.skeletonWs ??= new SkeletonWorkspace(this.width, this.height);
    const a = analyzeSkeletons(
      { width: this.width, height: this.height, phase, labels: this.ws.labels(), count: this.ws.domainCount },
      { ...(o.skeleton as object), boundary: o.boundary, connectivity: o.connectivity, pixelSize: o.pixelSize, ...(quads ? { quads } : {}) },
      this.skeletonWs,
      "views",
    );
    this.lastSkeleton = a;
    const ws = this.ws;
    this.lastMaps = { phase, get labels() { return ws.labels(); } };
    const out: FrameSkeletons = { options: a.options, columns: a.columns, up: a.up, down: a.down };
    if (o.keepLabels) lazyPruned(out, () => a.pruned); // made when read (as above)
    return out;
  }

  /**
   * The last frame's power spectrum as an image: log-scaled, centred, the ring at q* marked
   * (needs the spectrum to have been on, on a frame of at least 8 px a side).
   */
  spectrumImage(peakQ?: number): SpectrumImage {
    if (!this.spectrumWs) throw new Error("spectrumImage: analyze a frame with the spectrum on first");
    const power = this.spectrumWs.powerSpectrum();
    return renderSpectrum(power, { ...(peakQ !== undefined ? { peakQ } : {}), format: "rgba" });
  }

  /**
   * The last frame as an overlay: domains coloured by kind, pruned skeleton drawn, ends and
   * junctions marked (needs the skeleton to have been on).
   */
  overlay(options: OverlayOptions = {}): OverlayImage {
    if (!this.lastSkeleton || !this.lastMaps) {
      throw new Error("overlay: analyze a frame with the skeleton on first");
    }
    const o: OverlayOptions = this.lastGrid === "hex" && options.grid === undefined ? { ...options, grid: "hex" } : options;
    return overlayPixels(this.lastSkeleton, this.width, this.height, this.lastMaps.phase, this.lastMaps.labels, o);
  }

  private spectrumOf(frame: Frame, o: ResolvedFrameOptions): SpectrumResult {
    const s = o.spectrum as Exclude<ResolvedFrameOptions["spectrum"], "off">;
    const grey = s.signal === "grey";
    let input: Frame = frame;
    if (!grey) {
      // The phase map out of Wasm memory (the spectrum kernels share it): the skeleton's copy of
      // this frame when it ran, else a copy into a reused buffer.
      let phase = this.lastMaps?.phase;
      if (!phase) {
        this.phaseCopy ??= new Uint8Array(this.width * this.height);
        phase = this.phaseCopy;
        phase.set(this.ws.phase());
      }
      input = { width: this.width, height: this.height, data: phase };
    }
    const options: SpectrumOptions = {
      ...s, signal: grey ? "grey" : "binary", pixelSize: o.pixelSize, lengthUnit: o.unit,
      boundary: o.boundary === "periodic" ? "periodic" : "open",
    };
    if (this.width < SPECTRUM_MIN_SIDE || this.height < SPECTRUM_MIN_SIDE) return analyzeSpectrum(input, options);
    if (this.spectrumWs && (this.spectrumWs.width !== this.width || this.spectrumWs.height !== this.height)) {
      this.spectrumWs.dispose();
      this.spectrumWs = undefined;
    }
    this.spectrumWs ??= createSpectrumWorkspace(this.width, this.height);
    return this.spectrumWs.analyze(input, options);
  }

  /** View of the last label image (ids 1..K), valid until the next call. */
  labels(): Int32Array {
    return this.lastGrid === "hex" && this.hexWs ? this.hexWs.labels() : this.ws.labels();
  }

  /** View of the last phase map (1 up, 0 down), valid until the next call. */
  phase(): Uint8Array {
    return this.lastGrid === "hex" && this.hexWs ? this.hexWs.phase() : this.ws.phase();
  }

  /** Bytes of Wasm memory this analyzer holds. */
  memoryBytes(): number {
    return this.ws.bytes() + (this.hexWs?.bytes() ?? 0);
  }

  dispose(): void {
    this.hexWs?.dispose();
    this.hexWs = undefined;
    this.ws.dispose();
    this.spectrumWs?.dispose();
    this.spectrumWs = undefined;
    this.skeletonWs?.dispose();
    this.skeletonWs = undefined;
  }
}

function summarize(
  width: number, height: number, o: ResolvedFrameOptions, level: ResolvedLevel,
  eulers: { up: number; down: number }, wallLength: number, frameArea: number,
  domains: DomainTable, absorbed: { up: number; down: number }, labels: Int32Array | undefined,
): FrameResult {
  const wallLengthDensity = wallLength / frameArea;
  const phase = (p: 0 | 1): PhaseSummary => {
    let count = 0, area = 0, holes = 0, wrapping = 0, edge = 0;
    for (let i = 0; i < domains.count; i++) {
      if (domains.phase[i] !== p) continue;
      count++;
      area += domains.area[i]!;
      if (domains.wrapsX[i] || domains.wrapsY[i]) wrapping++;
      else holes += domains.holes[i]!;
      if (domains.edge[i]) edge++;
    }
    const euler = p === 1 ? eulers.up : eulers.down;
    return {
      domains: count, area, areaFraction: area / frameArea, euler, holes, wrapping, edge,
      eulerDensity: euler / frameArea, wallLengthDensity,
      absorbed: p === 1 ? absorbed.up : absorbed.down,
    };
  };
  const up = phase(1), down = phase(0);
  const result: FrameResult = {
    options: o, width, height, threshold: level,
    magnetization: (up.area - down.area) / frameArea,
    wallLength, wallLengthDensity, up, down, domains,
  };
  if (labels) result.labels = labels;
  return result;
}

let shared: FrameAnalyzer | undefined;

/**
 * Analyzes one frame: thresholds it, labels both phases (complementary connectivity, open or
 * periodic sides) and measures every domain. Reuses one workspace between calls of equal shape.
 */
export function analyzeFrame(frame: Frame, options: FrameOptions = {}): FrameResult {
  checkFrame(frame);
  if (!shared || shared.width !== frame.width || shared.height !== frame.height) {
    shared?.dispose();
    shared = new FrameAnalyzer(frame.width, frame.height);
  }
  return shared.analyze(frame, options);
}

/** A workspace for analyzing many frames of one shape (see FrameAnalyzer). */
export function createAnalyzer(width: number, height: number): FrameAnalyzer {
  return new FrameAnalyzer(width, height);
}
