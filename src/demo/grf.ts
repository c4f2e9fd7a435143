// Periodic Gaussian random fields by spectral synthesis: complex Gaussian coefficients with a
// chosen power spectrum, inverse 2-D FFT (fft.js), real part. Band-pass ("ring") spectra give
// mazes of a chosen period when thresholded at zero (Cahn 1965, J. Chem. Phys. 42:93; Berk 1987,
// PRL 58:2718); Gaussian spectra give smoothed noise of a chosen correlation length.
import FFT from "fft.js";
import { normalSource } from "./random";
import { checkPositive, checkSize } from "../frame";

export interface RandomFieldOptions {
  width: number;
  height: number;
  /** Seed of the coefficients. @default 1 */
  seed?: number;
  /**
   * `'ring'`: power exp(-(q - 1/period)^2 / (2 (bandwidth/period)^2)), a maze of that period.
   * `'gaussian'`: power exp(-(2 pi q)^2 smoothing^2), white noise smoothed by a Gaussian of
   * standard deviation `smoothing` px. @default 'ring'
   */
  spectrum?: "ring" | "gaussian";
  /** Ring spectrum: domain period in pixels (one up plus one down stripe). @default 24 */
  period?: number;
  /** Ring spectrum: ring half-width relative to the ring radius. @default 0.15 */
  bandwidth?: number;
  /** Gaussian spectrum: smoothing length in pixels. @default 4 */
  smoothing?: number;
  /**
   * Alignment of the stripes: 0 is isotropic; larger values concentrate the ring around the
   * angle `direction` (power weighted by exp(alignment (cos 2(theta - direction) - 1))).
   * @default 0
   */
  alignment?: number;
  /** Wave-vector direction for aligned stripes, in degrees from +x. @default 0 */
  direction?: number;
}

export interface RandomField {
  width: number;
  height: number;
  /** Zero mean, unit variance over the frame (exactly, for this realization). */
  data: Float32Array;
  /** Mean square derivative along x and y of the unit-variance field (exact, spectral). */
  lambda2x: number;
  lambda2y: number;
}

function isPowerOfTwo(n: number): boolean {
  return n >= 2 && (n & (n - 1)) === 0;
}

/** A seeded periodic Gaussian random field; sizes must be powers of two (>= 2). */
export function gaussianRandomField(options: RandomFieldOptions): RandomField {
  const width = checkSize("width", options.width);
  const height = checkSize("height", options.height);
  if (!isPowerOfTwo(width) || !isPowerOfTwo(height)) {
    throw new Error(`random field: expected power-of-two sizes, got ${width} x ${height}`);
  }
  const spectrum = options.spectrum ?? "ring";
  const period = checkPositive("period", options.period ?? 24);
  const bandwidth = checkPositive("bandwidth", options.bandwidth ?? 0.15);
  const smoothing = checkPositive("smoothing", options.smoothing ?? 4);
  const alignment = options.alignment ?? 0;
  const dir = ((options.direction ?? 0) * Math.PI) / 180;
  const normal = normalSource((options.seed ?? 1) * 2654435761);
  const q0 = 1 / period, dq = bandwidth / period;

  // Coefficients z(kx, ky) in a width x height complex grid (row-major, interleaved re/im).
  const grid = new Float64Array(2 * width * height);
  for (let ky = 0; ky < height; ky++) {
    const fy = (ky <= height / 2 ? ky : ky - height) / height;
    for (let kx = 0; kx < width; kx++) {
      const fx = (kx <= width / 2 ? kx : kx - width) / width;
      const q = Math.hypot(fx, fy);
      let power = 0;
      if (q > 0) {
        power = spectrum === "ring"
          ? Math.exp(-((q - q0) ** 2) / (2 * dq * dq))
          : Math.exp(-((2 * Math.PI * q) ** 2) * smoothing * smoothing);
        if (alignment > 0) {
          const theta = Math.atan2(fy, fx);
          power *= Math.exp(alignment * (Math.cos(2 * (theta - dir)) - 1));
        }
      }
      const amp = Math.sqrt(power);
      const j = 2 * (ky * width + kx);
      grid[j] = amp * normal();
      grid[j + 1] = amp * normal();
    }
  }
  // Inverse FFT along rows, then along columns.
  inverseFft2(grid, width, height);
  // Keep the real part, normalized to zero mean and unit variance; the derivative variances
  // are then measured spectrally on the result (exact for a trigonometric polynomial).
  let variance = 0;
  const n = width * height;
  const data = new Float32Array(n);
  let mean = 0;
  for (let i = 0; i < n; i++) mean += grid[2 * i]!;
  mean /= n;
  for (let i = 0; i < n; i++) {
    const v = grid[2 * i]! - mean;
    variance += v * v;
  }
  variance /= n;
  const scale = variance > 0 ? 1 / Math.sqrt(variance) : 0;
  for (let i = 0; i < n; i++) data[i] = (grid[2 * i]! - mean) * scale;
  const { dx2, dy2 } = derivativeVariances(data, width, height);
  return { width, height, data, lambda2x: dx2, lambda2y: dy2 };
}

/**
 * Mean square derivatives of a periodic field treated as a trigonometric polynomial (exact for
 * band-limited fields): sum over wave vectors of (2 pi f)^2 |c(f)|^2, by Parseval.
 */
export function derivativeVariances(data: ArrayLike<number>, width: number, height: number) {
  const rowFft = new FFT(width), colFft = new FFT(height);
  const grid = new Float64Array(2 * width * height);
  const rowIn = rowFft.createComplexArray() as number[], rowOut = rowFft.createComplexArray() as number[];
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) { rowIn[2 * x] = data[y * width + x]!; rowIn[2 * x + 1] = 0; }
    rowFft.transform(rowOut, rowIn);
    for (let i = 0; i < 2 * width; i++) grid[2 * y * width + i] = rowOut[i]!;
  }
  const colIn = colFft.createComplexArray() as number[], colOut = colFft.createComplexArray() as number[];
  let total = 0, dx2 = 0, dy2 = 0;
  for (let kx = 0; kx < width; kx++) {
    for (let y = 0; y < height; y++) {
      colIn[2 * y] = grid[2 * (y * width + kx)]!;
      colIn[2 * y + 1] = grid[2 * (y * width + kx) + 1]!;
    }
    colFft.transform(colOut, colIn);
    const fx = (kx <= width / 2 ? kx : kx - width) / width;
    for (let ky = 0; ky < height; ky++) {
      const fy = (ky <= height / 2 ? ky : ky - height) / height;
      const p = colOut[2 * ky]! ** 2 + colOut[2 * ky + 1]! ** 2;
      total += p;
      dx2 += (2 * Math.PI * fx) ** 2 * p;
      dy2 += (2 * Math.PI * fy) ** 2 * p;
    }
  }
  const n = width * height;
  // Parseval: mean of f^2 = total / n^2; scale the derivative sums the same way.
  return { variance: total / (n * n), dx2: dx2 / (n * n), dy2: dy2 / (n * n) };
}

export interface HexRandomField extends RandomField {
  /** Always 'hex': site (x, y) of `data` sits at (x + (y & 1) / 2, y sqrt(3)/2) lattice constants. */
  grid: "hex";
}

/**
 * A seeded periodic Gaussian random field sampled at the sites of a hexagonal lattice in offset
 * rows (odd rows shifted right by half a site, row spacing sqrt(3)/2; lengths in lattice
 * constants). The torus is `width` lattice constants by `height` sqrt(3)/2; the field is the real
 * part of a trigonometric polynomial synthesized on the 2 width x height rectangular grid of
 * spacing 1/2 x sqrt(3)/2 that holds every site exactly (even rows at even columns, odd rows at
 * odd ones), with the power a function of the physical wave number only (isotropic). Periods and
 * smoothing lengths are in lattice constants. Sizes: powers of two, height even.
 * `lambda2x` / `lambda2y` are the mean square derivatives per lattice constant of the
 * unit-variance field (exact, spectral); variance and mean are those of the continuous field
 * (0 and 1), not of the sampled sites.
 */
export function hexGaussianRandomField(options: RandomFieldOptions): HexRandomField {
  const width = checkSize("width", options.width);
  const height = checkSize("height", options.height);
  if (!isPowerOfTwo(width) || !isPowerOfTwo(height)) {
    throw new Error(`hexagonal random field: expected power-of-two sizes, got ${width} x ${height}`);
  }
  const row = Math.sqrt(3) / 2;
  const spectrum = options.spectrum ?? "ring";
  const period = checkPositive("period", options.period ?? 24);
  const bandwidth = checkPositive("bandwidth", options.bandwidth ?? 0.15);
  const smoothing = checkPositive("smoothing", options.smoothing ?? 4);
  const alignment = options.alignment ?? 0;
  const dir = ((options.direction ?? 0) * Math.PI) / 180;
  const normal = normalSource((options.seed ?? 1) * 2654435761 + 977);
  const q0 = 1 / period, dq = bandwidth / period;
  const gw = 2 * width, gh = height;
  const grid = new Float64Array(2 * gw * gh);
  for (let ky = 0; ky < gh; ky++) {
    const fy = (ky <= gh / 2 ? ky : ky - gh) / (gh * row); // cycles per lattice constant
    for (let kx = 0; kx < gw; kx++) {
      const fx = (kx <= gw / 2 ? kx : kx - gw) / (gw * 0.5);
      const q = Math.hypot(fx, fy);
      let power = 0;
      if (q > 0) {
        power = spectrum === "ring"
          ? Math.exp(-((q - q0) ** 2) / (2 * dq * dq))
          : Math.exp(-((2 * Math.PI * q) ** 2) * smoothing * smoothing);
        if (alignment > 0) power *= Math.exp(alignment * (Math.cos(2 * (Math.atan2(fy, fx) - dir)) - 1));
      }
      const amp = Math.sqrt(power);
      const j = 2 * (ky * gw + kx);
      grid[j] = amp * normal();
      grid[j + 1] = amp * normal();
    }
  }
  inverseFft2(grid, gw, gh);
  // Mean and variance over the full rectangular grid are those of the continuous field (it
  // samples the trigonometric polynomial completely); normalize by them, then pick the sites.
  const gn = gw * gh;
  const real = new Float64Array(gn);
  let mean = 0;
  for (let i = 0; i < gn; i++) { real[i] = grid[2 * i]!; mean += real[i]!; }
  mean /= gn;
  let variance = 0;
  for (let i = 0; i < gn; i++) variance += (real[i]! - mean) ** 2;
  variance /= gn;
  const scale = variance > 0 ? 1 / Math.sqrt(variance) : 0;
  for (let i = 0; i < gn; i++) real[i] = (real[i]! - mean) * scale;
  const { dx2, dy2 } = derivativeVariances(real, gw, gh);
  const data = new Float32Array(width * height);
  for (let y = 0; y < height; y++) for (let x = 0; x < width; x++) data[y * width + x] = real[y * gw + 2 * x + (y & 1)]!;
  // Per grid step -> per lattice constant: x steps are 1/2, y steps sqrt(3)/2.
  return { width, height, data, lambda2x: dx2 * 4, lambda2y: dy2 / (row * row), grid: "hex" };
}

/** In-place inverse 2-D FFT of interleaved complex samples (width x height, row-major): rows, then columns (fft.js). */
function inverseFft2(grid: Float64Array, width: number, height: number): void {
  const rowFft = new FFT(width), colFft = new FFT(height);
  const rowIn = rowFft.createComplexArray() as number[], rowOut = rowFft.createComplexArray() as number[];
  for (let y = 0; y < height; y++) {
    const o = 2 * y * width;
    for (let i = 0; i < 2 * width; i++) rowIn[i] = grid[o + i]!;
    rowFft.inverseTransform(rowOut, rowIn);
    for (let i = 0; i < 2 * width; i++) grid[o + i] = rowOut[i]!;
  }
  const colIn = colFft.createComplexArray() as number[], colOut = colFft.createComplexArray() as number[];
  for (let x = 0; x < width; x++) {
    for (let y = 0; y < height; y++) {
      colIn[2 * y] = grid[2 * (y * width + x)]!;
      colIn[2 * y + 1] = grid[2 * (y * width + x) + 1]!;
    }
    colFft.inverseTransform(colOut, colIn);
    for (let y = 0; y < height; y++) {
      grid[2 * (y * width + x)] = colOut[2 * y]!;
      grid[2 * (y * width + x) + 1] = colOut[2 * y + 1]!;
    }
  }
}
