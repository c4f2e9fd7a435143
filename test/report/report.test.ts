import { describe, expect, it, beforeAll } from "vitest";
import { existsSync, mkdtempSync, readFileSync, readdirSync, rmSync, mkdirSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { decode } from "fast-png";
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

describe("the spectra the demo keeps", () => {
  it("writes S(q) of the maze nearest zero field and of a bubble frame to spectra.csv", () => {
    const rows = parseCsv(readFileSync(join(demo, "spectra.csv"), "utf8"));
    expect(Object.keys(rows[0]!)).toEqual(["frame", "field_mT", "q_per_nm", "S"]);
    // 9 frames from -30 to 30 mT: frame 4 is at 0 mT, frame 1 (-22.5 mT) nearest 2/3 of -30.
    const frames = [...new Set(rows.map((r) => r.frame))];
    expect(frames).toEqual(["1", "4"]);
    expect(rows.filter((r) => r.frame === "4").every((r) => r.field_mT === "0")).toBe(true);
    for (const f of frames) {
      const q = rows.filter((r) => r.frame === f).map((r) => Number(r.q_per_nm));
      expect(q[0]).toBe(0);
      // Bins of width 1 / (64 px x 10 nm), cycles per nm.
      q.forEach((v, k) => expect(v).toBeCloseTo(k / 640, 12));
      expect(rows.filter((r) => r.frame === f).every((r) => Number(r.S) >= 0)).toBe(true);
    }
  });

  it("writes each kept frame's spectrum as an image of at least 128 px with the ring in red", () => {
    expect(readdirSync(join(demo, "spectra")).sort()).toEqual(["frame-0001.png", "frame-0004.png"]);
    const png = decode(readFileSync(join(demo, "spectra", "frame-0004.png")));
    expect(png.width).toBe(png.height);
    expect(png.width).toBeGreaterThanOrEqual(128);
    const px = png.data as Uint8Array;
    let red = 0;
    for (let i = 0; i < px.length; i += png.channels) if (px[i] === 255 && px[i + 1] === 40 && px[i + 2] === 40) red++;
    expect(red).toBeGreaterThan(0);
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
    // Sweep: m, topology, wall density, kinds, defects, period/order; loop: m with curves,
    // topology, wall density, kinds, defects, period/order, FORC, 2 maps; spectrum: S(q).
    expect(svgs.length).toBe(16);
    for (const s of svgs) checkWellFormed(s);
    expect(html).not.toMatch(/<script|<link|src="http|href="http/);
    expect(html).toContain("Synthetic data");
    expect(html).toContain("FORC distribution rho(Ha, Hb), SF = 2");
    expect(html).toMatch(/<td>coercive field<\/td><td class="num">\d/);
    expect(html).toContain("Run record (run.json)");
    for (const title of ["Domain kinds against field", "Defects against field", "Period, correlation length and order against field",
      "Domain kinds on the major loop", "Defects on the major loop", "Period, correlation length and order on the major loop"]) {
      expect(html).toContain(`>${title}</text>`);
    }
    expect(html).toContain("contours at 10, 30, 50, 70, 90 % of the peak rho");
    // 8 overlay thumbnails and the 2 spectrum images.
    expect((html.match(/src="data:image\/png;base64,/g) ?? []).length).toBe(10);
  });

  it("shows S(q) of the kept frames and their spectrum images in a spectrum section", () => {
    const html = readFileSync(join(demo, "report.html"), "utf8");
    const section = /<section id="spectrum">([\s\S]*?)<\/section>/.exec(html)?.[1] ?? "";
    expect(section).toContain("<h2>Spectrum</h2>");
    expect(section).toContain(">Radial spectrum S(q)</text>");
    expect(section).toContain("S(q) (annulus mean, log scale)");
    expect(section).toContain(">frame 1, H = -22.5 mT</text>");
    expect(section).toContain(">frame 4, H = 0 mT</text>");
    expect((section.match(/<img alt="frame \d, H = [-\d.]+ mT" src="data:image\/png;base64,/g) ?? []).length).toBe(2);
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
    expect(html).not.toContain('<section id="spectrum">'); // no spectra.csv here
    expect(html).toContain(">Domain kinds against field</text>"); // the columns are there
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
