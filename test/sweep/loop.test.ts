import { describe, expect, it } from "vitest";
import { loopMetrics } from "../../src/sweep/loop";
import { tanhLoop } from "../../src/sweep/synthetic";

/** Every number anywhere in a result, to show none is NaN. */
function numbersIn(x: unknown): number[] {
  if (typeof x === "number") return [x];
  if (Array.isArray(x)) return x.flatMap(numbersIn);
  if (x !== null && typeof x === "object") return Object.values(x).flatMap(numbersIn);
  return [];
}

describe("loopMetrics on a tanh loop", () => {
  const ms = 1.5;
  const hc = 1.013; // between two samples, so the crossing is interpolated
  const w = 0.4;
  // Field range +-6 = 12.5 w beyond Hc: the tails of tanh change the area by < 1e-8 relative.
  const loop = tanhLoop({ saturation: ms, coerciveField: hc, width: w, fieldMax: 6, fieldStep: 0.02 });
  const r = loopMetrics(loop.field, loop.magnetization);

  it("finds the coercive fields +-Hc", () => {
    // CHECKS.md "Loops and FORC": coercive fields +-Hc. Tolerance 1e-4: linear interpolation
    // across the inflection point of tanh, step 0.02 = w / 20.
    expect(r.ascending.coerciveField.value).toBeCloseTo(hc, 4);
    expect(r.descending.coerciveField.value).toBeCloseTo(-hc, 4);
    expect(r.coerciveField.value).toBeCloseTo(hc, 4);
    expect(r.loopShift.value).toBeCloseTo(0, 6);
    expect(r.ascending.zeroCrossings).toBe(1);
  });

  it("finds the remanence Ms tanh(Hc/w) on both branches", () => {
    // CHECKS.md "Loops and FORC": remanence Ms tanh(Hc/w). H = 0 is a sample, so up to rounding.
    const expected = ms * Math.tanh(hc / w);
    expect(r.descending.remanence.value).toBeCloseTo(expected, 9);
    expect(r.ascending.remanence.value).toBeCloseTo(-expected, 9);
    expect(r.remanence.value).toBeCloseTo(expected, 9);
    expect(r.squareness.value).toBeCloseTo(Math.tanh(hc / w), 6);
  });

  it("finds the loop area 4 Ms Hc", () => {
    // CHECKS.md "Loops and FORC": loop area 4 Ms Hc for a field range wide against w.
    // Tolerance 1e-6 relative: the tails beyond +-6 change the exact integral by < 1e-8, and the
    // interpolation and trapezoid errors of the two mirror-image branches cancel.
    expect(Math.abs((r.loopArea.value as number) / (4 * ms * hc) - 1)).toBeLessThan(1e-6);
  });

  it("estimates Ms as the largest |m| or as the plateau mean", () => {
    expect(r.saturation).toMatchObject({ method: "max-abs" });
    expect(r.saturation.value).toBeCloseTo(ms, 6);
    const p = loopMetrics(loop.field, loop.magnetization, { saturationEstimate: "plateau" });
    expect(p.saturation.method).toBe("plateau");
    expect(p.saturation.value).toBeCloseTo(ms, 6);
  });

  it("places nucleation and saturation fields where |m| leaves and reaches (1 - eps) Ms", () => {
    // tanh((H + Hc)/w) = 1 - eps at H = w atanh(1 - eps) - Hc (model inversion, eps = 0.02).
    const ms0 = r.saturation.value as number;
    const x = w * Math.atanh((1 - 0.02) * (ms0 / ms));
    expect(r.descending.nucleationField.value).toBeCloseTo(x - hc, 2);
    expect(r.descending.saturationField.value).toBeCloseTo(-x - hc, 2);
    expect(r.ascending.nucleationField.value).toBeCloseTo(-x + hc, 2);
    expect(r.ascending.saturationField.value).toBeCloseTo(x + hc, 2);
  });

  it("gives a switching-field distribution peaked at +-Hc with the peak height Ms/w", () => {
    // d/dH Ms tanh((H - Hc)/w) = (Ms/w) sech^2, peak Ms/w at H = Hc (calculus).
    const sfd = r.switchingFieldDistribution.value!;
    const peakAt = (ys: number[]) => sfd.field[ys.indexOf(Math.max(...ys))];
    expect(peakAt(sfd.ascending)).toBeCloseTo(hc, 1);
    expect(peakAt(sfd.descending)).toBeCloseTo(-hc, 1);
    expect(Math.max(...sfd.ascending)).toBeCloseTo(ms / w, 1);
  });

  it("carries the options it used", () => {
    expect(r.options).toMatchObject({ saturationMargin: 0.02, gridPoints: 401, duplicateFields: "average" });
  });

  it("measures the loop shift of a shifted tanh loop", () => {
    const shifted = tanhLoop({ coerciveField: 0.8, width: 0.3, shift: -0.35, fieldMax: 5, fieldStep: 0.01 });
    const s = loopMetrics(shifted.field, shifted.magnetization);
    expect(s.loopShift.value).toBeCloseTo(-0.35, 4);
    expect(s.coerciveField.value).toBeCloseTo(0.8, 4);
    expect(s.ascending.coerciveField.value).toBeCloseTo(0.45, 4);
    expect(s.descending.coerciveField.value).toBeCloseTo(-1.15, 4);
  });

  it("gives the same metrics when the turning field is recorded on several frames", () => {
    const repeated = tanhLoop({ saturation: ms, coerciveField: hc, width: w, fieldMax: 6, fieldStep: 0.02, turningRepeats: 4 });
    const s = loopMetrics(repeated.field, repeated.magnetization);
    expect(s.branches.total).toBe(2);
    expect(s.coerciveField.value).toBeCloseTo(r.coerciveField.value as number, 12);
    expect(s.loopArea.value).toBeCloseTo(r.loopArea.value as number, 12);
  });
});

describe("loopMetrics on bad input", () => {
  it("throws when field and m differ in length", () => {
    expect(() => loopMetrics([0, 1, 2], [0, 1])).toThrow(/equal length, got 3 and 2/);
  });

  it("reports a loop with one branch only instead of guessing", () => {
    const r = loopMetrics([2, 1, 0, -1, -2], [1, 0.5, 0, -0.5, -1]);
    expect(r.descending.coerciveField.value).toBeCloseTo(0, 12);
    expect(r.ascending.coerciveField).toEqual({ value: undefined, reason: "the sweep has no ascending branch" });
    expect(r.coerciveField.reason).toBe("the sweep has no ascending branch");
    expect(r.loopArea.reason).toBe("the sweep has no ascending branch");
    expect(numbersIn(r).some(Number.isNaN)).toBe(false);
  });

  it("says so when a branch never crosses m = 0", () => {
    const r = loopMetrics([1, 0, -1, 0, 1], [1, 0.5, -1, -0.6, -0.2]);
    expect(r.ascending.coerciveField.value).toBeUndefined();
    expect(r.ascending.coerciveField.reason).toMatch(/^the ascending branch never crosses m = 0/);
    expect(r.loopShift.value).toBeUndefined();
  });

  it("names the frame where m is NaN and computes nothing from that branch", () => {
    const r = loopMetrics([1, 0, -1, 0, 1], [1, 0, -1, Number.NaN, 1]);
    expect(r.ascending.coerciveField.reason).toMatch(/m is not finite .* first at frame 3/);
    expect(r.squareness.value).toBeUndefined();
    expect(r.descending.coerciveField.value).toBeCloseTo(0, 12);
    expect(numbersIn(r).some(Number.isNaN)).toBe(false);
  });

  it("reports duplicated fields within a branch when asked to reject them, and averages them by default", () => {
    const field = [1, 0, 0, -1, 0, 1];
    const m = [1, 0.2, -0.2, -1, -0.2, 1];
    const rejected = loopMetrics(field, m, { duplicateFields: "reject" });
    expect(rejected.descending.remanence.reason).toMatch(/2 frames at the same field 0/);
    const averaged = loopMetrics(field, m);
    expect(averaged.descending.remanence.value).toBeCloseTo(0, 12);
  });

  it("reports a field that steps back within a branch (inside the split tolerance)", () => {
    const r = loopMetrics([1, 0.5, 0.52, 0, -1, 0, 1], [1, 0.5, 0.5, 0, -1, 0, 1], { fieldTolerance: 0.05 });
    expect(r.descending.coerciveField.reason).toMatch(/not monotonic .* 0.52 at frame 2 after 0.5/);
  });

  it("says when a branch does not start saturated or never reaches saturation", () => {
    const r = loopMetrics([1, 0, -1, 0, 1], [0.5, 0, -1, 0, 0.5]);
    expect(r.descending.nucleationField.reason).toMatch(/does not start saturated/);
    expect(r.ascending.saturationField.reason).toMatch(/never reaches m = 0.98/);
    expect(r.ascending.nucleationField.value).toBeCloseTo(-1 + 0.02, 12);
  });

  it("says when a branch does not reach H = 0", () => {
    const r = loopMetrics([3, 2, 1, 2, 3], [1, 0, -1, 0, 1]);
    expect(r.descending.remanence.reason).toMatch(/does not reach H = 0 \(field 1 to 3\)/);
  });
});
