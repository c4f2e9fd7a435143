// Seeded test frames for the benchmarks: a band-pass Gaussian random field (random complex
// amplitudes on a ring of wave numbers, inverse 2-D FFT with fft.js), thresholded at 0 (maze)
// or high (isolated bubbles), and 50% white noise. All frames are periodic by construction.
import FFT from "fft.js";
import { mulberry32 } from "../test/reference/random-frames";

/** A band-pass random field on an n x n grid (n a power of two), period about `periodPx`. */
export function bandPassField(n: number, periodPx: number, seed: number): Float64Array {
  const random = mulberry32(seed);
  const gauss = () => Math.sqrt(-2 * Math.log(1 - random())) * Math.cos(2 * Math.PI * random());
  const q0 = n / periodPx; // ring radius in cycles per frame
  const half = 0.15 * q0;
  const fft = new FFT(n);
  // Spectrum, row-major, interleaved re/im; inverse transform rows, then columns.
  const spec = new Float64Array(2 * n * n);
  for (let v = 0; v < n; v++) {
    const qy = v < n / 2 ? v : v - n;
    for (let u = 0; u < n; u++) {
      const qx = u < n / 2 ? u : u - n;
      const q = Math.hypot(qx, qy);
      if (Math.abs(q - q0) > half) continue;
      spec[2 * (v * n + u)] = gauss();
      spec[2 * (v * n + u) + 1] = gauss();
    }
  }
  const line = fft.createComplexArray() as number[];
  const out = fft.createComplexArray() as number[];
  for (let v = 0; v < n; v++) {
    for (let k = 0; k < 2 * n; k++) line[k] = spec[2 * v * n + k]!;
    fft.inverseTransform(out, line);
    for (let k = 0; k < 2 * n; k++) spec[2 * v * n + k] = out[k]!;
  }
  for (let u = 0; u < n; u++) {
    for (let v = 0; v < n; v++) {
      line[2 * v] = spec[2 * (v * n + u)]!;
      line[2 * v + 1] = spec[2 * (v * n + u) + 1]!;
    }
    fft.inverseTransform(out, line);
    for (let v = 0; v < n; v++) spec[2 * (v * n + u)] = out[2 * v]!;
  }
  const field = new Float64Array(n * n);
  let s2 = 0;
  for (let i = 0; i < n * n; i++) { field[i] = spec[2 * i]!; s2 += field[i]! ** 2; }
  const sd = Math.sqrt(s2 / (n * n)) || 1;
  for (let i = 0; i < n * n; i++) field[i]! /= sd; // unit variance
  return field;
}

export type Pattern = "maze" | "bubble" | "noise";

/** A 0/1 frame (Uint8Array, 1 = up) of the given pattern, n x n. */
export function patternFrame(pattern: Pattern, n: number, seed: number): Uint8Array {
  if (pattern === "noise") {
    const random = mulberry32(seed);
    return Uint8Array.from({ length: n * n }, () => (random() < 0.5 ? 1 : 0));
  }
  const field = bandPassField(n, 16, seed);
  const level = pattern === "maze" ? 0 : 1.3; // above 1.3 sd: about 10% up, isolated bubbles
  const out = new Uint8Array(n * n);
  for (let i = 0; i < n * n; i++) out[i] = field[i]! > level ? 1 : 0;
  return out;
}
