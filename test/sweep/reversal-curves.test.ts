import { describe, expect, it } from "vitest";
import { resampleReversalCurves, reversalCurvesFromSweep } from "../../src/sweep/reversal-curves";

describe("reversalCurvesFromSweep", () => {
  it("cuts each ascending branch after a descending one, starting at its turning field", () => {
    //            start up (no reversal yet), down to -1, up to 2, down to 0 (dwell), up to 2
    const field = [0, 1, 2, 1, 0, -1, 0, 1, 2, 1, 0, 0, 1, 2];
    const m = field.map((h, k) => h + k / 100);
    const curves = reversalCurvesFromSweep(field, m);
    expect(curves.map((c) => [c.reversalField, c.frames, c.field])).toEqual([
      [-1, [5, 8], [-1, 0, 1, 2]],
      [0, [11, 13], [0, 1, 2]],
    ]);
    expect(curves[1].values).toEqual([0.11, 1.12, 2.13]);
  });
});

describe("resampleReversalCurves", () => {
  it("interpolates each curve linearly in Hb onto the grid and leaves Hb < Ha empty", () => {
    const g = resampleReversalCurves([
      { reversalField: 1, field: [1, 2], values: [10, 20] },
      { reversalField: 0, field: [0, 0.5, 0.5, 2], values: [0, 4, 6, 20] }, // equal Hb merged: 5
    ]);
    expect(g.reversalFields).toEqual([0, 1]);
    expect(g.curveIndex).toEqual([1, 0]);
    expect(g.fields).toEqual([0, 1, 2]);
    expect(g.values).toEqual([0, 10, 20, null, 10, 20]);
    expect(g.options).toEqual({ fieldStep: 1, fieldRange: [0, 2], region: "measured" });
  });

  it("takes a finer field step and range when given, without extrapolating past a curve's end", () => {
    const g = resampleReversalCurves([{ reversalField: 0, field: [0, 1], values: [0, 1] }], { fieldStep: 0.25, fieldRange: [-0.5, 1.5] });
    expect(g.fields).toEqual([-0.5, -0.25, 0, 0.25, 0.5, 0.75, 1, 1.25, 1.5]);
    expect(g.values).toEqual([null, null, 0, 0.25, 0.5, 0.75, 1, null, null]);
  });

  it("marks points next to a non-finite sample as empty", () => {
    const g = resampleReversalCurves([{ reversalField: 0, field: [0, 1, 2, 3], values: [0, Number.NaN, 2, 3] }], { fieldStep: 0.5 });
    expect(g.values).toEqual([0, null, null, null, 2, 2.5, 3]);
  });

  it("asks for a field step when there is a single curve", () => {
    expect(() => resampleReversalCurves([{ reversalField: 0, field: [0, 1], values: [0, 1] }])).toThrow(/give fieldStep/);
  });
});
