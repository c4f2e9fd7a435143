import { describe, it, expect, beforeAll } from "vitest";
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { runAnalysis, type RunConfig } from "../../src/node/run";
import { mergeShards } from "../../src/node/merge";
import { demoSweep } from "../../src/demo/sweep";
import { encodeNpy } from "../../src/io/npy";
import { fieldsFromList } from "../../src/io/fields";
import { MOVIE_FRAMES, writeShardMovie } from "./movies";

let dir = "";
const read = (d: string, f: string) => readFileSync(join(d, f), "utf8");
const TABLES = ["frames.csv", "frames.ndjson", "domains.csv", "tracks.csv"];

/** run.json without what differs by nature between runs (times) and the merge's own record. */
function record(d: string) {
  const r = JSON.parse(read(d, "run.json"));
  delete r.finished; delete r.timings; delete r.shards;
  return r;
}

// Library runs here use one worker: worker threads load dist/node/worker.js, which the sources
// under test do not have (the CLI tests run the built command with two).
async function whole(config: Omit<RunConfig, "out">, name: string, failures = 0): Promise<string> {
  const out = join(dir, name, "whole");
  const s = await runAnalysis({ ...config, out });
  expect(s.completed).toBe(true);
  expect(s.failed).toHaveLength(failures);
  return out;
}

async function sharded(config: Omit<RunConfig, "out">, name: string, n: number, failures = 0): Promise<string> {
  const folders: string[] = [];
  let failed = 0;
  for (let k = 0; k < n; k++) {
    const out = join(dir, name, `n${n}`, `shard-${k}-of-${n}`);
    const s = await runAnalysis({ ...config, out, shard: { index: k, count: n } });
    expect(s.completed).toBe(true);
    failed += s.failed.length;
    folders.push(out);
  }
  expect(failed).toBe(failures);
  const merged = join(dir, name, `n${n}`, "merged");
  mergeShards({ shards: folders.reverse(), out: merged }); // order given does not matter
  return merged;
}

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "domtopo-shard-"));
  writeShardMovie(join(dir, "movie.npy"));
  const sweep = demoSweep({ size: 64, frames: 21, seed: 7 });
  writeFileSync(join(dir, "sweep.npy"), encodeNpy(Array.from({ length: 21 }, (_, k) => sweep.frame(k))));
});

describe("sharded runs merged", () => {
  it("equal an unsharded run byte for byte for every N, with bubbles crossing, merging, splitting and nucleating at the cuts", async () => {
    const fields = fieldsFromList(Array.from({ length: MOVIE_FRAMES }, (_, k) => 10 - 1.25 * k), { unit: "mT" });
    const config = {
      inputs: [join(dir, "movie.npy")], options: { frame: { threshold: 0.5 }, domains: true }, fields,
      workers: 1, tracking: {},
    };
    const ref = await whole(config, "movie");
    // The movie has what the test claims: merges at 8, splits at 4 and 12, nucleation at 4 and 9.
    const rows = read(ref, "frames.csv").trim().split("\n").map((l) => l.split(","));
    const col = (name: string) => rows.slice(1).map((r) => Number(r[rows[0]!.indexOf(name)]));
    expect(col("up_merged")[8]).toBe(1);
    expect(col("up_split")[4]).toBe(1);
    expect(col("up_split")[12]).toBe(1);
    expect(col("up_nucleated")[4]).toBe(1); // the new disc; the second piece of the bar is a split, not a nucleation
    expect(col("up_nucleated")[9]).toBe(1);
    expect(col("up_annihilated")[8]).toBe(1);
    expect(col("up_annihilated")[12]).toBe(1);
    for (const n of [1, 2, 3, 4, 5, 7, 16]) {
      const merged = await sharded(config, "movie", n);
      for (const f of TABLES) expect(read(merged, f), `${f}, N = ${n}`).toBe(read(ref, f));
      expect(record(merged)).toEqual(record(ref));
    }
  });

  it("equal an unsharded run on a generated field sweep (bubbles, maze, bubbles), with the distance fallback", async () => {
    const fields = fieldsFromList(Array.from({ length: 21 }, (_, k) => -30 + 3 * k), { unit: "mT" });
    const config = {
      inputs: [join(dir, "sweep.npy")], options: { frame: { threshold: 127.5, minDomainArea: 2 }, domains: true },
      fields, workers: 1, tracking: { maxDisplacement: 4 },
    };
    const ref = await whole(config, "sweep");
    for (const n of [3, 4]) {
      const merged = await sharded(config, "sweep", n);
      for (const f of TABLES) expect(read(merged, f), `${f}, N = ${n}`).toBe(read(ref, f));
      expect(record(merged)).toEqual(record(ref));
      expect(JSON.parse(read(merged, "run.json")).shards.map((s: { start: number }) => s.start)).toEqual(
        n === 3 ? [0, 7, 14] : [0, 5, 10, 15]);
    }
  });
});

describe("merge refuses shards that do not fit together", () => {
  const base = () => ({ inputs: [join(dir, "movie.npy")], options: { frame: { threshold: 0.5 } }, workers: 1, tracking: {} });
  const shard = async (name: string, index: number, count: number, change: (c: ReturnType<typeof base>) => void = () => {}) => {
    const c = base();
    change(c);
    const out = join(dir, "refuse", name);
    await runAnalysis({ ...c, out, shard: { index, count } });
    return out;
  };
  let s0 = "", s1 = "", s2 = "", s3 = "";
  beforeAll(async () => {
    [s0, s1, s2, s3] = await Promise.all([0, 1, 2, 3].map((k) => shard(`run/shard-${k}-of-4`, k, 4)));
  });
  const merge = (shards: string[]) => () => mergeShards({ shards, out: join(dir, "refuse", "merged") });

  it("names the entry of the run records that differs", async () => {
    const other = await shard("other-threshold", 1, 4, (c) => { c.options.frame.threshold = 0.25; });
    expect(merge([s0, other, s2, s3])).toThrow(/shards disagree on options\.frame\.threshold: .* has 0\.5, .* has 0\.25/);
    const untracked = await shard("untracked", 2, 4, (c) => { delete (c as { tracking?: object }).tracking; });
    expect(merge([s0, s1, untracked, s3])).toThrow(/shards disagree on .*tracking/);
  });

  it("names a different input hash", async () => {
    const copy = join(dir, "refuse", "movie-b.npy");
    writeFileSync(copy, readFileSync(join(dir, "movie.npy")));
    const moved = await shard("other-input", 3, 4, (c) => { c.inputs = [copy]; });
    expect(merge([s0, s1, s2, moved])).toThrow(/shards disagree on inputs\[0\]\.path/);
  });

  it("names missing, repeated and overlapping frames", async () => {
    expect(merge([s0, s1, s3])).toThrow("shards do not cover the 16 frames exactly once: frames 8 to 11 in no shard (missing shard 2 of 4)");
    expect(merge([s0, s1, s2])).toThrow(/frames 12 to 15 in no shard \(missing shard 3 of 4\)/);
    expect(merge([s0, s1, s1, s2, s3])).toThrow(/frames 4 to 7 given twice: shard 1 of 4 .* and shard 1 of 4/);
    const half = await shard("half/shard-0-of-2", 0, 2);
    expect(merge([s0, half, s2, s3])).toThrow(/shard 0 of 4 .* and shard 0 of 2 .* overlap on frames 0 to 3$/);
    expect(merge([half, s1, s2, s3])).toThrow(/shard 0 of 2 .* and shard 1 of 4 .* overlap on frames 4 to 7$/);
    expect(merge([join(dir, "refuse", "nowhere")])).toThrow(/no such folder/);
  });

  it("names an unfinished shard and writes nothing", async () => {
    const c = base();
    const out = join(dir, "refuse", "unfinished");
    await runAnalysis({ ...c, out, shard: { index: 3, count: 4 }, stopAfter: 1, checkpointEvery: 1 });
    expect(merge([s0, s1, s2, out])).toThrow(/did not finish .* analyze --resume/);
    expect(existsSync(join(dir, "refuse", "merged"))).toBe(false);
    // Continued, it merges to the same tables as the shard that ran through.
    await runAnalysis({ ...c, out, shard: { index: 3, count: 4 }, resume: true });
    mergeShards({ shards: [s0, s1, s2, out], out: join(dir, "refuse", "resumed") });
    mergeShards({ shards: [s0, s1, s2, s3], out: join(dir, "refuse", "straight") });
    for (const f of ["frames.csv", "frames.ndjson", "tracks.csv"]) {
      expect(read(join(dir, "refuse", "resumed"), f)).toBe(read(join(dir, "refuse", "straight"), f));
    }
  });

  it("takes a run folder for its shard-K-of-N folders, and merges into it", () => {
    const run = join(dir, "refuse", "run");
    const s = mergeShards({ shards: [run], out: run });
    expect(s.shards.map((x) => x.start)).toEqual([0, 4, 8, 12]);
    expect(mergeShards({ shards: [run], out: run }).frames).toBe(16); // again, with the merged run.json there
    // The shard's own tables start over at its first frame; the merged ones do not.
    const firstRow = (d: string) => read(d, "frames.csv").split("\n")[1]!;
    expect(firstRow(s2)).toMatch(/,{14}$/);
    const merged = read(run, "frames.csv").split("\n")[9]!;
    expect(merged.startsWith("8,")).toBe(true);
    expect(merged).not.toMatch(/,,$/);
    expect(read(s2, "tracks.csv")).toMatch(/first-frame/);
  });
});

describe("failed frames at a cut", () => {
  it("merge to the tables of an unsharded run that skipped the same frames (first of a shard, last of the one before, a whole shard)", async () => {
    const { encodePng } = await import("../../src/io/png");
    const { shardMovieFrame } = await import("./movies");
    const { mkdirSync } = await import("node:fs");
    for (const bad of [[6], [5, 6], [3], [3, 4, 5]]) { // the last: a shard of failed frames only
      const folder = join(dir, `pngs-${bad.join("-")}`);
      mkdirSync(folder, { recursive: true });
      for (let k = 0; k < 12; k++) {
        const png = encodePng(shardMovieFrame(k));
        // a damaged frame: the header is there, the data are cut off
        writeFileSync(join(folder, `frame${k}.png`), bad.includes(k) ? png.subarray(0, 40) : png);
      }
      const config = { inputs: [folder], options: { frame: { threshold: 0.5 }, domains: true }, workers: 1, tracking: {} };
      const ref = await whole(config, `failed-${bad.join("-")}`, bad.length);
      expect(JSON.parse(read(ref, "run.json")).failures.map((f: { frame: number }) => f.frame)).toEqual(bad);
      const merged = await sharded(config, `failed-${bad.join("-")}`, 4, bad.length); // shards 0-2, 3-5, 6-8, 9-11
      for (const f of TABLES) expect(read(merged, f), `${f}, frames ${bad} failed`).toBe(read(ref, f));
      expect(record(merged)).toEqual(record(ref));
    }
  });
});
