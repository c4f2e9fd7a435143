import { describe, it, expect, beforeAll } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, readdirSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { analyzeFrame, decodePng, demoSweep, encodePng } from "../../src/index";

// The built command (npm test builds first), as a user would run it.
const bin = join(__dirname, "..", "..", "bin", "domtopo.js");
function run(args: string[]) {
  const r = spawnSync(process.execPath, [bin, ...args], { encoding: "utf8" });
  return { code: r.status, out: r.stdout, err: r.stderr };
}
function parseCsv(text: string) {
  const [head, ...rows] = text.trim().split("\n");
  const names = head!.split(",");
  return rows.map((r) => Object.fromEntries(r.split(",").map((v, i) => [names[i], v])));
}

let dir = "";
beforeAll(() => { dir = mkdtempSync(join(tmpdir(), "domtopo-hex-cli-")); });

describe("domtopo on hexagonal frames", () => {
  it("demo --grid hex runs a hexagonal sweep end to end with the same outputs as a square one", () => {
    const hex = join(dir, "hex"), square = join(dir, "square");
    const h = run(["demo", "--grid", "hex", "--out", hex, "--frames", "5", "--size", "64", "--quiet"]);
    expect(h.err).toBe("");
    expect(h.code).toBe(0);
    const s = run(["demo", "--out", square, "--frames", "5", "--size", "64", "--quiet"]);
    expect(s.code).toBe(0);
    for (const name of ["frames.csv", "domains.csv"]) {
      const a = readFileSync(join(hex, name), "utf8").split("\n")[0], b = readFileSync(join(square, name), "utf8").split("\n")[0];
      expect(a).toBe(b); // the same columns
    }
    expect(readdirSync(hex).sort()).toEqual(readdirSync(square).sort());
    expect(readdirSync(join(hex, "overlays")).length).toBe(readdirSync(join(square, "overlays")).length);
    const run_ = JSON.parse(readFileSync(join(hex, "run.json"), "utf8"));
    expect(run_.options.grid).toBe("hex");
    expect(run_.scenario).toMatch(/hexagonal lattice/);
    // The hexagonal frames' numbers are those of analyzeFrame with grid 'hex' on the same samples.
    const frames = parseCsv(readFileSync(join(hex, "frames.csv"), "utf8"));
    const sweep = demoSweep({ grid: "hex", frames: 5, size: 64 });
    const r = analyzeFrame(sweep.frame(2), { grid: "hex", threshold: sweep.threshold, pixelSize: 10, unit: "nm", minDomainArea: 4 });
    expect(Number(frames[2]!.up_euler)).toBe(r.up.euler);
    expect(Number(frames[2]!.up_domains)).toBe(r.up.domains);
    expect(Number(frames[2]!.wall_length_nm)).toBeCloseTo(r.wallLength, 4);
    expect(frames[2]!.period_nm).toBe(r.spectrum!.period === undefined ? "" : String(Number(r.spectrum!.period.toPrecision(10))));
    // A hexagonal overlay: wider than tall by the lattice's aspect (64.5 by 63 sqrt(3)/2 + 2/sqrt(3) at 4 px per site).
    const png = decodePng(readFileSync(join(hex, "overlays", readdirSync(join(hex, "overlays"))[0]!)));
    expect(png.width).toBe(Math.ceil(64.5 * 4));
    expect(png.height).toBe(Math.ceil((63 * Math.sqrt(3) / 2 + 2 / Math.sqrt(3)) * 4));
  });

  it("analyze --grid hex reads the hexagonal demo's PNG frames back to the same numbers", () => {
    const hex = join(dir, "hex");
    const files = readdirSync(join(hex, "frames")).sort().map((f) => join(hex, "frames", f));
    const r = run(["analyze", ...files, "--grid", "hex", "--threshold", "127.5", "--min-area", "4", "--pixel-size", "10", "--unit", "nm", "--out", join(dir, "again")]);
    expect(r.code).toBe(0);
    const a = parseCsv(readFileSync(join(hex, "frames.csv"), "utf8"));
    const b = parseCsv(readFileSync(join(dir, "again", "frames.csv"), "utf8"));
    expect(b.map((x) => x.up_euler)).toEqual(a.map((x) => x.up_euler));
    expect(b.map((x) => x.up_labyrinths)).toEqual(a.map((x) => x.up_labyrinths));
  });

  it("refuses a bad --grid and an odd periodic height with a reason", () => {
    const bad = run(["demo", "--grid", "hexagonal", "--out", join(dir, "bad")]);
    expect(bad.code).toBe(2);
    expect(bad.err).toMatch(/--grid: expected square or hex/);
    const odd = join(dir, "odd.png");
    writeFileSync(odd, encodePng({ width: 8, height: 9, data: new Uint8Array(72).map((_, i) => (i % 3 ? 0 : 255)) }));
    const r = run(["analyze", odd, "--grid", "hex", "--boundary", "periodic", "--out", join(dir, "odd")]);
    expect(r.code).not.toBe(0);
    expect(r.err).toMatch(/odd\.png.*even height.*got 9/);
  });
});
