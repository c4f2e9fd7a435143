import { describe, it, expect, beforeAll } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, writeFileSync, mkdirSync, readdirSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { demoSweep } from "../src/demo/sweep";
import { encodeNpy } from "../src/io/npy";
import { encodePng } from "../src/io/png";
import { buildTiff, sampleBytes } from "./io/tiff-bytes";

// The built command on the three movie formats, as a user would run it (npm test builds first).
const bin = join(__dirname, "..", "bin", "domtopo.js");
const run = (args: string[]) => {
  const r = spawnSync(process.execPath, [bin, ...args], { encoding: "utf8" });
  return { code: r.status, out: r.stdout, err: r.stderr };
};
const FRAMES = 10, SIZE = 64;
let dir = "";

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "domtopo-movies-"));
  const sweep = demoSweep({ size: SIZE, frames: FRAMES, seed: 5 });
  const frames = Array.from({ length: FRAMES }, (_, k) => sweep.frame(k));
  writeFileSync(join(dir, "sweep.npy"), encodeNpy(frames));
  // 16-bit TIFF stack, one page per frame (samples scaled by 257 so 127.5 * 257 splits them alike).
  writeFileSync(join(dir, "sweep.tif"), buildTiff(frames.map((f) => ({
    width: SIZE, height: SIZE, bitsPerSample: 16, photometric: 1,
    strips: [sampleBytes(Array.from(f.data, (v) => v * 257), "u16")],
  }))));
  mkdirSync(join(dir, "pngs"));
  frames.forEach((f, k) => writeFileSync(join(dir, "pngs", `frame${k}_H=${sweep.fields[k]}mT.png`), encodePng(f)));
  writeFileSync(join(dir, "field.csv"), "frame,H (mT)\n" + sweep.fields.map((h, k) => `${k},${h}`).join("\n") + "\n");
});

const table = (d: string) => readFileSync(join(d, "frames.csv"), "utf8").trim().split("\n").map((l) => l.split(","));
const column = (rows: string[][], name: string) => rows.slice(1).map((r) => r[rows[0]!.indexOf(name)]);

describe("domtopo analyze on movies", () => {
  it("gives the same table for an .npy stack, a TIFF stack and a PNG folder, with a field table", () => {
    const outs: string[] = [];
    for (const [input, threshold] of [["sweep.npy", "127.5"], ["sweep.tif", String(127.5 * 257)], ["pngs", "127.5"]] as const) {
      const out = join(dir, `out-${input}`);
      const r = run(["analyze", join(dir, input), "--threshold", threshold, "--field-table", join(dir, "field.csv"),
        "--field-column", "H (mT)", "--out", out, "--domains", "--track", "--workers", "2", "--quiet"]);
      expect(r.err).toBe("");
      expect(r.code).toBe(0);
      outs.push(out);
    }
    const [npy, tif, png] = outs.map(table);
    expect(column(npy!, "field_mT")).toEqual(demoSweep({ size: SIZE, frames: FRAMES, seed: 5 }).fields.map(String));
    for (const name of ["magnetization", "up_domains", "down_euler", "up_bubbles", "down_labyrinths", "up_nucleated", "period_px"]) {
      expect(column(tif!, name)).toEqual(column(npy!, name));
      expect(column(png!, name)).toEqual(column(npy!, name));
    }
  });

  it("gives the same tables with one worker and with two", () => {
    const one = join(dir, "one"), two = join(dir, "two");
    for (const [out, w] of [[one, "1"], [two, "2"]] as const) {
      expect(run(["analyze", join(dir, "pngs"), "--threshold", "127.5", "--field-from-names", "H=(-?[0-9.]+)mT",
        "--field-unit", "mT", "--out", out, "--domains", "--track", "--workers", w, "--quiet"]).code).toBe(0);
    }
    for (const f of ["frames.csv", "frames.ndjson", "domains.csv", "tracks.csv"]) {
      expect(readFileSync(join(two, f), "utf8")).toBe(readFileSync(join(one, f), "utf8"));
    }
    const record = JSON.parse(readFileSync(join(two, "run.json"), "utf8"));
    expect(record.timings.workers).toBe(2);
    expect(record.inputs).toHaveLength(FRAMES);
  });

  it("writes overlays and spectrum images and applies preprocessing recorded in the run record", () => {
    const out = join(dir, "prep");
    const r = run(["analyze", join(dir, "sweep.npy"), "--threshold", "127.5", "--smooth", "1", "--crop", "0,0,48,40",
      "--overlays", "3", "--spectra", "5", "--out", out, "--quiet"]);
    expect(r.err).toBe("");
    expect(readdirSync(join(out, "spectra")).sort()).toEqual(["frame-00000.png", "frame-00005.png"]);
    expect(readdirSync(join(out, "overlays")).sort()).toEqual(["frame-00000.png", "frame-00003.png", "frame-00006.png", "frame-00009.png"]);
    const record = JSON.parse(readFileSync(join(out, "run.json"), "utf8"));
    expect(record.options.preprocess).toEqual({ crop: { x: 0, y: 0, width: 48, height: 40 }, smooth: { sigma: 1 } });
    expect(run(["analyze", join(dir, "sweep.npy"), "--crop", "0,0,99,10", "--quiet"]).err).toMatch(/crop/);
  });

  it("says plainly when the field table does not match the frames", () => {
    writeFileSync(join(dir, "short.csv"), "H (mT)\n1\n2\n");
    const r = run(["analyze", join(dir, "sweep.npy"), "--field-table", join(dir, "short.csv"), "--field-column", "H (mT)", "--out", join(dir, "x")]);
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/expected 10 field values for 10 frames, got 2/);
  });
});
