// Preprocessing of frames before thresholding: crop, background reference (divide or subtract),
// flattening of uneven illumination (Gaussian high-pass, polynomial surface, per-line levelling)
// and Gaussian smoothing, always in that order, on Float32 samples.
import type { Frame, FrameData } from "../types";
import { checkChoice, checkFrame, checkNumber, checkPositive, checkSize, describeValue } from "../frame";
import { DIRECT_SIGMA_LIMIT, GaussianPlan, type EdgeMode, type GaussianMethod } from "./gaussian";
import { PolynomialSurface, levelLines } from "./flatten";

/** Sides of the frame: open, or periodic (simulations on a torus or cylinder). Same words as analyzeFrame. */
export type PrepBoundary = "open" | "periodic" | "periodic-x" | "periodic-y";
/** Kernel choice: `'auto'` takes `'direct'` for sigma <= 4 px and `'box'` above. */
export type GaussianMethodOption = "auto" | GaussianMethod;
/**
 * What is added back after a background surface is removed: `'mean'` the mean of the removed
 * surface (samples stay near their original level, so a level in sample units keeps its meaning),
 * `'zero'` nothing (the result is centred near zero: threshold it at `'zero'`).
 */
export type FlattenOffset = "mean" | "zero";

/** A rectangle of pixels: columns x .. x + width - 1, rows y .. y + height - 1. */
export interface CropRect {
  x: number;
  y: number;
  width: number;
  height: number;
}

export interface BackgroundOptions {
  /**
   * `'subtract'`: I - I_ref; `'divide'`: I / I_ref (Kerr practice: a reference frame recorded at
   * saturation carries the illumination and the non-magnetic contrast). Pixels where the
   * reference is zero or not finite (or where the quotient overflows) cannot be corrected: they
   * get the mean of the corrected pixels of that frame, and are counted in the result.
   */
  mode: "divide" | "subtract";
  /** The reference frame, of the input frame's shape (a crop applies to both). */
  reference?: Frame;
}

/**
 * Subtract a Gaussian blur of the frame (uneven illumination). `sigma` (px) must be well above
 * the domain period — several periods — or the blur keeps part of the domain contrast and the
 * high-pass removes it. Structure wider than about sigma is removed too, including a real
 * large-scale variation of the magnetization. On open sides the frame is mirrored, so within
 * about 2 sigma of an open side a background gradient is only partly removed (fit a `'plane'`
 * first, or crop).
 */
export interface HighpassFlatten {
  mode: "gaussian-highpass";
  /** Standard deviation of the blur in px. */
  sigma: number;
  /** Kernel of the blur. @default 'auto' (the box cascade for sigma > 4 px) */
  method?: GaussianMethodOption;
  /** @default 'mean' */
  offset?: FlattenOffset;
}

/**
 * Subtract the least-squares polynomial surface of total degree `order` (`'plane'`: order 1).
 * Every pixel counts in the fit, domains included: the surface absorbs a magnetization that is
 * not balanced across the frame (e.g. up domains gathered on one side).
 */
export interface PolynomialFlatten {
  mode: "plane" | "poly";
  /** Total degree of the surface (only for `'poly'`). @default 2 */
  order?: 1 | 2 | 3;
  /** @default 'mean' */
  offset?: FlattenOffset;
}

/**
 * Per-line levelling (MFM practice): subtract from each row (the fast scan direction) its median
 * or its mean. The median ignores spikes and streaks; both assume every row crosses up and
 * down domains in the same proportion, so a row lying mostly in one domain is shifted.
 */
export interface LinesFlatten {
  mode: "lines";
  /** @default 'median' */
  statistic?: "median" | "mean";
  /** @default 'mean' */
  offset?: FlattenOffset;
}

export type FlattenOptions = HighpassFlatten | PolynomialFlatten | LinesFlatten;

export interface SmoothOptions {
  /** Standard deviation of the Gaussian in px. */
  sigma: number;
  /** Radius of the direct kernel in sigmas. @default 4 */
  truncate?: number;
  /** @default 'auto' (the sampled kernel for sigma <= 4 px) */
  method?: GaussianMethodOption;
}

export interface PreprocessOptions {
  /** Keep only this rectangle (of the frame and of the background reference). @default none */
  crop?: CropRect;
  /** Divide by or subtract a reference frame. @default none */
  background?: BackgroundOptions;
  /** Remove uneven illumination or line offsets. @default none */
  flatten?: FlattenOptions;
  /** Gaussian smoothing (after flattening). @default none */
  smooth?: SmoothOptions;
  /** Periodic sides are wrapped by the Gaussian filters, open sides mirrored. @default 'open' */
  boundary?: PrepBoundary;
}

export type ResolvedFlatten =
  | { mode: "gaussian-highpass"; sigma: number; method: GaussianMethod; offset: FlattenOffset }
  | { mode: "plane" | "poly"; order: 1 | 2 | 3; offset: FlattenOffset }
  | { mode: "lines"; statistic: "median" | "mean"; offset: FlattenOffset };

/** The options with defaults filled in; plain JSON (the reference is recorded by its shape). */
export interface ResolvedPreprocessOptions {
  crop: CropRect | null;
  background: { mode: "divide" | "subtract"; reference: { width: number; height: number } } | null;
  flatten: ResolvedFlatten | null;
  smooth: { sigma: number; truncate: number; method: GaussianMethod } | null;
  boundary: PrepBoundary;
}

export interface PreprocessResult {
  /** The preprocessed frame (Float32 samples), or the input itself when nothing was asked. */
  frame: Frame;
  options: ResolvedPreprocessOptions;
  /** Pixels that could not be corrected by the reference and the value they were given. */
  background: { invalidPixels: number; fill: number } | null;
  /** Mean of the removed surface, and the surface's coefficients for `'plane'` / `'poly'`. */
  flatten: { removedMean: number; terms?: [number, number][]; coefficients?: number[] } | null;
}

const KNOWN = new Set(["crop", "background", "flatten", "smooth", "boundary"]);

function checkKeys(what: string, value: object, known: string[]): void {
  for (const key of Object.keys(value)) {
    if (!known.includes(key)) throw new Error(`${what}.${key}: unknown option (known: ${known.join(", ")})`);
  }
}

function checkObject(what: string, value: unknown): void {
  if (value === null || typeof value !== "object") {
    throw new Error(`${what}: expected an object, got ${describeValue(value)}`);
  }
}

function checkInteger(what: string, value: unknown, min: number, max: number, why = ""): number {
  if (typeof value !== "number" || !Number.isInteger(value) || value < min || value > max) {
    throw new Error(`${what}: expected a whole number in [${min}, ${max}]${why}, got ${describeValue(value)}`);
  }
  return value;
}

function resolveMethod(what: string, value: unknown, sigma: number): GaussianMethod {
  const m = checkChoice(what, value ?? "auto", ["auto", "direct", "box"] as const);
  return m === "auto" ? (sigma <= DIRECT_SIGMA_LIMIT ? "direct" : "box") : m;
}

/**
 * Validates options against a frame shape and fills in defaults. `reference` (if given) is the
 * background reference when `options.background.reference` is absent.
 */
export function resolvePreprocessOptions(
  width: number, height: number, options: PreprocessOptions = {}, reference?: Frame,
): { resolved: ResolvedPreprocessOptions; reference: Frame | null } {
  checkObject("options", options);
  checkKeys("options", options, [...KNOWN]);
  const boundary = checkChoice(
    "options.boundary", options.boundary ?? "open", ["open", "periodic", "periodic-x", "periodic-y"] as const,
  );
  let crop: CropRect | null = null;
  if (options.crop !== undefined) {
    const c = options.crop;
    checkObject("options.crop", c);
    checkKeys("options.crop", c, ["x", "y", "width", "height"]);
    const x = checkInteger("options.crop.x", c.x, 0, width - 1, ` (the frame is ${width} wide)`);
    const y = checkInteger("options.crop.y", c.y, 0, height - 1, ` (the frame is ${height} high)`);
    const cw = checkInteger("options.crop.width", c.width, 1, width - x, ` (the frame is ${width} wide, crop.x is ${x})`);
    const ch = checkInteger("options.crop.height", c.height, 1, height - y, ` (the frame is ${height} high, crop.y is ${y})`);
    const px = boundary === "periodic" || boundary === "periodic-x";
    const py = boundary === "periodic" || boundary === "periodic-y";
    if ((px && cw < width) || (py && ch < height)) {
      const axis = px && cw < width ? "x" : "y";
      throw new Error(
        `options.crop: a crop cut across a periodic side is not periodic in ${axis}; expected boundary "open" (or the full ${axis === "x" ? `width ${width}` : `height ${height}`}), got boundary ${JSON.stringify(boundary)}`,
      );
    }
    crop = { x, y, width: cw, height: ch };
  }
  const outW = crop ? crop.width : width, outH = crop ? crop.height : height;

  let background: ResolvedPreprocessOptions["background"] = null;
  let ref: Frame | null = null;
  if (options.background !== undefined) {
    const b = options.background;
    checkObject("options.background", b);
    checkKeys("options.background", b, ["mode", "reference"]);
    const mode = checkChoice("options.background.mode", b.mode, ["divide", "subtract"] as const);
    if (b.reference !== undefined && reference !== undefined && b.reference !== reference) {
      throw new Error("background reference: expected one reference, got one in options.background and another as argument");
    }
    ref = b.reference ?? reference ?? null;
    if (ref === null) {
      throw new Error("options.background.reference: expected a reference frame, got undefined");
    }
    checkFrame(ref, "background reference");
    if (ref.width !== width || ref.height !== height) {
      throw new Error(
        `background reference: expected the frame's shape ${width} x ${height}, got ${ref.width} x ${ref.height}`,
      );
    }
    background = { mode, reference: { width: ref.width, height: ref.height } };
  }

  let flatten: ResolvedFlatten | null = null;
  if (options.flatten !== undefined) {
    const f = options.flatten as FlattenOptions;
    checkObject("options.flatten", f);
    const mode = checkChoice("options.flatten.mode", f.mode, ["gaussian-highpass", "plane", "poly", "lines"] as const);
    const offset = (o: unknown) => checkChoice("options.flatten.offset", o ?? "mean", ["mean", "zero"] as const);
    if (mode === "gaussian-highpass") {
      const h = f as HighpassFlatten;
      checkKeys("options.flatten", h, ["mode", "sigma", "method", "offset"]);
      const sigma = checkPositive("options.flatten.sigma", h.sigma);
      flatten = { mode, sigma, method: resolveMethod("options.flatten.method", h.method, sigma), offset: offset(h.offset) };
    } else if (mode === "plane" || mode === "poly") {
      const p = f as PolynomialFlatten;
      checkKeys("options.flatten", p, mode === "plane" ? ["mode", "offset"] : ["mode", "order", "offset"]);
      const order = mode === "plane" ? 1 : checkChoice("options.flatten.order", p.order ?? 2, [1, 2, 3] as const);
      if (outW <= order || outH <= order) {
        throw new Error(
          `options.flatten: a surface of order ${order} needs at least ${order + 1} x ${order + 1} pixels, got ${outW} x ${outH}`,
        );
      }
      flatten = { mode, order, offset: offset(p.offset) };
    } else {
      const l = f as LinesFlatten;
      checkKeys("options.flatten", l, ["mode", "statistic", "offset"]);
      const statistic = checkChoice("options.flatten.statistic", l.statistic ?? "median", ["median", "mean"] as const);
      flatten = { mode, statistic, offset: offset(l.offset) };
    }
  }

  let smooth: ResolvedPreprocessOptions["smooth"] = null;
  if (options.smooth !== undefined) {
    const s = options.smooth;
    checkObject("options.smooth", s);
    checkKeys("options.smooth", s, ["sigma", "truncate", "method"]);
    const sigma = checkPositive("options.smooth.sigma", s.sigma);
    const truncate = checkNumber("options.smooth.truncate", s.truncate ?? 4, 1, 10);
    smooth = { sigma, truncate, method: resolveMethod("options.smooth.method", s.method, sigma) };
  }
  return { resolved: { crop, background, flatten, smooth, boundary }, reference: ref };
}

function nothingAsked(o: ResolvedPreprocessOptions): boolean {
  return !o.crop && !o.background && !o.flatten && !o.smooth;
}

/**
 * A preprocessing workspace for frames of one shape: every buffer (output, blur scratch,
 * cropped reference) is allocated once, so a movie costs the memory of one frame. The frame
 * returned by `process` is a view valid until the next call.
 */
export class Preprocessor {
  /** Input frame shape. */
  readonly width: number;
  readonly height: number;
  /** Output frame shape (the crop's, or the input's). */
  readonly outWidth: number;
  readonly outHeight: number;
  readonly options: ResolvedPreprocessOptions;
  private readonly out: Float32Array;
  private readonly blurred: Float32Array | null = null;
  private readonly ref: Float32Array | null = null;
  private readonly highpass: GaussianPlan | null = null;
  private readonly smoother: GaussianPlan | null = null;
  private readonly surface: PolynomialSurface | null = null;
  private readonly rowLevels: Float64Array | null = null;
  private readonly rowScratch: Float32Array | null = null;

  constructor(width: number, height: number, options: PreprocessOptions = {}, reference?: Frame) {
    this.width = checkSize("preprocessor width", width);
    this.height = checkSize("preprocessor height", height);
    const { resolved, reference: ref } = resolvePreprocessOptions(width, height, options, reference);
    this.options = resolved;
    const o = resolved;
    this.outWidth = o.crop ? o.crop.width : width;
    this.outHeight = o.crop ? o.crop.height : height;
    const w = this.outWidth, h = this.outHeight;
    this.out = new Float32Array(nothingAsked(o) ? 0 : w * h);
    if (ref) {
      this.ref = new Float32Array(w * h);
      this.copyCropped(ref.data, this.ref);
    }
    const px = o.boundary === "periodic" || o.boundary === "periodic-x";
    const py = o.boundary === "periodic" || o.boundary === "periodic-y";
    const edges = { edgeX: (px ? "wrap" : "reflect") as EdgeMode, edgeY: (py ? "wrap" : "reflect") as EdgeMode };
    const f = o.flatten;
    if (f?.mode === "gaussian-highpass") {
      this.highpass = new GaussianPlan(w, h, f.sigma, { ...edges, method: f.method });
      this.blurred = new Float32Array(w * h);
    } else if (f?.mode === "plane" || f?.mode === "poly") {
      this.surface = new PolynomialSurface(w, h, f.order);
    } else if (f?.mode === "lines") {
      this.rowLevels = new Float64Array(h);
      this.rowScratch = new Float32Array(w);
    }
    if (o.smooth) {
      this.smoother = new GaussianPlan(w, h, o.smooth.sigma, { ...edges, method: o.smooth.method, truncate: o.smooth.truncate });
    }
  }

  private copyCropped(src: FrameData, dst: Float32Array): void {
    const c = this.options.crop;
    if (!c) { dst.set(src); return; }
    for (let y = 0; y < c.height; y++) {
      const s = (c.y + y) * this.width + c.x;
      dst.set(src.subarray(s, s + c.width), y * c.width);
    }
  }

  /** Preprocesses one frame of the workspace's shape; `result.frame.data` is valid until the next call. */
  process(frame: Frame, where = "frame"): PreprocessResult {
    checkFrame(frame, where);
    if (frame.width !== this.width || frame.height !== this.height) {
      throw new Error(
        `${where}: expected a ${this.width} x ${this.height} frame for this preprocessor, got ${frame.width} x ${frame.height}`,
      );
    }
    const o = this.options;
    const result: PreprocessResult = { frame, options: o, background: null, flatten: null };
    if (nothingAsked(o)) return result;
    const w = this.outWidth, h = this.outHeight, n = w * h, out = this.out;
    this.copyCropped(frame.data, out);
    if (frame.data instanceof Float32Array) {
      let bad = 0;
      for (let i = 0; i < n; i++) if (out[i]! - out[i]! !== 0) bad++;
      if (bad > 0) throw new Error(`${where}: expected finite samples, got ${bad} NaN or infinite sample(s)`);
    }
    if (o.background && this.ref) result.background = this.applyReference(o.background.mode);
    const f = o.flatten;
    if (f) {
      if (f.mode === "gaussian-highpass") {
        const bg = this.highpass!.apply(this.blurred!, out);
        let s = 0;
        for (let i = 0; i < n; i++) s += bg[i]!;
        const mean = s / n, add = f.offset === "mean" ? mean : 0;
        for (let i = 0; i < n; i++) out[i] = out[i]! - bg[i]! + add;
        result.flatten = { removedMean: mean };
      } else if (f.mode === "lines") {
        const mean = levelLines(out, w, h, f.statistic, f.offset, this.rowLevels!, this.rowScratch!);
        result.flatten = { removedMean: mean };
      } else {
        const surface = this.surface!;
        const c = surface.fit(out);
        // Least squares with a constant term leaves residuals of zero mean: the surface's mean is
        // the frame's mean, c[0] is the surface at the centre.
        let s = 0;
        for (let i = 0; i < n; i++) s += out[i]!;
        const mean = s / n;
        surface.subtract(out, c, f.offset === "mean" ? mean : 0);
        result.flatten = {
          removedMean: mean, terms: surface.terms.map(([a, b]) => [a, b]), coefficients: Array.from(c),
        };
      }
    }
    if (this.smoother) this.smoother.apply(out, out);
    result.frame = { width: w, height: h, data: out };
    return result;
  }

  private applyReference(mode: "divide" | "subtract"): { invalidPixels: number; fill: number } {
    const out = this.out, ref = this.ref!, n = out.length;
    let invalid = 0, sum = 0;
    for (let i = 0; i < n; i++) {
      const r = ref[i]!;
      const v = Math.fround(mode === "divide" ? out[i]! / r : out[i]! - r);
      // Zero (divide) or non-finite reference samples, and overflowing results, cannot be used.
      if (r - r !== 0 || (mode === "divide" && r === 0) || v - v !== 0) { out[i] = NaN; invalid++; }
      else { out[i] = v; sum += v; }
    }
    if (invalid === n) {
      throw new Error(
        `background reference: expected at least one finite${mode === "divide" ? ", non-zero" : ""} sample, got none (${n} pixels)`,
      );
    }
    const fill = sum / (n - invalid);
    if (invalid > 0) for (let i = 0; i < n; i++) if (out[i]! !== out[i]!) out[i] = fill;
    return { invalidPixels: invalid, fill };
  }
}

/** A reusable preprocessing workspace for a movie of frames of one shape (see Preprocessor). */
export function createPreprocessor(
  width: number, height: number, options: PreprocessOptions = {}, reference?: Frame,
): Preprocessor {
  return new Preprocessor(width, height, options, reference);
}

/**
 * Preprocesses one frame: crop, background reference, flattening, smoothing (each only when
 * asked, in that order). Returns a new Float32 frame, or the input itself when nothing is asked.
 * `reference` supplies the background reference when `options.background.reference` is absent.
 */
export function preprocessFrame(frame: Frame, options: PreprocessOptions = {}, reference?: Frame): PreprocessResult {
  checkFrame(frame);
  return new Preprocessor(frame.width, frame.height, options, reference).process(frame);
}
