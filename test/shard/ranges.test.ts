import { describe, it, expect } from "vitest";
import { decodeBoundaryFrame, encodeBoundaryFrame, parseShard, shardFromSlurm, shardRange } from "../../src/node/shard";

describe("shard ranges", () => {
  it("rejects shard numbers outside 0..N-1, N below 1 and more shards than frames", () => {
    expect(() => shardRange(4, 4, 10)).toThrow(/shard 4 of 4: expected a shard number from 0 to 3/);
    expect(() => shardRange(-1, 4, 10)).toThrow(/from 0 to 3/);
    expect(() => shardRange(0, 0, 10)).toThrow(/shard count: expected a whole number >= 1, got 0/);
    expect(() => shardRange(0, 11, 10)).toThrow("11 shards for 10 frames: at most one shard per frame");
    expect(() => shardRange(0, 1, 0)).toThrow(/at least one frame/);
  });

  it("splits 10 frames into 4 contiguous ranges of 2, 3, 2, 3 frames", () => {
    expect([0, 1, 2, 3].map((k) => shardRange(k, 4, 10))).toEqual([
      { start: 0, end: 2 }, { start: 2, end: 5 }, { start: 5, end: 7 }, { start: 7, end: 10 },
    ]);
  });

  it("covers every frame exactly once, in order, with sizes differing by at most one, for every N up to the frames", () => {
    for (let frames = 1; frames <= 40; frames++) {
      for (let n = 1; n <= frames; n++) {
        const ranges = Array.from({ length: n }, (_, k) => shardRange(k, n, frames));
        expect(ranges[0]!.start).toBe(0);
        expect(ranges[n - 1]!.end).toBe(frames);
        for (let k = 1; k < n; k++) expect(ranges[k]!.start).toBe(ranges[k - 1]!.end);
        const sizes = ranges.map((r) => r.end - r.start);
        expect(Math.min(...sizes)).toBeGreaterThanOrEqual(1);
        expect(Math.max(...sizes) - Math.min(...sizes)).toBeLessThanOrEqual(1);
      }
    }
  });
});

describe("--shard values", () => {
  it("reads K/N with K from 0 and says what was expected otherwise", () => {
    expect(parseShard("0/4")).toEqual({ index: 0, count: 4 });
    expect(parseShard(" 3 / 4 ")).toEqual({ index: 3, count: 4 });
    expect(() => parseShard("4/4")).toThrow("--shard 4/4: K must be below N (shards are numbered from 0 to 3)");
    expect(() => parseShard("1/0")).toThrow(/N >= 1/);
    for (const bad of ["", "2", "a/b", "1/2/3", "-1/4", "1.5/4"]) expect(() => parseShard(bad)).toThrow(/expected K\/N/);
  });

  it("takes the shard of a Slurm array task from its id, minimum, step and count", () => {
    expect(shardFromSlurm({ SLURM_ARRAY_TASK_ID: "2", SLURM_ARRAY_TASK_COUNT: "4", SLURM_ARRAY_TASK_MIN: "0" })).toEqual({ index: 2, count: 4 });
    expect(shardFromSlurm({ SLURM_ARRAY_TASK_ID: "4", SLURM_ARRAY_TASK_COUNT: "4", SLURM_ARRAY_TASK_MIN: "1" })).toEqual({ index: 3, count: 4 });
    expect(shardFromSlurm({ SLURM_ARRAY_TASK_ID: "6", SLURM_ARRAY_TASK_COUNT: "4", SLURM_ARRAY_TASK_MIN: "0", SLURM_ARRAY_TASK_STEP: "2" })).toEqual({ index: 3, count: 4 });
    expect(shardFromSlurm({ SLURM_ARRAY_TASK_ID: "1", SLURM_ARRAY_TASK_COUNT: "2" })).toEqual({ index: 1, count: 2 });
  });

  it("names the missing or wrong Slurm variable", () => {
    expect(() => shardFromSlurm({})).toThrow("--shard slurm: SLURM_ARRAY_TASK_ID is not set; run inside a Slurm array job");
    expect(() => shardFromSlurm({ SLURM_ARRAY_TASK_ID: "0" })).toThrow("SLURM_ARRAY_TASK_COUNT is not set");
    expect(() => shardFromSlurm({ SLURM_ARRAY_TASK_ID: "x", SLURM_ARRAY_TASK_COUNT: "4" })).toThrow(/SLURM_ARRAY_TASK_ID is "x", expected a whole number/);
    expect(() => shardFromSlurm({ SLURM_ARRAY_TASK_ID: "5", SLURM_ARRAY_TASK_COUNT: "4", SLURM_ARRAY_TASK_MIN: "0" }))
      .toThrow(/task 5 is not shard 0..3 .* --array=0-3/);
    expect(() => shardFromSlurm({ SLURM_ARRAY_TASK_ID: "0", SLURM_ARRAY_TASK_COUNT: "4", SLURM_ARRAY_TASK_MIN: "1" })).toThrow(/not shard/);
  });
});

describe("boundary frames", () => {
  it("keep labels, domain columns, frame and field through bytes", () => {
    const b = {
      frame: 7, field: -2.5, width: 3, height: 2, labels: Int32Array.from([0, 1, 1, 2, 2, 0]), count: 2,
      phase: Uint8Array.from([1, 0]), area: Float64Array.from([2, 2.5]), centroidX: Float64Array.from([1.5, 0.25]), centroidY: Float64Array.from([0, 1]),
    };
    const back = decodeBoundaryFrame(encodeBoundaryFrame(b), "test");
    expect(back).toEqual(b);
    const { field: _f, ...noField } = b;
    expect(decodeBoundaryFrame(encodeBoundaryFrame(noField), "test")).toEqual(noField);
    expect(() => decodeBoundaryFrame(new Uint8Array(16), "x.bin")).toThrow(/x.bin: not a boundary frame/);
  });
});
