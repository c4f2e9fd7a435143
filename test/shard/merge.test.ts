import { describe, it, expect, beforeAll } from "vitest";
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
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

async function whole(config: Omit<RunConfig, "out">, name: string): Promise<string> {
  const out = join(dir, name, "whole");
  const s = await runAnalysis({ ...config, out });
  expect(s.completed).toBe(true);
  return out;
}

async function sharded(config: Omit<RunConfig, "out">, name: string, n: number): Promise<string> {
  const folders: string[] = [];
  for (let k = 0; k < n; k++) {
    const out = join(dir, name, `n${n}`, `shard-${k}-of-${n}`);
    const s = await runAnalysis({ ...config, out, shard: { index: k, count: n } });
    expect(s.completed).toBe(true);
    folders.push(out);
  }
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

  it("equal an unsharded run on a generated field sweep (bubbles, maze, bubbles) with several workers per shard", async () => {
    const fields = fieldsFromList(Array.from({ length: 21 }, (_, k) => -30 + 3 * k), { unit: "mT" });
    const config = {
      inputs: [join(dir, "sweep.npy")], options: { frame: { threshold: 127.5, minDomainArea: 2 }, domains: true },
      fields, workers: 2, tracking: { maxDisplacement: 4 },
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
