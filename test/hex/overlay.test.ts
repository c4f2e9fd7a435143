import { describe, it, expect } from "vitest";
import { createAnalyzer, hexRaster } from "../../src/index";
import { hexShape } from "./helpers";

const R = Math.sqrt(3) / 2;

describe("overlays of hexagonal frames", () => {
  it("draw every site as its hexagonal cell: a pixel takes the colour of the nearest site", () => {
    const w = 5, h = 4, s = 10;
    const img = hexRaster(w, h, s, (site) => [site, 0, 0]);
    expect(img.width).toBe(Math.ceil((w + 0.5) * s));
    expect(img.height).toBe(Math.ceil(((h - 1) * R + 2 / Math.sqrt(3)) * s));
    // The centre of site (x, y) is at ((x + (y & 1)/2 + 1/2) s, (y sqrt(3)/2 + 1/sqrt(3)) s).
    for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) {
      const X = Math.floor((x + (y & 1) / 2 + 0.5) * s), Y = Math.floor((y * R + 1 / Math.sqrt(3)) * s);
      const o = 4 * (Y * img.width + X);
      expect([img.rgba[o], img.rgba[o + 3]]).toEqual([y * w + x, 255]);
    }
    // Odd rows are shifted: the pixel half a site right of (0, 0)'s centre, one row down, is site (0, 1).
    const X = Math.floor(1 * s) + 1, Y = Math.floor((R + 1 / Math.sqrt(3)) * s);
    expect(img.rgba[4 * (Y * img.width + X)]).toBe(w);
  });

  it("FrameAnalyzer.overlay draws a hexagonal frame's kinds, unsheared, after a grid 'hex' analysis", () => {
    const w = 40, h = 40;
    const f = hexShape(w, h, (X, Y) => Math.hypot(X - 20, Y - 17) < 6);
    const a = createAnalyzer(w, h);
    const r = a.analyze(f, { grid: "hex", threshold: 0.5, spectrum: "off" });
    expect(r.skeleton!.up.bubble.count).toBe(1);
    const img = a.overlay();
    expect(img.width).toBe(Math.ceil((w + 0.5) * 6)); // 6 px per lattice constant by default on hex
    // The disc's centre is drawn in the bubble colour (sky blue, Okabe-Ito) near (20, 17) lattice constants,
    // away from the skeleton mark.
    const X = Math.round((20 + 0.5 + 2) * 6), Y = Math.round((17 + 1 / Math.sqrt(3)) * 6);
    const o = 4 * (Y * img.width + X);
    expect([img.rgba[o], img.rgba[o + 1], img.rgba[o + 2]]).toEqual([86, 180, 233]);
    a.dispose();
  });
});
