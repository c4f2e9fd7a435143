// Tapering windows for open frames.

/**
 * Hann window of n samples, w(x) = sin^2(pi (x + 1/2) / n) (Blackman & Tukey 1958, The
 * Measurement of Power Spectra): sampled at pixel centres, so no sample is exactly zero.
 */
export function hannWindow(n: number): Float32Array {
  const w = new Float32Array(n);
  for (let x = 0; x < n; x++) {
    const s = Math.sin((Math.PI * (x + 0.5)) / n);
    w[x] = s * s;
  }
  return w;
}

/** A window of ones (no tapering). */
export function flatWindow(n: number): Float32Array {
  return new Float32Array(n).fill(1);
}

/** Sum of squares of a window. */
export function windowEnergy(w: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < w.length; i++) s += w[i]! * w[i]!;
  return s;
}
