import { describe, it, expect } from "vitest";
import { GaussianPlan, gaussianHalfKernel, extendedBox, BOX_PASSES, BOX_PEAK_ERROR } from "../../src/prep/gaussian";
import { uniformSource } from "../../src/demo/random";

function delta(w: number, h: number, x: number, y: number): Float32Array {
  const d = new Float32Array(w * h);
  d[y * w + x] = 1;
  return d;
}

function sum(a: Float32Array): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i]!;
  return s;
}

function noise(seed: number, n: number): Float32Array {
  const u = uniformSource(seed);
  return new Float32Array(n).map(() => u());
}

/** Cyclic shift by (dx, dy) of a w x h float frame. */
function shift(a: Float32Array, w: number, h: number, dx: number, dy: number): Float32Array {
  const out = new Float32Array(w * h);
  for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) {
    out[((y + dy) % h) * w + ((x + dx) % w)] = a[y * w + x]!;
  }
  return out;
}

describe("Gaussian smoothing", () => {
  it("turns a delta into the sampled Gaussian within the truncation error and keeps its sum", () => {
    const w = 41, h = 37, sigma = 2.5;
    const out = new GaussianPlan(w, h, sigma).apply(new Float32Array(w * h), delta(w, h, 20, 18));
    // exp(-r^2 / 2 sigma^2) / (2 pi sigma^2): the Gaussian's impulse response (common practice);
    // the separable kernel stops at |dx|, |dy| <= ceil(4 sigma) = 10 and is renormalized, which
    // drops a tail of erfc(10 / (sigma sqrt 2)) ~ 6e-5 of the mass per axis.
    let worst = 0;
    for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) {
      const r2 = (x - 20) ** 2 + (y - 18) ** 2;
      const g = Math.exp(-r2 / (2 * sigma * sigma)) / (2 * Math.PI * sigma * sigma);
      if (Math.abs(x - 20) <= 10 && Math.abs(y - 18) <= 10) worst = Math.max(worst, Math.abs(out[y * w + x]! - g));
      else expect(out[y * w + x]).toBe(0);
    }
    expect(worst).toBeLessThan(2e-4 / (2 * Math.PI * sigma * sigma));
    expect(sum(out)).toBeCloseTo(1, 6); // a normalized kernel keeps the sum (common practice)
  });

  it("keeps a constant frame constant, on open and periodic sides, by both methods", () => {
    for (const method of ["direct", "box"] as const) {
      for (const edge of ["reflect", "wrap"] as const) {
        const out = new GaussianPlan(30, 20, 7, { method, edgeX: edge, edgeY: edge })
          .apply(new Float32Array(600), new Float32Array(600).fill(3.25));
        for (const v of out) expect(v).toBeCloseTo(3.25, 5);
      }
    }
  });

  it("commutes with cyclic shifts when the sides are periodic", () => {
    const w = 48, h = 40, a = noise(7, w * h);
    for (const method of ["direct", "box"] as const) {
      const plan = new GaussianPlan(w, h, 3, { method, edgeX: "wrap", edgeY: "wrap" });
      const smoothThenShift = shift(plan.apply(new Float32Array(w * h), a), w, h, 13, 29);
      const shiftThenSmooth = plan.apply(new Float32Array(w * h), shift(a, w, h, 13, 29));
      for (let i = 0; i < w * h; i++) expect(shiftThenSmooth[i]).toBeCloseTo(smoothThenShift[i]!, 5);
    }
  });

  it("does not commute with shifts on open sides (the mirror is not a torus)", () => {
    const w = 32, h = 32, a = noise(8, w * h);
    const plan = new GaussianPlan(w, h, 3);
    const one = shift(plan.apply(new Float32Array(w * h), a), w, h, 5, 0);
    const two = plan.apply(new Float32Array(w * h), shift(a, w, h, 5, 0));
    let diff = 0;
    for (let i = 0; i < w * h; i++) diff = Math.max(diff, Math.abs(one[i]! - two[i]!));
    expect(diff).toBeGreaterThan(1e-3);
  });

  it("keeps the sum of a periodic frame, and works in place", () => {
    const w = 20, h = 24, a = noise(3, w * h), s = sum(a);
    for (const method of ["direct", "box"] as const) {
      const b = a.slice();
      new GaussianPlan(w, h, 30, { method, edgeX: "wrap", edgeY: "wrap" }).apply(b, b); // radius > frame
      expect(sum(b)).toBeCloseTo(s, 2);
    }
  });

  it("mirrors open sides about the outer edge of the end sample", () => {
    // A delta in the corner of a mirrored line sees itself once more: its mirror image at -1.
    const out = new GaussianPlan(9, 1, 1).apply(new Float32Array(9), delta(9, 1, 0, 0));
    const half = gaussianHalfKernel(1);
    expect(out[0]).toBeCloseTo(half[0]! + half[1]!, 6);
    expect(out[1]).toBeCloseTo(half[1]! + half[2]!, 6);
  });

  it("gives each extended box the variance sigma^2 / passes, so the cascade has sigma^2", () => {
    for (const sigma of [0.8, 1.5, 5, 17.3, 50]) {
      const s2 = (sigma * sigma) / BOX_PASSES;
      const { radius: r, alpha, norm } = extendedBox(s2);
      expect(alpha).toBeGreaterThanOrEqual(0);
      expect(alpha).toBeLessThan(1);
      let v = 0;
      for (let k = 1; k <= r; k++) v += 2 * k * k * norm;
      v += 2 * (r + 1) ** 2 * alpha * norm;
      expect(v).toBeCloseTo(s2, 9);
    }
  });

  it("approximates the Gaussian by the box cascade within the stated peak error", () => {
    for (const sigma of [2, 5, 20, 50]) {
      const n = 1024, c = 512;
      const out = new GaussianPlan(n, 1, sigma, { method: "box", edgeX: "wrap" }).apply(new Float32Array(n), delta(n, 1, c, 0));
      const peak = 1 / (Math.sqrt(2 * Math.PI) * sigma);
      let worst = 0, variance = 0;
      for (let x = 0; x < n; x++) {
        worst = Math.max(worst, Math.abs(out[x]! - peak * Math.exp(-((x - c) ** 2) / (2 * sigma * sigma))));
        variance += out[x]! * (x - c) ** 2;
      }
      expect(worst / peak).toBeLessThan(BOX_PEAK_ERROR);
      expect(worst / peak).toBeGreaterThan(0.01); // it is an approximation, and the bound is tight
      expect(variance / (sigma * sigma)).toBeCloseTo(1, 4);
    }
  });

  it("rejects bad sigmas and buffers of the wrong length", () => {
    expect(() => new GaussianPlan(8, 8, 0)).toThrow("sigma: expected a finite number > 0, got 0");
    expect(() => new GaussianPlan(8, 8, NaN)).toThrow("got NaN");
    expect(() => new GaussianPlan(8, 8, 1).apply(new Float32Array(64), new Float32Array(63)))
      .toThrow("gaussian: expected 8 x 8 = 64 samples, got 63 in, 64 out");
  });
});
