import { describe, expect, it } from "vitest";
import { forcFromSweep } from "../../src/sweep/forc";
import { hysteronEnsemble, hysteronSweep } from "../../src/sweep/synthetic";
import { columnOnReversalGrid, matchMajorLoop } from "../../src/sweep/topology-map";

describe("columnOnReversalGrid", () => {
  const model = hysteronEnsemble();
  const sweep = hysteronSweep(model, { fieldStep: 0.04 });
  const forc = forcFromSweep(sweep.field, sweep.magnetization, { smoothingFactor: 2 });
  // A stand-in for a per-frame topology column: domain-wall-like 1 - m^2 per frame.
  const column = sweep.magnetization.map((m) => 1 - m * m);

  it("puts a per-frame column on the FORC grid, point for point with the resampled M", () => {
    const g = columnOnReversalGrid(sweep.field, column, forc);
    expect(g.reversalFields).toEqual(forc.reversalFields);
    expect(g.fields).toEqual(forc.fields);
    g.values.forEach((v, k) => {
      const m = forc.magnetization[k];
      expect(v === null).toBe(m === null);
      // The sweep samples every grid point, so no interpolation is involved.
      if (v !== null) expect(v).toBeCloseTo(1 - (m as number) ** 2, 12);
    });
  });

  it("rejects a sweep whose reversal fields are not those of the grid", () => {
    const half = sweep.field.length >> 1;
    expect(() => columnOnReversalGrid(sweep.field.slice(0, half), column.slice(0, half), forc)).toThrow(
      /expected the grid's 36 reversal fields, got \d+ curves/,
    );
  });
});

describe("matchMajorLoop", () => {
  // An ascending major branch with a bubble count per frame (hand data).
  const branch = { field: [-2, -1, 0, 1, 2], magnetization: [-1, -0.8, -0.2, 0.6, 1], column: [0, 12, 30, 8, 0] };

  it("reads the column at equal field and at equal magnetization", () => {
    const r = matchMajorLoop({ field: 0.5, magnetization: -0.2 }, branch);
    expect(r.equalField.value).toEqual({ field: 0.5, magnetization: 0.2, value: 19 });
    expect(r.equalMagnetization.value).toEqual({ field: 0, magnetization: -0.2, value: 30, crossings: 1 });
  });

  it("interpolates the field where the branch crosses the point's magnetization", () => {
    const r = matchMajorLoop({ field: -1.5, magnetization: 0.2 }, branch);
    expect(r.equalMagnetization.value!.field).toBeCloseTo(0.5, 12);
    expect(r.equalMagnetization.value!.value).toBeCloseTo(19, 12);
  });

  it("reads the nearest frame instead when asked, for counts", () => {
    const r = matchMajorLoop({ field: 0.6, magnetization: 0.2 }, branch, { sampling: "nearest" });
    expect(r.equalField.value!.value).toBe(8);
    expect(r.equalMagnetization.value!.value).toBe(30);
  });

  it("works on a branch given in descending sweep order", () => {
    const desc = { field: [...branch.field].reverse(), magnetization: [...branch.magnetization].reverse(), column: [...branch.column].reverse() };
    const r = matchMajorLoop({ field: 0.5, magnetization: 0.2 }, desc);
    expect(r.equalField.value!.value).toBeCloseTo(19, 12);
    expect(r.equalMagnetization.value!.field).toBeCloseTo(0.5, 12);
  });

  it("says why when the field is off the branch or the magnetization is never reached", () => {
    const r = matchMajorLoop({ field: 3, magnetization: 1.5 }, branch);
    expect(r.equalField.reason).toBe("field 3 is outside the branch (field -2 to 2)");
    expect(r.equalMagnetization.reason).toBe("the branch never reaches m = 1.5");
  });

  it("rejects a malformed branch", () => {
    expect(() => matchMajorLoop({ field: 0, magnetization: 0 }, { ...branch, column: [1] })).toThrow(/equal length, got 5 and 1/);
    expect(() => matchMajorLoop({ field: 0, magnetization: 0 }, { field: [0, 0], magnetization: [0, 0], column: [0, 0] })).toThrow(
      /strictly monotonic/,
    );
  });
});
