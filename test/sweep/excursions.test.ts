import { describe, expect, it } from "vitest";
import { excursion, excursions } from "../../src/sweep/excursions";
import { hysteronEnsemble } from "../../src/sweep/synthetic";

describe("excursion of a reversal curve from the major loop", () => {
  // Major branch M = H/2, given in descending sweep order. The curve dips below it by a triangle:
  // 0 up to H = -1, down to -0.4 at H = 0, back to 0 at H = 1. With tol = 0.1 it leaves where
  // 0.4 (H + 1) = 0.1, i.e. H = -0.75, rejoins at H = 0.75, deviates by -0.4 at most, and the
  // area between them is the triangle's, 2 * 0.4 / 2 = 0.4, below the branch (hand geometry).
  const majorField = [2, 1.5, 1, 0.5, 0, -0.5, -1, -1.5, -2];
  const major = { field: majorField, values: majorField.map((h) => h / 2) };
  const dip = (h: number) => (h <= -1 || h >= 1 ? 0 : -0.4 * (1 - Math.abs(h)));
  const curveField = [-1.5, -1, -0.5, 0, 0.5, 1, 1.5];
  const curve = { field: curveField, values: curveField.map((h) => h / 2 + dip(h)) };
  const r = excursion(curve, major, { tolerance: 0.1 });

  it("finds where the curve leaves and rejoins the major branch", () => {
    expect(r.leaveField.value).toBeCloseTo(-0.75, 12);
    expect(r.rejoinField.value).toBeCloseTo(0.75, 12);
  });

  it("reports the largest deviation with its sign and field", () => {
    expect(r.maxDeviation.value!.deviation).toBeCloseTo(-0.4, 12);
    expect(r.maxDeviation.value!.field).toBeCloseTo(0, 12);
  });

  it("integrates the area between the curve and the branch over their common field range", () => {
    expect(r.overlap).toEqual([-1.5, 1.5]);
    expect(r.area.value).toBeCloseTo(-0.4, 12);
    expect(r.absoluteArea.value).toBeCloseTo(0.4, 12);
    expect(r.options).toEqual({ tolerance: 0.1 });
  });

  it("splits the absolute area where the deviation changes sign", () => {
    // Deviation +0.2 -> -0.2 linearly over [0, 1]: two triangles of area 0.05 each (hand geometry).
    const s = excursion({ field: [0, 1], values: [0.2, -0.2] }, { field: [0, 1], values: [0, 0] });
    expect(s.area.value).toBeCloseTo(0, 12);
    expect(s.absoluteArea.value).toBeCloseTo(0.1, 12);
  });

  it("says why when the curve never leaves, never rejoins, or shares no field with the branch", () => {
    const close = excursion({ field: [0, 1], values: [0.005, 0] }, { field: [0, 1], values: [0, 0] });
    expect(close.leaveField.reason).toMatch(/stays within tol = 0.01/);
    expect(close.maxDeviation.value!.deviation).toBeCloseTo(0.005, 12);
    const away = excursion({ field: [0, 1, 2], values: [0, 0.5, 0.5] }, { field: [0, 2], values: [0, 0] });
    expect(away.leaveField.value).toBeCloseTo(0.02, 12);
    expect(away.rejoinField.reason).toMatch(/has not rejoined the major branch by field 2/);
    const apart = excursion({ field: [0, 1], values: [0, 0] }, { field: [2, 3], values: [0, 0] });
    expect(apart.overlap).toBeNull();
    expect(apart.area.reason).toMatch(/share no field range/);
  });

  it("rejects malformed curves", () => {
    expect(() => excursion({ field: [0, 1], values: [0] }, major)).toThrow(/equal length, got 2 and 1/);
    expect(() => excursion({ field: [0, 1, 0.5], values: [0, 0, 0] }, major)).toThrow(/strictly monotonic/);
  });

  it("sees a FORC of a hysteron ensemble start off the ascending branch and rejoin it near saturation", () => {
    const model = hysteronEnsemble();
    const ha = -0.5;
    const field = Array.from({ length: 86 }, (_, j) => ha + j * 0.02);
    const forc = { field, values: field.map((hb) => model.magnetization(ha, hb)) };
    const ascending = { field, values: field.map(model.ascending) };
    const [e] = excursions([forc], ascending, { tolerance: 0.01 });
    expect(e.leaveField.value).toBeCloseTo(ha, 12);
    expect(e.maxDeviation.value!.deviation).toBeGreaterThan(0); // inside the loop: above the ascending branch
    expect(e.rejoinField.value).toBeGreaterThan(0.5);
    expect(e.area.value).toBeGreaterThan(0);
  });
});
