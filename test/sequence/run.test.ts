import { describe, it, expect, beforeAll } from "vitest";
import { mkdtempSync, readFileSync, writeFileSync, existsSync, appendFileSync, copyFileSync } from "node:fs";
import { createHash } from "node:crypto";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { runAnalysis, BackgroundHashes } from "../../src/node/run";
import { demoSweep } from "../../src/demo/sweep";
import { encodeNpy } from "../../src/io/npy";
import { fieldsFromList } from "../../src/io/fields";

let dir = "";
let stack = "";
const FRAMES = 12;

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "domtopo-run-"));
  const sweep = demoSweep({ size: 64, frames: FRAMES, seed: 11 });
  stack = join(dir, "sweep.npy");
  writeFileSync(stack, encodeNpy(Array.from({ length: FRAMES }, (_, k) => sweep.frame(k))));
});

const options = { frame: { threshold: 127.5, minDomainArea: 2 }, domains: true };
const fields = () => fieldsFromList(Array.from({ length: FRAMES }, (_, k) => -30 + 5 * k), { unit: "mT" });
const read = (d: string, f: string) => readFileSync(join(d, f), "utf8");

describe("movie runs", () => {
  it("writes one row per frame with its field, in order, and a run record with input hashes", async () => {
    const out = join(dir, "whole");
    const s = await runAnalysis({ inputs: [stack], out, options, fields: fields(), workers: 1, tracking: {} });
    expect(s.completed).toBe(true);
    expect(s.analyzed).toBe(FRAMES);
    const rows = read(out, "frames.csv").trim().split("\n");
    expect(rows).toHaveLength(FRAMES + 1);
    expect(rows[0]).toMatch(/^frame,source,field_mT,threshold,magnetization/);
    expect(rows[0]).toMatch(/up_nucleated/);
    expect(rows[1]).toMatch(/^0,.*sweep\.npy frame 0,-30,/);
    const ndjson = read(out, "frames.ndjson").trim().split("\n").map((l) => JSON.parse(l));
    expect(ndjson.map((r) => r.frame)).toEqual(Array.from({ length: FRAMES }, (_, k) => k));
    const record = JSON.parse(read(out, "run.json"));
    // The hash comes from a thread of its own; Node's crypto (OpenSSL) on the whole file agrees.
    expect(record.inputs[0].sha256).toBe(createHash("sha256").update(readFileSync(stack)).digest("hex"));
    expect(record.inputs[0].bytes).toBeGreaterThan(64 * 64 * FRAMES);
    expect(record.options.frame.threshold).toBe(127.5);
    expect(record.field.unit).toBe("mT");
    expect(existsSync(join(out, "tracks.csv"))).toBe(true);
    expect(existsSync(join(out, "run.progress.json"))).toBe(false);
  });

  it("hashes the inputs in a thread of its own, to the digests of Node's crypto", () => {
    const other = join(dir, "other.bin");
    writeFileSync(other, Uint8Array.from({ length: 3_000_000 }, (_v, i) => (i * 7919) & 255));
    const h = new BackgroundHashes([stack, other], 3_000_000);
    const want = [stack, other].map((f) => createHash("sha256").update(readFileSync(f)).digest("hex"));
    expect(h.wait()).toEqual(want);
    expect(h.fromThread).toBe(true);
    // A file that cannot be read: hashed again in this thread, which names it.
    expect(() => new BackgroundHashes([join(dir, "missing.npy")], 0).wait()).toThrow(/missing\.npy/);
  });

  it("refuses to resume when an input changed after the interruption (same size, other bytes)", async () => {
    const copy = join(dir, "changed.npy");
    copyFileSync(stack, copy);
    const out = join(dir, "changed");
    const first = await runAnalysis({ inputs: [copy], out, options, workers: 1, stopAfter: 4, checkpointEvery: 2 });
    expect(first.completed).toBe(false);
    const bytes = readFileSync(copy);
    bytes[bytes.length - 1] ^= 0xff;
    writeFileSync(copy, bytes);
    await expect(runAnalysis({ inputs: [copy], out, options, workers: 1, resume: true }))
      .rejects.toThrow(/other inputs, options or version; cannot resume/);
  });

  it("resumes an interrupted run to the same tables as an uninterrupted one", async () => {
    const out = join(dir, "resumed");
    const first = await runAnalysis({ inputs: [stack], out, options, fields: fields(), workers: 1, tracking: {}, stopAfter: 5, checkpointEvery: 2 });
    expect(first.completed).toBe(false);
    expect(existsSync(join(out, "frames.csv"))).toBe(false); // nothing final before the end
    // A row half written after the last checkpoint, as a killed process would leave it.
    appendFileSync(join(out, "frames.csv.partial"), "5,garbage,");
    await expect(runAnalysis({ inputs: [stack], out, options: { ...options, frame: { ...options.frame, threshold: 100 } }, fields: fields(), workers: 1, tracking: {}, resume: true }))
      .rejects.toThrow(/other inputs, options or version; cannot resume/);
    const second = await runAnalysis({ inputs: [stack], out, options, fields: fields(), workers: 1, tracking: {}, resume: true });
    expect(second.completed).toBe(true);
    expect(second.resumedAt).toBe(5);
    const whole = join(dir, "whole");
    for (const f of ["frames.csv", "frames.ndjson", "domains.csv", "tracks.csv"]) {
      expect(read(out, f)).toBe(read(whole, f));
    }
  });

  it("refuses to resume where no run was interrupted", async () => {
    await expect(runAnalysis({ inputs: [stack], out: join(dir, "empty"), options, workers: 1, resume: true }))
      .rejects.toThrow(/no interrupted run to resume/);
  });

  it("rejects a field table whose count does not match the frames", async () => {
    const wrong = fieldsFromList([1, 2, 3], { unit: "mT", source: "a list of 3" });
    await expect(runAnalysis({ inputs: [stack], out: join(dir, "wrong"), options, fields: wrong, workers: 1 }))
      .rejects.toThrow(`expected ${FRAMES} field values for ${FRAMES} frames, got 3 from a list of 3`);
  });
});
