import { describe, expect, it } from "vitest";
import { forcContours, isoLines } from "../../src/render/contours";
import { forcHeatmapSpec } from "../../src/render/plots";
import { renderSvg } from "../../src/render/svg";
import { checkWellFormed, markGroups, modules, texts } from "./helpers";

/** A grid drawn as text: `#` = 1, `.` = 0, `?` = undefined; rows top to bottom. */
function grid(...rows: string[]) {
  const values = rows.flatMap((r) => [...r].map((c) => (c === "#" ? 1 : c === "?" ? null : 0)));
  return { values, size: { width: rows[0]!.length, height: rows.length } };
}

describe("isoLines", () => {
  it("rejects a size that does not match the values, a bad size and a non-finite level", () => {
    expect(() => isoLines([1, 2, 3], { width: 2, height: 2 }, 0.5)).toThrow(/expected 2 x 2 = 4 values, got 3/);
    expect(() => isoLines([], { width: 0, height: 1 }, 0.5)).toThrow(/width and height >= 1/);
    expect(() => isoLines([1, 2, 3, 4], { width: 2, height: 2 }, NaN)).toThrow(/finite level/);
  });

  it("finds nothing on a flat grid, on one row, or on a level nothing reaches", () => {
    const g = grid("...", "...", "...");
    expect(isoLines(g.values, g.size, 0.5)).toEqual([]);
    expect(isoLines([0, 1, 0], { width: 3, height: 1 }, 0.5)).toEqual([]);
    expect(isoLines(grid("...", ".#.", "...").values, g.size, 2)).toEqual([]);
  });

  it("rings one raised point with the diamond halfway to its neighbours", () => {
    const g = grid(
      "...",
      ".#.",
      "...",
    );
    const lines = isoLines(g.values, g.size, 0.5);
    expect(lines).toHaveLength(1);
    expect(lines[0]!.closed).toBe(true);
    expect(lines[0]!.points).toHaveLength(5); // four corners, the first repeated
    const unique = lines[0]!.points.slice(0, 4).map(([x, y]) => `${x},${y}`).sort();
    expect(unique).toEqual(["0.5,1", "1,0.5", "1,1.5", "1.5,1"]);
  });

  it("cuts a straight wall across the grid as one open line from border to border", () => {
    const g = grid(
      "..##",
      "..##",
      "..##",
    );
    const lines = isoLines(g.values, g.size, 0.5);
    expect(lines).toHaveLength(1);
    expect(lines[0]!.closed).toBe(false);
    expect(lines[0]!.points.map(([x]) => x)).toEqual([1.5, 1.5, 1.5]);
    expect(lines[0]!.points.map(([, y]) => y).sort()).toEqual([0, 1, 2]);
  });

  it("stops a line at an undefined point instead of closing it around the gap", () => {
    const g = grid(
      ".....",
      ".###.",
      ".##?.",
      ".###.",
      ".....",
    );
    const lines = isoLines(g.values, g.size, 0.5);
    expect(lines).toHaveLength(1);
    expect(lines[0]!.closed).toBe(false);
    // No point lies in a cell that touches the undefined point (2 < x < 4, 1 < y < 3).
    for (const [x, y] of lines[0]!.points) expect(x > 2 && x < 4 && y > 1 && y < 3).toBe(false);
  });

  it("joins the diagonal of a saddle whose mean is on its side, and parts it otherwise", () => {
    // Corners 1 . / . 1 around a cell: mean 0.5.
    const joined = isoLines([1, 0, 0, 1], { width: 2, height: 2 }, 0.4); // mean >= level: set corners joined
    const apart = isoLines([1, 0, 0, 1], { width: 2, height: 2 }, 0.6);
    expect(joined).toHaveLength(2);
    expect(apart).toHaveLength(2);
    // Joined: the segments cut off the unset corners (top-right and bottom-left).
    const nearCorner = (lines: typeof joined, cx: number, cy: number) =>
      lines.some((l) => l.points.every(([x, y]) => Math.hypot(x - cx, y - cy) < 0.8));
    expect(nearCorner(joined, 1, 0) && nearCorner(joined, 0, 1)).toBe(true);
    expect(nearCorner(apart, 0, 0) && nearCorner(apart, 1, 1)).toBe(true);
  });
});

// A Gaussian bump exp(-r^2 / (2 s^2)) has the circle r = s sqrt(-2 ln f) as its iso-line at f of
// its peak (exact, elementary). Linear interpolation along cell edges places the crossing points
// within a small fraction of a grid step of it at s = 6 steps.
describe("contours of a Gaussian", () => {
  const n = 41, c = 20, s = 6;
  const values = Array.from({ length: n * n }, (_, i) => Math.exp(-(((i % n) - c) ** 2 + (Math.floor(i / n) - c) ** 2) / (2 * s * s)));

  it("are closed circles of radius s sqrt(-2 ln f) at every asked fraction", () => {
    for (const f of [0.1, 0.3, 0.5, 0.7, 0.9]) {
      const lines = isoLines(values, { width: n, height: n }, f);
      expect(lines).toHaveLength(1);
      expect(lines[0]!.closed).toBe(true);
      const r = s * Math.sqrt(-2 * Math.log(f));
      for (const [x, y] of lines[0]!.points) expect(Math.abs(Math.hypot(x - c, y - c) - r)).toBeLessThan(0.08);
    }
  });

  it("map to field units on a FORC grid and leave out the points without rho", () => {
    // Ha every 2 mT from -20 to 20, Hb every 1 mT from -20 to 20; rho undefined where Hb < Ha.
    const ha = Array.from({ length: 21 }, (_, i) => -20 + 2 * i);
    const hb = Array.from({ length: 41 }, (_, j) => -20 + j);
    const sigma = 5, peak = 3e-3, ha0 = -6, hb0 = 4;
    const rho = ha.flatMap((a) => hb.map((b) => (b < a ? null : peak * Math.exp(-((a - ha0) ** 2 + (b - hb0) ** 2) / (2 * sigma ** 2)))));
    const contours = forcContours({ reversalFields: ha, fields: hb, rho });
    expect(contours.map((k) => k.fraction)).toEqual([0.1, 0.3, 0.5, 0.7, 0.9]);
    for (const k of contours) {
      expect(k.level).toBeCloseTo(k.fraction * peak, 12);
      expect(k.lines.length).toBeGreaterThan(0);
      const r = sigma * Math.sqrt(-2 * Math.log(k.fraction));
      for (const l of k.lines) {
        l.field.forEach((b, p) => {
          const a = l.reversalField[p]!;
          expect(b).toBeGreaterThanOrEqual(a - 1e-9); // never in the undefined half
          // Ha steps are 2 mT here: interpolation error up to about 0.3 mT on the tightest ring.
          expect(Math.abs(Math.hypot(a - ha0, b - hb0) - r)).toBeLessThan(0.35);
        });
      }
    }
    // The 10% ring reaches the diagonal Hb = Ha, so it is cut there: an open line.
    expect(contours[0]!.lines.some((l) => !l.closed)).toBe(true);
    // The 90% ring is far from it: closed.
    expect(contours[4]!.lines.every((l) => l.closed)).toBe(true);
  });

  it("are none for a rho that is nowhere positive", () => {
    expect(forcContours({ reversalFields: [0, 1], fields: [0, 1], rho: [-1, -2, null, 0] })).toEqual([]);
    expect(() => forcContours({ reversalFields: [0, 1], fields: [0, 1], rho: [1, 2, 3] })).toThrow(/2 x 2 = 4 rho values, got 3/);
    expect(() => forcContours({ reversalFields: [0, 1], fields: [0, 1], rho: [1, 2, 3, 4] }, [0])).toThrow(/fractions in \(0, 1\]/);
  });
});

describe("the FORC heatmap with contours", () => {
  const ha = Array.from({ length: 13 }, (_, i) => -12 + 2 * i);
  const hb = Array.from({ length: 25 }, (_, j) => -12 + j);
  const rho = ha.flatMap((a) => hb.map((b) => (b < a ? null : Math.exp(-((a + 2) ** 2 + (b - 4) ** 2) / 32))));

  it("draws a line layer for each asked level over the cells, and names the levels", async () => {
    const svg = await renderSvg(forcHeatmapSpec({ fieldUnit: "mT", reversalFields: ha, fields: hb, rho, smoothingFactor: 2 }), modules);
    checkWellFormed(svg);
    const lines = markGroups(svg, "line");
    for (const pct of [10, 30, 50, 70, 90]) {
      // One group per line of that level (vega draws each `detail` value as its own path).
      const paths = lines.filter((g) => g["@class"].includes(`contour_${pct}`)).flatMap((g) => [g.path].flat());
      expect(paths.length).toBeGreaterThan(0);
      for (const p of paths) expect(p["@d"]).toMatch(/^M[-\d.,]+(L[-\d.,]+)+$/);
    }
    expect(texts(svg)).toContain("contours at 10, 30, 50, 70, 90 % of the peak rho");
    // Cells still one per defined point.
    expect(markGroups(svg, "rect").flatMap((g) => [g.path].flat())).toHaveLength(rho.filter((v) => v !== null).length);
  });

  it("takes other levels, or none", async () => {
    const two = await renderSvg(forcHeatmapSpec({ fieldUnit: "mT", reversalFields: ha, fields: hb, rho, contourLevels: [0.25, 0.75] }), modules);
    const names = markGroups(two, "line").map((g) => g["@class"] as string).filter((c) => c.includes("contour_"));
    expect(names.map((c) => /contour_(\d+)/.exec(c)![1])).toEqual(["25", "75"]);
    const none = await renderSvg(forcHeatmapSpec({ fieldUnit: "mT", reversalFields: ha, fields: hb, rho, contourLevels: [] }), modules);
    expect(markGroups(none, "line").filter((g) => g["@class"].includes("contour_"))).toHaveLength(0);
  });
});
