import { describe, expect, it } from "vitest";
import { branchColumn, splitBranches } from "../../src/sweep/branches";

describe("splitBranches", () => {
  it("rejects a column whose length differs from the field's", () => {
    expect(() => splitBranches([0, 1, 2], [0, 1])).toThrow(/equal length, got 3 and 2/);
  });

  it("rejects a non-finite field", () => {
    expect(() => splitBranches([0, Number.NaN, 2])).toThrow(/finite field .* frame 1/);
  });

  it("splits a down-up sweep into a descending and an ascending branch sharing the turning frame", () => {
    const s = splitBranches([2, 1, 0, -1, 0, 1, 2]);
    expect(s.branches.map((b) => [b.direction, b.startFrame, b.endFrame])).toEqual([
      ["descending", 0, 3],
      ["ascending", 3, 6],
    ]);
    expect(s.turningPoints).toEqual([{ kind: "minimum", field: -1, firstFrame: 3, lastFrame: 3 }]);
  });

  it("gives repeated turning fields to neither branch twice: the dwell separates them", () => {
    //           0  1  2  3  4  5  6  7  8  9
    const field = [0, 1, 2, 2, 2, 1, 0, 0, 1, 2];
    const s = splitBranches(field);
    expect(s.branches.map((b) => [b.direction, b.startFrame, b.endFrame])).toEqual([
      ["ascending", 0, 2],
      ["descending", 4, 6],
      ["ascending", 7, 9],
    ]);
    expect(s.turningPoints).toEqual([
      { kind: "maximum", field: 2, firstFrame: 2, lastFrame: 4 },
      { kind: "minimum", field: 0, firstFrame: 6, lastFrame: 7 },
    ]);
    expect(s.branches.every((b) => b.repeatedFields === 0)).toBe(true);
  });

  it("trims repeated fields at the start and end of the sweep", () => {
    const s = splitBranches([3, 3, 2, 1, 1]);
    expect(s.branches).toHaveLength(1);
    expect(s.branches[0]).toMatchObject({ startFrame: 1, endFrame: 3, field: [3, 2, 1] });
  });

  it("keeps a repeat inside a branch and counts it", () => {
    const s = splitBranches([0, 1, 1, 2]);
    expect(s.branches).toHaveLength(1);
    expect(s.branches[0].repeatedFields).toBe(1);
  });

  it("treats field steps within the tolerance as repeats", () => {
    const s = splitBranches([0, 1, 2, 1.99, 2.01, 1, 0], undefined, { tolerance: 0.05 });
    expect(s.branches.map((b) => b.direction)).toEqual(["ascending", "descending"]);
    expect(s.turningPoints[0]).toMatchObject({ kind: "maximum", firstFrame: 2, lastFrame: 4 });
  });

  it("carries any per-frame column along each branch", () => {
    const field = [1, 0, -1, 0, 1];
    const bubbles = [0, 5, 9, 4, 0];
    const s = splitBranches(field, bubbles);
    expect(s.branches.map((b) => b.values)).toEqual([
      [0, 5, 9],
      [9, 4, 0],
    ]);
    expect(branchColumn(s, [10, 11, 12, 13, 14])).toEqual([
      [10, 11, 12],
      [12, 13, 14],
    ]);
    expect(() => branchColumn(s, [1, 2])).toThrow(/5 frames/);
  });

  it("finds no branch in a sweep at constant field", () => {
    const s = splitBranches([1, 1, 1]);
    expect(s.branches).toEqual([]);
    expect(s.turningPoints).toEqual([]);
  });
});
