import { describe, expect, it, beforeAll } from "vitest";
import { existsSync, mkdtempSync, readFileSync, readdirSync, rmSync, mkdirSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { checkWellFormed, run } from "./helpers";

let dir = "";
let demo = "";
let demoRun: ReturnType<typeof run>;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "domtopo-report-"));
  demo = join(dir, "demo");
  demoRun = run(["demo", "--out", demo, "--frames", "9", "--size", "64"]);
});

function parseCsv(text: string) {
  const [head, ...rows] = text.trim().split("\n");
  const names = head!.split(",");
  return rows.map((r) => Object.fromEntries(r.split(",").map((v, i) => [names[i], v])));
}

describe("domtopo demo with the hysteretic sweep", () => {
  it("still writes the field sweep, and says the loop data are synthetic", () => {
    expect(demoRun.err).toBe("");
    expect(demoRun.code).toBe(0);
    expect(readdirSync(join(demo, "frames"))).toHaveLength(9);
    expect(demoRun.out).toMatch(/Synthetic hysteresis of an invented/);
    expect(demoRun.out).toMatch(/Report: .*report\.html \(synthetic data\)/);
  });

  it("writes the per-frame table of the major loop and the reversal curves", () => {
    const rows = parseCsv(readFileSync(join(demo, "loop", "frames.csv"), "utf8"));
    expect(Object.keys(rows[0]!).slice(0, 6)).toEqual(["frame", "segment", "reversal_field_mT", "field_mT", "threshold", "magnetization"]);
    expect(Object.keys(rows[0]!)).toEqual(expect.arrayContaining(["up_domains", "down_euler", "wall_length_density_per_nm"]));
    const segments = [...new Set(rows.map((r) => r.segment))];
    expect(segments.slice(0, 3)).toEqual(["major-descending", "major-ascending", "reversal 1"]);
    expect(segments).toHaveLength(2 + 12);
    expect(rows.filter((r) => r.segment === "major-descending").every((r) => r.reversal_field_mT === "")).toBe(true);
    const first = rows.filter((r) => r.segment === "reversal 1");
    expect(first[0]!.field_mT).toBe(first[0]!.reversal_field_mT);
  });

  it("writes loop metrics, the FORC distribution, excursions and the topology map", () => {
    const loop = JSON.parse(readFileSync(join(demo, "loop", "loop.json"), "utf8"));
    expect(loop.synthetic).toBe(true);
    expect(loop.loop.metrics.coercive_field).toBeGreaterThan(0);
    expect(loop.forc.options.smoothingFactor).toBe(2);
    expect(loop.forc.peak.rho).toBeGreaterThan(0);
    expect(loop.excursions).toHaveLength(12);
    expect(Object.keys(loop.topologyMap.columns)).toEqual(["up_domains", "up_euler"]);
    for (const f of ["loop-metrics.csv", "forc.csv", "excursions.csv", "topology-map.csv"]) {
      expect(existsSync(join(demo, "loop", f))).toBe(true);
    }
  });

  it("gives the same FORC peak again through domtopo forc on its table", () => {
    const loop = JSON.parse(readFileSync(join(demo, "loop", "loop.json"), "utf8"));
    const out = join(dir, "forc-again");
    const r = run(["forc", join(demo, "loop", "frames.csv"), "--field-column", "field_mT", "--reversal-column", "reversal_field_mT",
      "--sf", "2", "--field-step", String(loop.fieldStep), "--out", out, "--quiet"]);
    expect(r.code).toBe(0);
    const again = JSON.parse(readFileSync(join(out, "forc.json"), "utf8"));
    expect(again.peak.reversalField).toBe(loop.forc.peak.reversalField);
    expect(again.peak.field).toBe(loop.forc.peak.field);
    expect(again.peak.rho).toBeCloseTo(loop.forc.peak.rho, 6);
  });
});

describe("domtopo report", () => {
  it("is written by the demo too", () => {
    expect(existsSync(join(demo, "report.html"))).toBe(true);
  });

  it("writes one self-contained HTML file with the plots as inline SVG", () => {
    const out = join(dir, "again.html");
    const r = run(["report", demo, "--out", out]);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/Wrote .*again\.html/);
    const html = readFileSync(out, "utf8");
    expect(html.startsWith("<!DOCTYPE html>")).toBe(true);
    const svgs = html.match(/<svg[\s\S]*?<\/svg>/g) ?? [];
    // Sweep: m, topology, wall density; loop: m with curves, topology, wall density, FORC, 2 maps.
    expect(svgs.length).toBe(9);
    for (const s of svgs) checkWellFormed(s);
    expect(html).not.toMatch(/<script|<link|src="http|href="http/);
    expect(html).toContain("Synthetic data");
    expect(html).toContain("FORC distribution rho(Ha, Hb), SF = 2");
    expect(html).toMatch(/<td>coercive field<\/td><td class="num">\d/);
    expect(html).toContain("Run record (run.json)");
    // The frames as inline PNG thumbnails (the demo writes no overlays).
    expect((html.match(/src="data:image\/png;base64,/g) ?? []).length).toBe(8);
  });

  it("prefers DIR/overlays/*.png for the thumbnails when they exist", () => {
    const folder = join(dir, "with-overlays");
    mkdirSync(join(folder, "overlays"), { recursive: true });
    writeFileSync(join(folder, "frames.csv"), readFileSync(join(demo, "frames.csv")));
    writeFileSync(join(folder, "overlays", "overlay-0000.png"), readFileSync(join(demo, "frames", "frame-0000.png")));
    const r = run(["report", folder, "--quiet"]);
    expect(r.code).toBe(0);
    const html = readFileSync(join(folder, "report.html"), "utf8");
    expect(html).toContain("<h2>Overlays</h2>");
    expect(html).toContain("overlay-0000.png");
    expect(html).not.toContain("Synthetic data"); // no run.json here says so
  });

  it("names a folder that is not a run, exits with 1 and writes nothing", () => {
    const empty = join(dir, "empty");
    mkdirSync(empty);
    const r = run(["report", empty]);
    expect(r.code).toBe(1);
    expect(r.err).toContain(`${empty}: expected a run folder with frames.csv`);
    expect(readdirSync(empty)).toEqual([]);
    rmSync(empty, { recursive: true });
  });

  it("prints its help", () => {
    const r = run(["report", "--help"]);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/Usage: domtopo report <run folder>/);
  });
});
