import { describe, it, expect } from "vitest";
import { analyzeFrame, gaussianRandomField, hexGaussianRandomField, resampleHexToSquare, HEX_SQUARE_SPACING } from "../../src/index";

const R = Math.sqrt(3) / 2;
const PERIODIC = { threshold: 0, boundary: "periodic" as const, skeleton: "off" as const };

function hexField(w: number, h: number, f: (X: number, Y: number) => number) {
  const data = new Float32Array(w * h);
  for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) data[y * w + x] = f(x + (y & 1) / 2, y * R);
  return { width: w, height: h, data };
}

/** +1 within `radius` of a site of the triangular lattice of spacing a (rows along x), else -1. */
function bubbleLattice(a: number, radius: number) {
  return (X: number, Y: number) => {
    let best = Infinity;
    const j0 = Math.round(Y / (a * R));
    for (let j = j0 - 1; j <= j0 + 1; j++) {
      const off = (((j % 2) + 2) % 2) * a / 2, i0 = Math.round((X - off) / a);
      for (let i = i0 - 1; i <= i0 + 1; i++) best = Math.min(best, Math.hypot(X - (i * a + off), Y - j * a * R));
    }
    return best < radius ? 1 : -1;
  };
}

describe("the spectrum of a hexagonal frame", () => {
  it("resamples onto a square grid of one sample per site area that tiles the torus exactly", () => {
    const r = resampleHexToSquare(new Float32Array(128 * 128), 128, 128, true, true);
    expect(r.frame.width).toBe(Math.round(128 / HEX_SQUARE_SPACING));
    expect(r.frame.height).toBe(Math.round((128 * R) / HEX_SQUARE_SPACING));
    expect(r.dx * r.frame.width).toBeCloseTo(128, 9);
    expect(r.dy * r.frame.height).toBeCloseTo(128 * R, 9);
    expect(Math.abs(r.dx * r.dy / (HEX_SQUARE_SPACING ** 2) - 1)).toBeLessThan(0.01);
    // Linear interpolation reproduces a linear ramp along x exactly between the sites.
    const ramp = hexField(16, 8, (X) => X);
    const s = resampleHexToSquare(ramp.data, 16, 8, false, false);
    for (let j = 0; j < s.frame.height; j++) for (let i = 1; i < s.frame.width - 1; i++) {
      expect(s.frame.data[j * s.frame.width + i]).toBeCloseTo(i * s.dx, 5);
    }
  });

  it("a frame too small for a ring says so, naming the square resampling and the hexagonal frame", () => {
    const r = analyzeFrame(hexField(8, 8, (X) => Math.cos(X)), { ...PERIODIC, grid: "hex" });
    expect(r.spectrum!.period).toBeUndefined();
    expect(r.spectrum!.reason).toMatch(/too small for a ring: 9 x 7.*square resampling of the 8 x 8 hexagonal frame/);
  });

  it("gives a stripe period in lattice constants times pixelSize, with nematic order 1", () => {
    // Stripes of period 16 along x on a 128-site torus: 8 periods exactly (CHECKS.md: stripes
    // give nematic order 1).
    const r = analyzeFrame(hexField(128, 128, (X) => Math.cos((2 * Math.PI * X) / 16)), { ...PERIODIC, grid: "hex", pixelSize: 0.25, unit: "um" });
    expect(Math.abs(r.spectrum!.period! / (16 * 0.25) - 1)).toBeLessThan(0.01);
    expect(r.spectrum!.order2).toBeGreaterThan(0.99);
    expect(r.notes?.some((n) => /linear interpolation/.test(n))).toBe(true);
  });

  it("gives the period of stripes along y (across the offset rows) within 3.5%", () => {
    // 8 periods over the torus height 128 sqrt(3)/2. The resampled grid has 119 rows, so the
    // ring falls between radial bins; a square frame of that shape shows the same offset
    // (measured: 14.22 for 13.875 on 128 x 111 px), it is not the lattice's.
    const P = (128 * R) / 8;
    const r = analyzeFrame(hexField(128, 128, (_X, Y) => Math.cos((2 * Math.PI * Y) / P)), { ...PERIODIC, grid: "hex" });
    expect(Math.abs(r.spectrum!.period! / P - 1)).toBeLessThan(0.035);
    expect(r.spectrum!.order2).toBeGreaterThan(0.99);
  });

  it("a hexagonal bubble lattice of spacing a gives six-fold order near 1 and its first ring at q = 2 / (sqrt 3 a)", () => {
    // CHECKS.md: first ring at q = 2 / (sqrt(3) a) cycles per length, six-fold order near 1.
    const a = 8;
    const r = analyzeFrame(hexField(128, 128, bubbleLattice(a, 2.5)), { ...PERIODIC, grid: "hex" });
    expect(r.spectrum!.order6).toBeGreaterThan(0.9);
    expect(Math.abs(r.spectrum!.period! / ((Math.sqrt(3) * a) / 2) - 1)).toBeLessThan(0.03);
    // The same spacing from the domains: 16 x 16 bubbles on the torus (with skeleton off here).
    expect(r.up.domains).toBe(256);
  });

  it("mazes of one period agree between the hexagonal and the square lattice (period within 3%, correlation length within 15%)", () => {
    let hp = 0, sp = 0, hc = 0, sc = 0;
    const N = 8;
    for (let seed = 1; seed <= N; seed++) {
      const h = analyzeFrame(hexGaussianRandomField({ width: 256, height: 256, period: 16, seed }), { ...PERIODIC, grid: "hex" }).spectrum!;
      const s = analyzeFrame(gaussianRandomField({ width: 256, height: 256, period: 16, seed }), PERIODIC).spectrum!;
      hp += h.period!; sp += s.period!; hc += h.corrLength!; sc += s.corrLength!;
    }
    expect(Math.abs(hp / sp - 1)).toBeLessThan(0.03);
    expect(Math.abs(hc / sc - 1)).toBeLessThan(0.15);
    expect(Math.abs(hp / N / 16 - 1)).toBeLessThan(0.05);
  });
});
