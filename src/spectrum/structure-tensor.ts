// Structure tensor (Kass & Witkin 1987, Comput. Vision Graph. Image Process. 37:362): the
// Gaussian-smoothed outer product of the gradient, J = G_sigma * (grad f)(grad f)^T. Its
// dominant eigenvector gives the local gradient direction (normal to the walls), the coherence
// sqrt((Jxx - Jyy)^2 + 4 Jxy^2) / (Jxx + Jyy) how well a single direction dominates, and the
// frame-summed tensor the same number for the whole frame: a nematic order parameter weighted by
// gradient energy, a second estimate beside the ring's order2.
import type { Frame } from "../types";
import { checkFrame } from "./options";
import { wrapDeg } from "./order";

/** Options of `structureTensor`. */
export interface StructureTensorOptions {
  /** See SpectrumOptions.signal. @default 'binary' for Uint8Array data, 'grey' otherwise */
  signal?: "binary" | "grey";
  /** Open frames skip the one-pixel border; periodic frames wrap. @default 'open' */
  boundary?: "open" | "periodic";
  /** `global` returns the frame's order only; `local` adds per-pixel fields. @default 'local' */
  output?: "global" | "local";
  /** Integration scale (Gaussian sigma) of the local tensor, pixels. @default 2 */
  sigmaPx?: number;
}

/** Result of `structureTensor`. Angles are of the gradient (wavevector), from +x toward +y (rows). */
export interface StructureTensorResult {
  width: number;
  height: number;
  /** Nematic order of the summed tensor, 0 .. 1; undefined for a frame without gradients. */
  order2: number | undefined;
  /** Dominant gradient direction, degrees in [0, 180). */
  angleDeg: number | undefined;
  /** Mean local coherence over pixels with a gradient in their neighbourhood (local output). */
  meanCoherence?: number;
  /** Local gradient direction per pixel, degrees in [0, 180) (local output). */
  orientationDeg?: Float32Array;
  /** Local coherence per pixel, 0 .. 1 (local output). */
  coherence?: Float32Array;
  sigmaPx: number;
  options: { signal: "binary" | "grey"; boundary: "open" | "periodic"; output: "global" | "local"; sigmaPx: number };
}

function signalOf(frame: Frame, signal: "binary" | "grey"): Float32Array {
  const n = frame.width * frame.height;
  const f = new Float32Array(n);
  const d = frame.data;
  if (signal === "binary") for (let i = 0; i < n; i++) f[i] = d[i] ? 1 : -1;
  else f.set(d);
  return f;
}

/** Gaussian blur (separable, truncated at 3 sigma), periodic or clamped at the border, in place. */
function blur(f: Float32Array, w: number, h: number, sigma: number, periodic: boolean): void {
  const r = Math.max(1, Math.ceil(3 * sigma));
  const k = new Float32Array(2 * r + 1);
  let s = 0;
  for (let i = -r; i <= r; i++) s += k[i + r] = Math.exp((-i * i) / (2 * sigma * sigma));
  for (let i = 0; i < k.length; i++) k[i]! /= s;
  const idx = (i: number, n: number) => (periodic ? ((i % n) + n) % n : i < 0 ? 0 : i >= n ? n - 1 : i);
  const line = new Float32Array(Math.max(w, h));
  for (let y = 0; y < h; y++) {
    const o = y * w;
    for (let x = 0; x < w; x++) {
      let a = 0;
      for (let i = -r; i <= r; i++) a += k[i + r]! * f[o + idx(x + i, w)]!;
      line[x] = a;
    }
    f.set(line.subarray(0, w), o);
  }
  for (let x = 0; x < w; x++) {
    for (let y = 0; y < h; y++) {
      let a = 0;
      for (let i = -r; i <= r; i++) a += k[i + r]! * f[idx(y + i, h) * w + x]!;
      line[y] = a;
    }
    for (let y = 0; y < h; y++) f[y * w + x] = line[y]!;
  }
}

/**
 * Structure tensor of a frame with Scharr's rotation-optimised 3 x 3 derivative
 * ([3 10 3] / 32 smoothing x central difference; Scharr 2000, PhD thesis, Heidelberg).
 */
export function structureTensor(frame: Frame, options: StructureTensorOptions = {}): StructureTensorResult {
  checkFrame(frame);
  const signal = options.signal ?? (frame.data instanceof Uint8Array ? "binary" : "grey");
  const boundary = options.boundary ?? "open";
  const output = options.output ?? "local";
  const sigmaPx = options.sigmaPx ?? 2;
  if (!(Number.isFinite(sigmaPx) && sigmaPx > 0)) {
    throw new RangeError(`domtopo: structure tensor sigmaPx must be a finite number > 0, got ${String(sigmaPx)}`);
  }
  const { width: w, height: h } = frame;
  const f = signalOf(frame, signal);
  const periodic = boundary === "periodic";
  const local = output === "local";
  const n = w * h;
  const jxx = local ? new Float32Array(n) : undefined;
  const jyy = local ? new Float32Array(n) : undefined;
  const jxy = local ? new Float32Array(n) : undefined;
  let sxx = 0, syy = 0, sxy = 0;
  const y0 = periodic ? 0 : 1, y1 = periodic ? h : h - 1;
  const x0 = periodic ? 0 : 1, x1 = periodic ? w : w - 1;
  for (let y = y0; y < y1; y++) {
    const ym = (y === 0 ? h - 1 : y - 1) * w, yc = y * w, yp = (y === h - 1 ? 0 : y + 1) * w;
    let rowXX = 0, rowYY = 0, rowXY = 0;
    for (let x = x0; x < x1; x++) {
      const xm = x === 0 ? w - 1 : x - 1, xp = x === w - 1 ? 0 : x + 1;
      const gx = (3 * (f[ym + xp]! - f[ym + xm]!) + 10 * (f[yc + xp]! - f[yc + xm]!) + 3 * (f[yp + xp]! - f[yp + xm]!)) / 32;
      const gy = (3 * (f[yp + xm]! - f[ym + xm]!) + 10 * (f[yp + x]! - f[ym + x]!) + 3 * (f[yp + xp]! - f[ym + xp]!)) / 32;
      const a = gx * gx, b = gy * gy, c = gx * gy;
      rowXX += a; rowYY += b; rowXY += c;
      if (local) { jxx![yc + x] = a; jyy![yc + x] = b; jxy![yc + x] = c; }
    }
    sxx += rowXX; syy += rowYY; sxy += rowXY;
  }
  const trace = sxx + syy;
  const result: StructureTensorResult = {
    width: w, height: h,
    order2: trace > 0 ? Math.min(1, Math.hypot(sxx - syy, 2 * sxy) / trace) : undefined,
    angleDeg: trace > 0 ? wrapDeg((Math.atan2(2 * sxy, sxx - syy) * 90) / Math.PI, 180) : undefined,
    sigmaPx,
    options: { signal, boundary, output, sigmaPx },
  };
  if (local) {
    blur(jxx!, w, h, sigmaPx, periodic);
    blur(jyy!, w, h, sigmaPx, periodic);
    blur(jxy!, w, h, sigmaPx, periodic);
    const orientationDeg = new Float32Array(n);
    const coherence = new Float32Array(n);
    let maxTrace = 0;
    for (let i = 0; i < n; i++) maxTrace = Math.max(maxTrace, jxx![i]! + jyy![i]!);
    let sum = 0, count = 0;
    for (let i = 0; i < n; i++) {
      const a = jxx![i]!, b = jyy![i]!, c = jxy![i]!;
      const t = a + b;
      if (t > 1e-6 * maxTrace && t > 0) {
        const coh = Math.min(1, Math.hypot(a - b, 2 * c) / t);
        coherence[i] = coh;
        orientationDeg[i] = wrapDeg((Math.atan2(2 * c, a - b) * 90) / Math.PI, 180);
        sum += coh; count++;
      }
    }
    result.orientationDeg = orientationDeg;
    result.coherence = coherence;
    result.meanCoherence = count > 0 ? sum / count : undefined;
  }
  return result;
}
