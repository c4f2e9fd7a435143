// A reusable spectrum workspace: the FFT plan, windows and reduction buffers for one frame
// shape, allocated once in Wasm memory and reused for every frame of a sequence. The radial
// profile's annulus-slot table is built with the first frame and swept for every later one.
import type { Frame } from "../types";
import { SpectrumKernels, type PrepareStats } from "../wasm/fft";
import { checkFrame, resolveSpectrumOptions, type ResolvedSpectrumOptions, type SpectrumOptions } from "./options";
import { hannWindow, flatWindow, windowEnergy } from "./window";
import { findPeak, peakHalfWidth, refinePeak } from "./peak";
import { ringOrder } from "./order";
import { structureTensor, tensorOrder } from "./structure-tensor";
import type { AngularDistribution, PowerSpectrum, RadialProfile, SpectrumResult, StructureSummary } from "./result";

/** Smallest frame side with room for a ring. */
export const SPECTRUM_MIN_SIDE = 8;

/** A workspace for frames of one shape; results are plain data, independent of the workspace. */
export interface SpectrumWorkspace {
  readonly width: number;
  readonly height: number;
  /** Analyses one frame (its shape must match the workspace). */
  analyze(frame: Frame, options?: SpectrumOptions): SpectrumResult;
  /** The centred power spectrum S(k) of the frame analysed last (a copy). */
  powerSpectrum(out?: Float32Array): PowerSpectrum;
  /** Releases the Wasm memory; the workspace is unusable afterwards. */
  dispose(): void;
}

interface Transformed {
  opts: ResolvedSpectrumOptions;
  stats: PrepareStats | undefined;
  norm: number;
}

/**
 * How the workspace reduces a transformed frame. `table` (what `createSpectrumWorkspace` gives):
 * the radial profile by one sweep over a per-shape table of annulus slots, and the global
 * structure tensor in a Wasm kernel on the loaded samples. `direct`: the previous computation,
 * a radius (square root) per spectrum point, and the structure tensor in TypeScript; kept as the
 * reference the table path is tested and benchmarked against.
 */
export type ReductionPath = "table" | "direct";

class Workspace implements SpectrumWorkspace {
  readonly width: number;
  readonly height: number;
  private readonly path: ReductionPath;
  private tensorSums: [number, number, number] | undefined;
  private k: SpectrumKernels | undefined;
  private windowKind: "hann" | "none" | undefined;
  private norm = 0;
  private pixelSize = 1;
  private done = false;

  constructor(width: number, height: number, path: ReductionPath = "table") {
    if (!Number.isInteger(width) || !Number.isInteger(height) || width < SPECTRUM_MIN_SIDE || height < SPECTRUM_MIN_SIDE) {
      throw new RangeError(
        `domtopo: a spectrum workspace needs integer sides of at least ${SPECTRUM_MIN_SIDE} px, got ${width} x ${height}`,
      );
    }
    this.width = width;
    this.height = height;
    this.path = path;
    this.k = new SpectrumKernels(width, height);
  }

  private kernels(): SpectrumKernels {
    if (!this.k) throw new Error("domtopo: this spectrum workspace has been disposed");
    return this.k;
  }

  /** Loads, windows and transforms a frame. */
  transform(frame: Frame, options?: SpectrumOptions): Transformed {
    const k = this.kernels();
    checkFrame(frame);
    if (frame.width !== this.width || frame.height !== this.height) {
      throw new RangeError(
        `domtopo: this spectrum workspace is for ${this.width} x ${this.height} frames, got ${frame.width} x ${frame.height}`,
      );
    }
    const opts = resolveSpectrumOptions(frame, options);
    if (this.windowKind !== opts.window) {
      const make = opts.window === "hann" ? hannWindow : flatWindow;
      const wx = make(this.width), wy = make(this.height);
      k.setWindow(wx, wy);
      this.norm = windowEnergy(wx) * windowEnergy(wy);
      this.windowKind = opts.window;
    }
    k.load(frame.data, opts.signal);
    // the global tensor needs the samples before the window and mean removal below
    this.tensorSums = this.path === "table" && opts.structureTensor === "global" ? k.structureSums(opts.boundary) : undefined;
    const stats = k.prepare();
    this.pixelSize = opts.pixelSize ?? 1;
    this.done = false;
    if (stats) {
      k.forward();
      this.done = true;
    }
    return { opts, stats, norm: this.norm };
  }

  analyze(frame: Frame, options?: SpectrumOptions): SpectrumResult {
    const { opts, stats, norm } = this.transform(frame, options);
    const k = this.kernels();
    const w = this.width, h = this.height, side = Math.max(w, h);
    const u = opts.pixelSize ?? 1;
    const dq = 1 / side; // cycles per pixel
    const bins = Math.ceil(side * Math.SQRT1_2) + 2;
    const unit = opts.lengthUnit;
    const emptyProfile: RadialProfile = { q: [], annulusMean: [], annulusIntegral: [], points: [], binWidth: dq / u };
    const base = {
      width: w, height: h, unit, options: opts,
      period: undefined, peakQ: undefined, ringHalfWidthQ: undefined, corrLength: undefined,
      corrLengthResolved: false, order2: undefined, order2AngleDeg: undefined,
      order6: undefined, order6AngleDeg: undefined, angular: undefined,
    } as const;
    if (!stats) {
      return { ...base, variance: undefined, mean: undefined, profile: emptyProfile, reason: "the frame holds NaN or infinite samples" };
    }
    const variance = stats.variance, mean = stats.mean;
    const uniform = !(variance > 1e-10 * Math.max(1e-30, mean * mean)) || !(stats.energy > 0);
    if (uniform) {
      const structure = this.structureSummary(frame, opts, undefined);
      return { ...base, variance, mean, profile: emptyProfile, structure, reason: "uniform frame: no pattern to measure" };
    }

    // radial profile
    const sx = side / w, sy = side / h;
    const radial = this.path === "table" ? k.profile(bins, sx, sy) : k.radial(bins, sx, sy);
    const n = w * h;
    const profile: RadialProfile = { q: [], annulusMean: [], annulusIntegral: [], points: [], binWidth: dq / u };
    for (let b = 0; b < bins; b++) {
      const c = radial.counts[b]!, s = radial.sums[b]!;
      profile.q.push((b * dq) / u);
      profile.annulusMean.push(c > 0 ? s / c / norm : 0);
      profile.annulusIntegral.push(s / norm / n / (dq / u));
      profile.points.push(c);
    }

    // peak q* over the searched periods
    const lo = Math.max(2, Math.floor(side / opts.maxPeriodPx));
    const hi = Math.min(bins - 2, Math.ceil(side / opts.minPeriodPx));
    const values = opts.peakOf === "annulusMean" ? profile.annulusMean : profile.annulusIntegral;
    const found = findPeak(values, lo, hi, opts.peakInterpolation);
    if (found === undefined || found === "edge") {
      const peak = found;
      return {
        ...base, variance, mean, profile, structure: this.structureSummary(frame, opts, undefined),
        reason: peak === "edge"
          ? `no ring: the profile peaks at the edge of the searched periods (${opts.minPeriodPx} to ${opts.maxPeriodPx} px)`
          : "no power in the searched periods",
      };
    }
    const peak = opts.peakInterpolation === "gaussian" ? refinePeak(values, found, peakHalfWidth(values, found)) : found;
    const qStarPx = peak.position * dq;
    const periodPx = 1 / qStarPx;
    if (!(periodPx >= opts.minPeriodPx && periodPx <= opts.maxPeriodPx)) {
      // The interpolated peak fell outside the searched periods (a broad ring near its edge):
      // no period rather than one outside the range the search promises.
      return {
        ...base, variance, mean, profile, structure: this.structureSummary(frame, opts, undefined),
        reason: `no ring within the searched periods (${opts.minPeriodPx} to ${opts.maxPeriodPx} px): ` +
          `the interpolated peak lies at ${Number.isFinite(periodPx) ? periodPx.toFixed(1) : String(periodPx)} px`,
      };
    }

    // ring width from the structure factor (annulusMean)
    let meanPeak = opts.peakOf === "annulusMean" ? peak : findPeak(profile.annulusMean, lo, hi, opts.peakInterpolation);
    if (meanPeak && meanPeak !== "edge" && opts.peakOf !== "annulusMean" && opts.peakInterpolation === "gaussian") {
      meanPeak = refinePeak(profile.annulusMean, meanPeak, peakHalfWidth(profile.annulusMean, meanPeak));
    }
    const hwhmBins = meanPeak && meanPeak !== "edge" ? peakHalfWidth(profile.annulusMean, meanPeak) : undefined;
    let ringHalfWidthQ: number | undefined, corrLength: number | undefined, corrLengthResolved = false;
    if (hwhmBins !== undefined && hwhmBins > 0) {
      const hwhmPx = hwhmBins * dq;
      ringHalfWidthQ = hwhmPx / u;
      const xiPx = 1 / (2 * Math.PI * hwhmPx);
      corrLength = xiPx * u;
      corrLengthResolved = hwhmBins >= 2 && xiPx < Math.min(w, h) / 10;
    }

    // angular statistics over the ring band
    let half = opts.ringHalfWidthPx ?? Math.max(2 * dq, 2 * (hwhmBins ?? 0) * dq);
    half = Math.min(half, qStarPx / 2);
    const ring = k.ring((qStarPx - half) / dq, (qStarPx + half) / dq, sx, sy, opts.angleBins);
    const order = ringOrder(ring.moments);
    let angular: AngularDistribution | undefined;
    const total = ring.moments[0]!;
    if (total > 0) {
      angular = { angleDeg: [], powerFraction: [], bandQ: [(qStarPx - half) / u, (qStarPx + half) / u] };
      for (let i = 0; i < opts.angleBins; i++) {
        angular.angleDeg.push(((i + 0.5) * 180) / opts.angleBins);
        angular.powerFraction.push(ring.hist[i]! / total);
      }
    }
    return {
      ...base, variance, mean, profile, angular,
      period: periodPx * u,
      peakQ: qStarPx / u,
      ringHalfWidthQ, corrLength, corrLengthResolved,
      order2: order?.order2, order2AngleDeg: order?.order2AngleDeg,
      order6: order?.order6, order6AngleDeg: order?.order6AngleDeg,
      structure: this.structureSummary(frame, opts, periodPx),
    };
  }

  private structureSummary(frame: Frame, opts: ResolvedSpectrumOptions, periodPx: number | undefined): StructureSummary | undefined {
    if (opts.structureTensor === "off") return undefined;
    const sigmaPx = opts.structureSigmaPx ?? (periodPx !== undefined ? Math.min(32, Math.max(1, periodPx / 2)) : 2);
    if (opts.structureTensor === "global" && this.tensorSums) {
      const [sxx, syy, sxy] = this.tensorSums;
      return { ...tensorOrder(sxx, syy, sxy), sigmaPx };
    }
    const st = structureTensor(frame, {
      signal: opts.signal, boundary: opts.boundary, output: opts.structureTensor, sigmaPx,
    });
    const s: StructureSummary = { order2: st.order2, angleDeg: st.angleDeg, sigmaPx };
    if (st.meanCoherence !== undefined) s.meanCoherence = st.meanCoherence;
    return s;
  }

  powerSpectrum(out?: Float32Array): PowerSpectrum {
    const k = this.kernels();
    if (!this.done) throw new Error("domtopo: no frame has been transformed in this workspace yet");
    const power = k.powerCentred(1 / this.norm, out);
    return {
      width: this.width, height: this.height, power,
      centerX: this.width >> 1, centerY: this.height >> 1, pixelSize: this.pixelSize,
    };
  }

  dispose(): void {
    this.k?.dispose();
    this.k = undefined;
  }
}

/** Creates a workspace for `width x height` frames (both at least 8 px); reuse it across a sequence. */
export function createSpectrumWorkspace(width: number, height: number): SpectrumWorkspace {
  return new Workspace(width, height);
}

/**
 * @internal A workspace on the `direct` reduction path (the computation before the slot table),
 * for tests and benchmarks that compare the two.
 */
export function createReferenceSpectrumWorkspace(width: number, height: number): SpectrumWorkspace {
  return new Workspace(width, height, "direct");
}

/** @internal used by powerSpectrum */
export function transformInto(ws: SpectrumWorkspace, frame: Frame, options?: SpectrumOptions): boolean {
  return (ws as Workspace).transform(frame, options).stats !== undefined;
}
