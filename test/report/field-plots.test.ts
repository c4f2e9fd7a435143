import { describe, expect, it } from "vitest";
import {
  defectDensitySpec, fieldSeriesSpec, kindCountsSpec, spectrumFieldSpec, spectrumProfilePlots, spectrumProfileSpec,
} from "../../src/render/plots";
import { renderSvg } from "../../src/render/svg";
import { analyzeSpectrum } from "../../src/spectrum";
import { checkWellFormed, markGroups, modules, texts } from "./helpers";

/** Paths of the line groups whose class names the layer. */
const linePaths = (svg: string, name = "") =>
  markGroups(svg, "line").filter((g) => g["@class"].includes(name)).flatMap((g) => [g.path].flat());
/** Number of vertices of an SVG path made of M and L commands. */
const vertices = (d: string) => (d.match(/[ML]/g) ?? []).length;

describe("the S(q) plot", () => {
  // A maze-like phase map: two crossed cosine waves of period 16 px, thresholded at 0.
  const n = 64;
  const data = new Uint8Array(n * n);
  for (let y = 0; y < n; y++) for (let x = 0; x < n; x++) data[y * n + x] = Math.cos((2 * Math.PI * x) / 16) + 0.6 * Math.cos((2 * Math.PI * (x + y)) / 16) > 0 ? 1 : 0;
  const r = analyzeSpectrum({ width: n, height: n, data });
  const drawable = r.profile.q.filter((q, k) => q > 0 && r.profile.annulusMean[k]! > 0).length;

  it("draws one line through every bin of the profile except q = 0, on a log axis", async () => {
    const svg = await renderSvg(spectrumProfileSpec({ lengthUnit: "px", profiles: [{ name: "frame 0", q: r.profile.q, s: r.profile.annulusMean, peakQ: r.peakQ }] }), modules);
    checkWellFormed(svg);
    const paths = linePaths(svg, "profiles");
    expect(paths).toHaveLength(1);
    // Left out: q = 0 and the empty annuli past the last full ring (no spectrum points there).
    const empty = r.profile.points.filter((p) => p === 0).length;
    expect(drawable).toBe(r.profile.q.length - 1 - empty);
    expect(vertices(paths[0]!["@d"])).toBe(drawable);
    const t = texts(svg);
    expect(t).toContain("q (cycles per px)");
    expect(t).toContain("S(q) (annulus mean, log scale)");
    expect(t).toContain("frame 0");
    // The ring q* as a rule.
    expect(markGroups(svg, "rule").filter((g) => g["@class"].includes("ring_q"))).toHaveLength(1);
  });

  it("leaves out bins a log axis cannot show, and cuts at qMax", async () => {
    const q = [0, 0.1, 0.2, 0.3, 0.4, 0.5], s = [0, 2, 0, 5, 3, 1];
    const svg = await renderSvg(spectrumProfileSpec({ lengthUnit: "nm", profiles: [{ name: "a", q, s }], qMax: 0.45 }), modules);
    expect(vertices(linePaths(svg, "profiles")[0]!["@d"])).toBe(3); // 0.1, 0.3, 0.4
    expect(markGroups(svg, "rule").filter((g) => g["@class"].includes("ring_q"))).toHaveLength(0);
  });

  it("comes from the report's default hook with one line per kept frame and q* from the period column", async () => {
    const profiles = [
      { frame: 2, field: -20, q: r.profile.q, s: r.profile.annulusMean },
      { frame: 5, field: 0, q: r.profile.q, s: r.profile.annulusMean.map((v) => 2 * v) },
    ];
    const specs = spectrumProfilePlots({ columns: { frame: [0, 2, 5], period_nm: [NaN, 160, 170] }, fieldUnit: "mT", lengthUnit: "nm", profiles });
    expect(specs).toHaveLength(1);
    const svg = await renderSvg(specs[0]!, modules);
    expect(linePaths(svg, "profiles")).toHaveLength(2);
    expect(texts(svg)).toEqual(expect.arrayContaining(["frame 2, H = -20 mT", "frame 5, H = 0 mT"]));
    expect(markGroups(svg, "rule").flatMap((g) => [g.line ?? g.path].flat())).toHaveLength(2);
    expect(spectrumProfilePlots({ columns: {}, fieldUnit: "", lengthUnit: "px", profiles: [] })).toEqual([]);
  });
});

describe("kind counts against field", () => {
  const branch = (label: string, field: number[]) => ({
    label, field,
    up: { bubbles: [5, 2, 0], stripes: [1, 3, 0], labyrinths: [0, 1, 1] },
    down: { bubbles: [0, 2, 6], stripes: [0, 3, 1], labyrinths: [1, 1, 0] },
  });
  it("draws bubbles, stripes and labyrinths of each phase on each branch: two panels of 3 x 2 lines", async () => {
    const svg = await renderSvg(kindCountsSpec({ fieldUnit: "mT", branches: [branch("descending", [2, 1, 0]), branch("ascending", [0, 1, 2])] }), modules);
    checkWellFormed(svg);
    expect(linePaths(svg)).toHaveLength(2 * 3 * 2);
    const t = texts(svg);
    expect(t).toEqual(expect.arrayContaining(["up domains of each kind", "down domains of each kind", "bubbles", "stripes", "labyrinths", "descending", "ascending"]));
  });

  it("draws the kinds in the overlays' colours", async () => {
    const svg = await renderSvg(kindCountsSpec({ fieldUnit: "mT", branches: [branch("ascending", [0, 1, 2])] }), modules);
    const strokes = new Set(linePaths(svg).map((p) => p["@stroke"]));
    expect(strokes).toEqual(new Set(["#56b4e9", "#009e73", "#d55e00"]));
  });
});

describe("defect densities against field", () => {
  it("draws ends and junctions per area of both phases in two panels, unit in the titles", async () => {
    const b = { label: "ascending", field: [0, 1, 2], upEnds: [1, 2, 3], downEnds: [3, 2, 1], upJunctions: [0, 1, 0], downJunctions: [1, 0, 1] };
    const svg = await renderSvg(defectDensitySpec({ fieldUnit: "mT", areaUnit: "µm²", branches: [b] }), modules);
    checkWellFormed(svg);
    expect(linePaths(svg)).toHaveLength(4);
    expect(texts(svg)).toEqual(expect.arrayContaining(["stripe ends per area (per µm²)", "junctions per area (per µm²)", "up", "down"]));
  });
});

describe("period, correlation length and order against field", () => {
  it("draws period and correlation length in one panel and both orders in another, each with its own legend", async () => {
    const b = { label: "ascending", field: [0, 1, 2, 3], period: [200, 210, 220, 230], corrLength: [NaN, 500, 520, NaN], order2: [0.1, 0.2, 0.3, 0.2], order6: [0.05, 0.1, 0.1, 0.2] };
    const svg = await renderSvg(spectrumFieldSpec({ fieldUnit: "mT", lengthUnit: "nm", branches: [b] }), modules);
    checkWellFormed(svg);
    expect(linePaths(svg)).toHaveLength(4);
    const t = texts(svg);
    expect(t).toEqual(expect.arrayContaining(["period and correlation length (nm)", "orientational order of the ring", "period", "correlation length", "2-fold order", "6-fold order"]));
  });

  it("breaks a line where a value is missing instead of joining across the gap", async () => {
    const svg = await renderSvg(fieldSeriesSpec({ fieldUnit: "mT", yTitle: "period", series: [{ name: "period", field: [0, 1, 2, 3, 4, 5], values: [1, 2, NaN, NaN, 3, 4] }] }), modules);
    const paths = linePaths(svg);
    expect(paths).toHaveLength(2);
    expect(paths.map((p) => vertices(p["@d"]))).toEqual([2, 2]);
  });
});
