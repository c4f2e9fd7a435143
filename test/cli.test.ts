import { describe, it, expect, beforeAll } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, existsSync, writeFileSync, readdirSync, mkdirSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";

// These run the built command (npm test builds first), as a user would.
const bin = join(__dirname, "..", "bin", "domtopo.js");
function run(args: string[]) {
  const r = spawnSync(process.execPath, [bin, ...args], { encoding: "utf8" });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

let dir = "";
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "domtopo-cli-"));
});

function parseCsv(text: string) {
  const [head, ...rows] = text.trim().split("\n");
  const names = head!.split(",");
  return rows.map((r) => Object.fromEntries(r.split(",").map((v, i) => [names[i], v])));
}

describe("domtopo demo", () => {
  it("writes frames, tables and a run record, and prints a summary", () => {
    const out = join(dir, "demo");
    const r = run(["demo", "--out", out, "--frames", "9", "--size", "128"]);
    expect(r.err).toBe("");
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/Synthetic field sweep/);
    expect(r.out).toMatch(/9 frames of 128 x 128 px/);
    const frames = parseCsv(readFileSync(join(out, "frames.csv"), "utf8"));
    expect(frames).toHaveLength(9);
    expect(Number(frames[0]!.field_mT)).toBe(-30);
    expect(Number(frames[8]!.field_mT)).toBe(30);
    // The sweep runs from mostly down to mostly up.
    expect(Number(frames[0]!.magnetization)).toBeLessThan(-0.8);
    expect(Number(frames[8]!.magnetization)).toBeGreaterThan(0.8);
    expect(readdirSync(join(out, "frames"))).toHaveLength(9);
    const run_ = JSON.parse(readFileSync(join(out, "run.json"), "utf8"));
    expect(run_.options.threshold).toBe(127.5);
    expect(run_.scenario).toMatch(/not measurements/);
    const domains = parseCsv(readFileSync(join(out, "domains.csv"), "utf8"));
    const upInFrame0 = domains.filter((d) => d.frame === "0" && d.phase === "up").length;
    expect(upInFrame0).toBe(Number(frames[0]!.up_domains));
  });
});

describe("domtopo analyze", () => {
  it("gives the demo's numbers again when reading back its PNG frames", () => {
    const out = join(dir, "demo");
    const files = readdirSync(join(out, "frames")).sort().map((f) => join(out, "frames", f));
    const r = run(["analyze", ...files, "--threshold", "127.5", "--min-area", "4", "--pixel-size", "10", "--unit", "nm", "--out", join(dir, "again"), "--domains"]);
    expect(r.code).toBe(0);
    const a = parseCsv(readFileSync(join(out, "frames.csv"), "utf8"));
    const b = parseCsv(readFileSync(join(dir, "again", "frames.csv"), "utf8"));
    expect(b.map((x) => x.up_euler)).toEqual(a.map((x) => x.up_euler));
    expect(b.map((x) => x.magnetization)).toEqual(a.map((x) => x.magnetization));
    expect(existsSync(join(dir, "again", "domains.csv"))).toBe(true);
  });

  it("writes the per-frame table to standard output without --out", () => {
    const f = join(dir, "demo", "frames", "frame-0004.png");
    const r = run(["analyze", f, "--quiet"]);
    expect(r.code).toBe(0);
    const rows = parseCsv(r.out);
    expect(rows).toHaveLength(1);
    expect(rows[0]!.source).toMatch(/frame-0004\.png$/);
    expect(rows[0]!.threshold).not.toBe("");
  });

  it("names the file and frame of a corrupt input and leaves earlier tables intact", () => {
    const bad = join(dir, "bad.png");
    writeFileSync(bad, "this is not a png");
    const good = join(dir, "demo", "frames", "frame-0000.png");
    const out = join(dir, "again");
    const before = readFileSync(join(out, "frames.csv"), "utf8");
    const r = run(["analyze", good, bad, "--out", out, "--strict"]);
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/bad\.png: not a PNG, TIFF or \.npy file by its first bytes/);
    expect(readFileSync(join(out, "frames.csv"), "utf8")).toBe(before);
    expect(readdirSync(out).filter((f) => f.includes(".tmp"))).toEqual([]);
  });

  it("reports a frame that fails to decode, goes on, and exits with code 3", () => {
    const good = readFileSync(join(dir, "demo", "frames", "frame-0001.png"));
    const folder = join(dir, "broken");
    mkdirSync(folder, { recursive: true });
    writeFileSync(join(folder, "a0.png"), good);
    writeFileSync(join(folder, "a1.png"), good.subarray(0, Math.floor(good.length / 2))); // truncated data
    writeFileSync(join(folder, "a2.png"), good);
    const out = join(dir, "broken-out");
    const r = run(["analyze", folder, "--out", out, "--workers", "2"]);
    expect(r.code).toBe(3);
    expect(r.err).toMatch(/a1\.png/);
    const rows = parseCsv(readFileSync(join(out, "frames.csv"), "utf8"));
    expect(rows.map((x) => x.frame)).toEqual(["0", "2"]);
    const record = JSON.parse(readFileSync(join(out, "run.json"), "utf8"));
    expect(record.failures).toHaveLength(1);
    expect(record.failures[0].frame).toBe(1);
    expect(record.failures[0].message).toMatch(/a1\.png/);
    expect(run(["analyze", folder, "--out", join(dir, "strict-out"), "--strict"]).code).toBe(1);
  });

  it("answers bad command lines with exit code 2 and a reason", () => {
    expect(run(["analyze"]).code).toBe(2);
    const r = run(["analyze", "x.png", "--connectivity", "6"]);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/--connectivity: expected 8, 4 or saddle, got "6"/);
    expect(run(["frobnicate"]).err).toMatch(/unknown command "frobnicate"/);
    expect(run(["analyze", "--help"]).out).toMatch(/Usage: domtopo analyze/);
    expect(run(["demo", "--help"]).out).toMatch(/Usage: domtopo demo/);
    expect(run(["--help"]).code).toBe(0);
    const missing = run(["analyze", join(dir, "nope.png")]);
    expect(missing.code).toBe(1);
    expect(missing.err).toMatch(/nope\.png: no such file or folder/);
  });
});
