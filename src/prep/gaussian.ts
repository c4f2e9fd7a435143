// Separable Gaussian filtering of Float32 frames, two ways:
//  - 'direct': convolution with the sampled Gaussian exp(-k^2 / (2 sigma^2)), truncated at
//    |k| <= ceil(truncate * sigma) and normalized to sum 1 (so constants and sums are kept);
//  - 'box': BOX_PASSES passes of an extended box filter whose variance is sigma^2 / BOX_PASSES,
//    so the cascade has variance sigma^2 exactly (Gwosdek, Grewenig, Bruhn & Weickert 2011,
//    "Theoretical foundations of Gaussian convolution by extended box filtering", SSVM LNCS 6667:447).
//    Its cost does not grow with sigma. Its impulse response departs from the Gaussian by at most
//    BOX_PEAK_ERROR of the Gaussian's peak (measured over sigma 2..100, see test/prep/gaussian.test.ts).
// Sides are reflected (half-sample symmetric: ... c b a | a b c ...) or wrapped, per axis.
import { checkPositive, checkSize } from "../frame";

/** How a line continues past its ends: mirrored about the end sample's outer edge, or wrapped. */
export type EdgeMode = "reflect" | "wrap";
/** `'direct'` sampled kernel, `'box'` extended-box cascade (cost independent of sigma). */
export type GaussianMethod = "direct" | "box";

/** Passes of the extended box cascade. */
export const BOX_PASSES = 4;
/** Largest |box cascade - Gaussian| over the Gaussian's peak value, in 1-D (measured). */
export const BOX_PEAK_ERROR = 0.036;
/** 'auto' picks the direct kernel up to this sigma (px), the box cascade above (the two cost
 * about the same at sigma 3-4 on 512 x 512 frames; the direct kernel is the exact one). */
export const DIRECT_SIGMA_LIMIT = 4;

/**
 * Source index of each padded position -pad..n+pad-1 of a line of n samples (entry i + pad).
 * Reflection repeats with period 2n, so any pad works, also pad > n.
 */
export function edgeIndex(n: number, pad: number, edge: EdgeMode): Int32Array {
  const map = new Int32Array(n + 2 * pad);
  const period = 2 * n;
  for (let i = -pad; i < n + pad; i++) {
    let j: number;
    if (edge === "wrap") j = ((i % n) + n) % n;
    else {
      const m = ((i % period) + period) % period;
      j = m < n ? m : period - 1 - m;
    }
    map[i + pad] = j;
  }
  return map;
}

/** Half of the sampled, truncated, normalized Gaussian: w[0] centre, w[k] at +-k. */
export function gaussianHalfKernel(sigma: number, truncate = 4): Float64Array {
  const radius = Math.max(1, Math.ceil(truncate * sigma));
  const w = new Float64Array(radius + 1);
  let sum = 0;
  for (let k = 0; k <= radius; k++) {
    w[k] = Math.exp((-k * k) / (2 * sigma * sigma));
    sum += k === 0 ? w[k]! : 2 * w[k]!;
  }
  for (let k = 0; k <= radius; k++) w[k]! /= sum;
  return w;
}

/** One extended box: radius r plus end weight alpha in [0, 1), variance s2 (Gwosdek et al. 2011). */
export function extendedBox(s2: number): { radius: number; alpha: number; norm: number } {
  // A plain box of radius r has variance r (r + 1) / 3; take the largest r not above s2.
  const r = Math.max(0, Math.floor(0.5 * Math.sqrt(12 * s2 + 1) - 0.5));
  // Weights [alpha, 1 .. 1, alpha] / (2r + 1 + 2 alpha): variance
  // (r (r+1) (2r+1) / 3 + 2 alpha (r+1)^2) / (2r + 1 + 2 alpha) = s2, solved for alpha.
  const alpha = ((2 * r + 1) * (3 * s2 - r * (r + 1))) / (6 * ((r + 1) * (r + 1) - s2));
  return { radius: r, alpha, norm: 1 / (2 * r + 1 + 2 * alpha) };
}

export interface GaussianPlanOptions {
  /** Continuation past the left and right sides. @default 'reflect' */
  edgeX?: EdgeMode;
  /** Continuation past the top and bottom sides. @default 'reflect' */
  edgeY?: EdgeMode;
  /** Kernel: sampled Gaussian or box cascade. @default 'direct' */
  method?: GaussianMethod;
  /** Direct kernel radius in sigmas (ceil(truncate * sigma) px). @default 4 */
  truncate?: number;
}

/**
 * A Gaussian filter for frames of one shape, built once (kernel, index maps, scratch) and applied
 * to frame after frame: `apply(out, input)`, where out may be input (in-place).
 */
export class GaussianPlan {
  readonly width: number;
  readonly height: number;
  readonly sigma: number;
  readonly method: GaussianMethod;
  readonly truncate: number;
  private readonly half: Float64Array;
  private readonly box: { radius: number; alpha: number; norm: number };
  private readonly pad: number;
  private readonly mapX: Int32Array;
  private readonly mapY: Int32Array;
  private readonly line: Float32Array;
  private readonly line2: Float32Array;
  private readonly acc: Float64Array;
  private readonly scratch: Float32Array;

  constructor(width: number, height: number, sigma: number, options: GaussianPlanOptions = {}) {
    this.width = checkSize("gaussian width", width);
    this.height = checkSize("gaussian height", height);
    this.sigma = checkPositive("sigma", sigma);
    this.method = options.method ?? "direct";
    this.truncate = checkPositive("truncate", options.truncate ?? 4);
    this.half = gaussianHalfKernel(sigma, this.truncate);
    this.box = extendedBox((sigma * sigma) / BOX_PASSES);
    this.pad = this.method === "direct" ? this.half.length - 1 : this.box.radius + 1;
    this.mapX = edgeIndex(width, this.pad, options.edgeX ?? "reflect");
    this.mapY = edgeIndex(height, this.pad, options.edgeY ?? "reflect");
    this.line = new Float32Array(width + 2 * this.pad);
    this.line2 = new Float32Array(width);
    this.acc = new Float64Array(width);
    this.scratch = new Float32Array(width * height);
  }

  /** Radius of the kernel in px (of one box for the cascade). */
  get radius(): number {
    return this.method === "direct" ? this.half.length - 1 : this.box.radius;
  }

  /** out = G_sigma * input (both width * height samples; out may be input). */
  apply(out: Float32Array, input: Float32Array): Float32Array {
    const n = this.width * this.height;
    if (out.length !== n || input.length !== n) {
      throw new Error(`gaussian: expected ${this.width} x ${this.height} = ${n} samples, got ${input.length} in, ${out.length} out`);
    }
    if (this.method === "direct") {
      this.directRows(input, this.scratch);
      this.directColumns(this.scratch, out);
    } else {
      // The row passes read each row into a line buffer first, so any target is safe; the
      // column passes alternate between out and scratch and end in out.
      const odd = BOX_PASSES % 2 === 1;
      let a = odd ? this.scratch : out, b = odd ? out : this.scratch;
      this.boxRows(input, a);
      for (let p = 0; p < BOX_PASSES; p++) {
        this.boxColumns(a, b);
        const t = a; a = b; b = t;
      }
    }
    return out;
  }

  private fillLine(src: Float32Array, offset: number): void {
    const line = this.line, map = this.mapX;
    for (let i = 0; i < line.length; i++) line[i] = src[offset + map[i]!]!;
  }

  private directRows(src: Float32Array, dst: Float32Array): void {
    const w = this.width, h = this.height, r = this.pad, wk = this.half, line = this.line;
    const w0 = wk[0]!;
    for (let y = 0; y < h; y++) {
      const o = y * w;
      this.fillLine(src, o);
      for (let x = 0; x < w; x++) {
        const c = x + r;
        let s = w0 * line[c]!;
        for (let k = 1; k <= r; k++) s += wk[k]! * (line[c - k]! + line[c + k]!);
        dst[o + x] = s;
      }
    }
  }

  private directColumns(src: Float32Array, dst: Float32Array): void {
    const w = this.width, h = this.height, r = this.pad, wk = this.half, map = this.mapY;
    const w0 = wk[0]!;
    for (let y = 0; y < h; y++) {
      const o = y * w;
      for (let x = 0; x < w; x++) dst[o + x] = w0 * src[o + x]!;
      for (let k = 1; k <= r; k++) {
        const a = map[y + r - k]! * w, b = map[y + r + k]! * w, wt = wk[k]!;
        for (let x = 0; x < w; x++) dst[o + x]! += wt * (src[a + x]! + src[b + x]!);
      }
    }
  }

  private boxRows(src: Float32Array, dst: Float32Array): void {
    const w = this.width, h = this.height, P = this.pad, line = this.line, out = this.line2;
    const { radius: r, alpha, norm } = this.box;
    const map = this.mapX;
    for (let y = 0; y < h; y++) {
      const o = y * w;
      this.fillLine(src, o);
      for (let p = 0; p < BOX_PASSES; p++) {
        let s = 0;
        for (let k = -r; k <= r; k++) s += line[P + k]!;
        for (let x = 0; x < w; x++) {
          const c = x + P;
          out[x] = (s + alpha * (line[c - r - 1]! + line[c + r + 1]!)) * norm;
          s += line[c + r + 1]! - line[c - r]!;
        }
        if (p === BOX_PASSES - 1) dst.set(out, o);
        else for (let i = 0; i < line.length; i++) line[i] = out[map[i]!]!;
      }
    }
  }

  private boxColumns(src: Float32Array, dst: Float32Array): void {
    const w = this.width, h = this.height, P = this.pad, map = this.mapY, acc = this.acc;
    const { radius: r, alpha, norm } = this.box;
    acc.fill(0);
    for (let k = -r; k <= r; k++) {
      const a = map[P + k]! * w;
      for (let x = 0; x < w; x++) acc[x]! += src[a + x]!;
    }
    for (let y = 0; y < h; y++) {
      const o = y * w, c = y + P;
      const lo = map[c - r - 1]! * w, hi = map[c + r + 1]! * w, first = map[c - r]! * w;
      for (let x = 0; x < w; x++) {
        const far = src[hi + x]!;
        dst[o + x] = (acc[x]! + alpha * (src[lo + x]! + far)) * norm;
        acc[x]! += far - src[first + x]!;
      }
    }
  }
}
