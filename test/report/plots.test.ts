import { describe, expect, it } from "vitest";
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { branchTopologySpec, fieldSeriesSpec, forcHeatmapSpec, loopPlotSpec } from "../../src/render/plots";
import { renderSvg } from "../../src/render/svg";
import { tanhLoop } from "../../src/sweep/synthetic";
import { checkWellFormed, markGroups, modules, texts } from "./helpers";

const loop = tanhLoop({ fieldMax: 3, fieldStep: 0.1 });
const half = (loop.field.length + 1) / 2;
const major = [
  { direction: "descending" as const, field: loop.field.slice(0, half), magnetization: loop.magnetization.slice(0, half) },
  { direction: "ascending" as const, field: loop.field.slice(half - 1), magnetization: loop.magnetization.slice(half - 1) },
];
const curves = [-1.5, -1, -0.5].map((ha) => ({
  reversalField: ha,
  field: [ha, ha + 0.5, ha + 1, 3],
  magnetization: [-0.6, -0.4, 0.2, 1],
}));

describe("the loop plot", () => {
  it("renders as well-formed SVG with one line per major branch and one per reversal curve", async () => {
    const svg = await renderSvg(loopPlotSpec({ fieldUnit: "mT", major, reversalCurves: curves }), modules);
    checkWellFormed(svg);
    const groups = markGroups(svg, "line");
    const paths = (name: string) => groups.filter((g) => g["@class"].includes(name)).flatMap((g) => [g.path].flat());
    expect(paths("major_loop")).toHaveLength(2);
    expect(paths("reversal_curves")).toHaveLength(3);
  });

  it("names both axes and both branches", async () => {
    const svg = await renderSvg(loopPlotSpec({ fieldUnit: "mT", major, reversalCurves: curves }), modules);
    const t = texts(svg);
    expect(t).toContain("applied field H (mT)");
    expect(t).toContain("magnetization m");
    expect(t).toContain("major descending");
    expect(t).toContain("major ascending");
  });
});

describe("the topology plot", () => {
  it("draws up and down domain counts and Euler numbers on each branch in two panels", async () => {
    const branch = (label: string, field: number[]) => ({
      label, field, upDomains: [1, 5, 9], downDomains: [9, 4, 1], upEuler: [1, -2, 3], downEuler: [0, 2, -1],
    });
    const spec = branchTopologySpec({ fieldUnit: "mT", branches: [branch("descending", [2, 1, 0]), branch("ascending", [0, 1, 2])] });
    const svg = await renderSvg(spec, modules);
    checkWellFormed(svg);
    // Two panels, each with up and down on both branches: 2 x 4 lines.
    const lines = markGroups(svg, "line").flatMap((g) => [g.path].flat());
    expect(lines).toHaveLength(8);
    const t = texts(svg);
    expect(t).toContain("domains of each phase");
    expect(t).toContain("Euler number of each phase");
    expect(t).toEqual(expect.arrayContaining(["up", "down", "descending", "ascending"]));
  });

  it("uses no dash legend when each series is its own branch", async () => {
    const spec = fieldSeriesSpec({
      fieldUnit: "mT", yTitle: "wall length per area",
      series: [{ name: "descending", group: "descending", field: [1, 0], values: [2, 3] }, { name: "ascending", group: "ascending", field: [0, 1], values: [1, 2] }],
    });
    expect((spec.encoding as Record<string, unknown>).strokeDash).toBeUndefined();
  });
});

describe("the FORC heatmap", () => {
  const rho = [1, 2, null, 3, -1, 0, 2, 1, null, null, 1, 1];
  const spec = forcHeatmapSpec({ fieldUnit: "mT", reversalFields: [0, 1, 2], fields: [0, 1, 2, 3], rho, smoothingFactor: 2 });

  it("draws one rectangle per grid point that has rho, and the line Hb = Ha", async () => {
    const svg = await renderSvg(spec, modules);
    checkWellFormed(svg);
    const cells = markGroups(svg, "rect").flatMap((g) => [g.path].flat());
    expect(cells).toHaveLength(rho.filter((v) => v !== null).length);
    expect(markGroups(svg, "line").filter((g) => g["@class"].includes("diagonal"))).toHaveLength(1);
  });

  it("names the axes Ha and Hb and gives SF in the title", async () => {
    const t = texts(await renderSvg(spec, modules));
    expect(t).toContain("field Hb (mT)");
    expect(t).toContain("reversal field Ha (mT)");
    expect(t.some((s) => s.includes("SF = 2"))).toBe(true);
  });
});

describe("plot specs and SVG for a web page", () => {
  it("are plain JSON, so the same spec can be embedded in a browser page", () => {
    const spec = loopPlotSpec({ fieldUnit: "mT", major, reversalCurves: curves });
    expect(JSON.parse(JSON.stringify(spec))).toEqual(spec);
  });

  it("come from modules that import nothing of Node", () => {
    for (const f of ["plots.ts", "contours.ts", "svg.ts", "report-html.ts"]) {
      const text = readFileSync(join(__dirname, "..", "..", "src", "render", f), "utf8");
      expect(text).not.toMatch(/from\s+["']node:/);
      expect(text).not.toMatch(/from\s+["']vega/);
    }
  });

  it("carry prefixed ids, so two plots on one page never share an id", async () => {
    const a = await renderSvg(forcHeatmapSpec({ fieldUnit: "mT", reversalFields: [0, 1], fields: [0, 1], rho: [1, 2, 3, 4] }), modules, "a-");
    const b = await renderSvg(forcHeatmapSpec({ fieldUnit: "mT", reversalFields: [0, 1], fields: [0, 1], rho: [1, 2, 3, 4] }), modules, "b-");
    const idsA = [...a.matchAll(/\bid="([^"]+)"/g)].map((m) => m[1]!);
    const idsB = [...b.matchAll(/\bid="([^"]+)"/g)].map((m) => m[1]!);
    expect(idsA.length).toBeGreaterThan(0); // the colour legend's gradient at least
    expect(idsA.every((id) => id.startsWith("a-"))).toBe(true);
    expect(idsA.filter((id) => idsB.includes(id))).toEqual([]);
    // Every reference points at an id of the same SVG.
    for (const m of a.matchAll(/url\(#([^)]+)\)/g)) expect(idsA).toContain(m[1]);
  });
});
