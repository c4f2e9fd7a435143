// The 2-D real FFT kernel: bad sizes first, tiny hand cases, then every size from 1 to 64 in
// both directions against a direct DFT, power-of-two shapes against fft.js, and Parseval.
import { describe, expect, it } from "vitest";
import FFT from "fft.js";
import { RealFFT2D } from "../../src/wasm/fft";
import { directDft2, seeded } from "./dft";

/** Largest |FFT - reference| over the kept half, relative to sqrt(N) (the rms of |X| for unit noise). */
function maxError(f: RealFFT2D, ref: { re: ArrayLike<number>; im: ArrayLike<number> }): number {
  const re = f.re(), im = f.im();
  let err = 0;
  for (let kx = 0; kx < f.width; kx++) for (let ky = 0; ky < f.halfHeight; ky++) {
    const i = kx * f.stride + ky, j = ky * f.width + kx;
    err = Math.max(err, Math.hypot(re[i]! - ref.re[j]!, im[i]! - ref.im[j]!));
  }
  return err / Math.sqrt(f.width * f.height);
}

function noise(n: number, seed: number): Float32Array {
  const rnd = seeded(seed);
  return Float32Array.from({ length: n }, () => rnd() * 2 - 1);
}

/** Row-column 2-D DFT with fft.js (realTransform on rows, transform on columns). */
function fftJs2(data: Float32Array, w: number, h: number): { re: Float64Array; im: Float64Array } {
  const fr = new FFT(w), fc = new FFT(h);
  const rows = new Float64Array(2 * w * h);
  const out = fr.createComplexArray() as number[];
  for (let y = 0; y < h; y++) {
    fr.realTransform(out, Array.from(data.subarray(y * w, (y + 1) * w)));
    fr.completeSpectrum(out);
    for (let i = 0; i < 2 * w; i++) rows[2 * y * w + i] = out[i]!;
  }
  const re = new Float64Array(w * h), im = new Float64Array(w * h);
  const col = fc.createComplexArray() as number[], colOut = fc.createComplexArray() as number[];
  for (let x = 0; x < w; x++) {
    for (let y = 0; y < h; y++) { col[2 * y] = rows[2 * (y * w + x)]!; col[2 * y + 1] = rows[2 * (y * w + x) + 1]!; }
    fc.transform(colOut, col);
    for (let y = 0; y < h; y++) { re[y * w + x] = colOut[2 * y]!; im[y * w + x] = colOut[2 * y + 1]!; }
  }
  return { re, im };
}

describe("RealFFT2D", () => {
  it("rejects sizes that are not integers from 1 to 2^20 at once", () => {
    for (const [w, h] of [[0, 4], [4, 0], [-1, 4], [1.5, 4], [NaN, 4], [4, 2 ** 21]] as const) {
      expect(() => new RealFFT2D(w, h)).toThrow(/integer from 1/);
    }
  });

  it("rejects input of the wrong length and use after dispose", () => {
    const f = new RealFFT2D(4, 3);
    expect(() => f.setInput(new Float32Array(11))).toThrow(/needs 12 samples, got 11/);
    f.dispose();
    expect(() => f.forward()).toThrow(/disposed/);
  });

  it("transforms a single sample to itself", () => {
    const f = new RealFFT2D(1, 1);
    f.setInput([3]);
    f.forward();
    expect(f.re()[0]).toBe(3);
    expect(f.im()[0]).toBe(0);
    f.dispose();
  });

  it("transforms [1, -1] to [0, 2] and a 2 x 2 checkerboard to 4 at (1, 1)", () => {
    const a = new RealFFT2D(2, 1);
    a.setInput([1, -1]);
    a.forward();
    expect([a.re()[0], a.re()[a.stride]]).toEqual([0, 2]);
    a.dispose();
    const b = new RealFFT2D(2, 2);
    b.setInput([1, -1, -1, 1]);
    b.forward();
    const re = b.re();
    // X(kx, ky) at kx * stride + ky
    expect([re[0], re[1], re[b.stride], re[b.stride + 1]]).toEqual([0, 0, 0, 4]);
    b.dispose();
  });

  it("matches a direct DFT for every width and height from 1 to 64", () => {
    let worst = 0;
    for (let w = 1; w <= 64; w++) for (let h = 1; h <= 64; h++) {
      const d = noise(w * h, w * 131 + h);
      const f = new RealFFT2D(w, h);
      f.setInput(d);
      f.forward();
      worst = Math.max(worst, maxError(f, directDft2(d, w, h)));
      f.dispose();
    }
    expect(worst).toBeLessThan(2e-6);
  });

  it("matches a direct DFT on Bluestein and mixed-radix sizes beyond 64", () => {
    for (const [w, h] of [[1009, 3], [2, 1021], [97, 131], [210, 98], [7, 1344]] as const) {
      const d = noise(w * h, w + 7 * h);
      const f = new RealFFT2D(w, h);
      f.setInput(d);
      f.forward();
      expect(maxError(f, directDft2(d, w, h))).toBeLessThan(2e-6);
      f.dispose();
    }
  });

  it("matches fft.js on power-of-two shapes", () => {
    for (const [w, h] of [[4, 4], [8, 2], [2, 16], [64, 256], [512, 128], [1024, 8]] as const) {
      const d = noise(w * h, w * h + 1);
      const f = new RealFFT2D(w, h);
      f.setInput(d);
      f.forward();
      expect(maxError(f, fftJs2(d, w, h))).toBeLessThan(2e-6);
      f.dispose();
    }
  });

  it("keeps Parseval's identity sum |X|^2 = N sum |x|^2 on camera-sized frames", () => {
    // Parseval's theorem for the unnormalized DFT (CHECKS.md "Spectrum")
    for (const [w, h] of [[1000, 1000], [1344, 1024], [97, 131]] as const) {
      const d = noise(w * h, 5);
      const f = new RealFFT2D(w, h);
      f.setInput(d);
      f.forward();
      const re = f.re(), im = f.im();
      let spec = 0;
      for (let kx = 0; kx < w; kx++) for (let ky = 0; ky < f.halfHeight; ky++) {
        const p = re[kx * f.stride + ky]! ** 2 + im[kx * f.stride + ky]! ** 2;
        spec += ky === 0 || 2 * ky === h ? p : 2 * p;
      }
      let sig = 0;
      for (const v of d) sig += v * v;
      expect(spec / (w * h * sig)).toBeCloseTo(1, 5);
      f.dispose();
    }
  });

  it("reuses one plan for many frames", () => {
    const f = new RealFFT2D(30, 21);
    for (let s = 0; s < 3; s++) {
      const d = noise(30 * 21, 100 + s);
      f.setInput(d);
      f.forward();
      expect(maxError(f, directDft2(d, 30, 21))).toBeLessThan(2e-6);
    }
    f.dispose();
  });
});
