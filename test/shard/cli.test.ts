import { describe, it, expect, beforeAll } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, readdirSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { writeShardMovie } from "./movies";

// The built command (npm test builds first), as a batch script would call it.
const bin = join(__dirname, "..", "..", "bin", "domtopo.js");
const run = (args: string[], env: Record<string, string> = {}) => {
  const clean = Object.fromEntries(Object.entries(process.env).filter(([k]) => !k.startsWith("SLURM_")));
  const r = spawnSync(process.execPath, [bin, ...args], { encoding: "utf8", env: { ...clean, ...env } });
  return { code: r.status, out: r.stdout, err: r.stderr };
};
let dir = "", movie = "";

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "domtopo-shard-cli-"));
  movie = join(dir, "movie.npy");
  writeShardMovie(movie);
});

describe("domtopo analyze --shard and domtopo merge", () => {
  it("writes RUN/shard-K-of-N for --shard K/N and for Slurm array tasks, and merges them to the unsharded tables", () => {
    const args = ["analyze", movie, "--threshold", "0.5", "--sweep=-7.5:7.5:1", "--field-unit", "mT", "--track", "--domains", "--workers", "1", "--quiet"];
    const runDir = join(dir, "run");
    expect(run([...args, "--shard", "0/3", "--out", runDir, "--workers", "2"]).code).toBe(0); // threads in one shard
    const slurm = { SLURM_ARRAY_TASK_COUNT: "3", SLURM_ARRAY_TASK_MIN: "1" };
    expect(run([...args, "--shard", "slurm", "--out", runDir], { ...slurm, SLURM_ARRAY_TASK_ID: "2" }).code).toBe(0);
    expect(run([...args, "--shard", "slurm", "--out", runDir], { ...slurm, SLURM_ARRAY_TASK_ID: "3" }).code).toBe(0);
    expect(readdirSync(runDir).sort()).toEqual(["shard-0-of-3", "shard-1-of-3", "shard-2-of-3"]);
    expect(JSON.parse(readFileSync(join(runDir, "shard-1-of-3", "run.json"), "utf8")).shard).toMatchObject({ index: 1, count: 3, start: 5, end: 10 });
    const m = run(["merge", runDir, "--out", runDir]);
    expect(m.err).toMatch(/Merged 3 shards \(16 frames, \d+ tracks\)/);
    expect(m.code).toBe(0);
    const whole = join(dir, "whole");
    expect(run([...args, "--out", whole]).code).toBe(0);
    for (const f of ["frames.csv", "frames.ndjson", "domains.csv", "tracks.csv"]) {
      expect(readFileSync(join(runDir, f), "utf8")).toBe(readFileSync(join(whole, f), "utf8"));
    }
  });

  it("gives usage errors (exit 2) for bad --shard values and missing Slurm variables", () => {
    const base = ["analyze", movie, "--out", join(dir, "bad"), "--quiet"];
    expect(run([...base, "--shard", "3/3"])).toMatchObject({ code: 2, err: expect.stringMatching(/K must be below N/) });
    expect(run([...base, "--shard", "0/17"])).toMatchObject({ code: 2, err: expect.stringMatching(/17 shards for 16 frames/) });
    expect(run([...base, "--shard", "two"])).toMatchObject({ code: 2, err: expect.stringMatching(/expected K\/N .* or slurm/) });
    expect(run([...base, "--shard", "slurm"])).toMatchObject({ code: 2, err: expect.stringMatching(/SLURM_ARRAY_TASK_ID is not set/) });
    expect(run(["analyze", movie, "--shard", "0/2"])).toMatchObject({ code: 2, err: expect.stringMatching(/--shard needs --out/) });
    expect(run(["merge", join(dir, "run")])).toMatchObject({ code: 2, err: expect.stringMatching(/expected --out DIR/) });
  });

  it("fails (exit 1) naming the missing shard, and writes nothing", () => {
    const r = run(["merge", join(dir, "run", "shard-0-of-3"), join(dir, "run", "shard-2-of-3"), "--out", join(dir, "nothing")]);
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/frames 5 to 9 in no shard \(missing shard 1 of 3\)/);
    expect(() => readdirSync(join(dir, "nothing"))).toThrow();
  });
});
