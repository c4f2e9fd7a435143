import { describe, it, expect } from "vitest";
import { analyzeFrame, createAnalyzer, demoSweep, frameRow, domainRows, domainHeader, KIND_NAMES } from "../src/index";

describe("skeletons and kinds in analyzeFrame", () => {
  it("classifies a demo maze's percolating phase as labyrinth and a high level's phase as bubbles", () => {
    const sweep = demoSweep({ size: 256, frames: 9 });
    // Frame 4 is at zero field: a maze, each phase a labyrinth that spans the frame.
    const maze = analyzeFrame(sweep.frame(4), { threshold: sweep.threshold, minDomainArea: 4 });
    const sk = maze.skeleton!;
    expect(sk).toBeDefined();
    const biggest = (p: 0 | 1) => {
      let best = -1;
      for (let i = 0; i < maze.domains.count; i++) {
        if (maze.domains.phase[i] === p && (best < 0 || maze.domains.area[i]! > maze.domains.area[best]!)) best = i;
      }
      return best;
    };
    for (const p of [0, 1] as const) {
      const i = biggest(p);
      expect(maze.domains.area[i]! / (256 * 256)).toBeGreaterThan(0.2);
      expect(KIND_NAMES[sk.columns.kind[i]!]).toBe("labyrinth");
    }
    expect(sk.up.labyrinth.areaFraction).toBeGreaterThan(0.2);
    expect(sk.up.junctionDensity).toBeGreaterThan(0);
    // Frame 1 is at -22.5 mT: isolated up bubbles in a down matrix.
    const bubbles = analyzeFrame(sweep.frame(1), { threshold: sweep.threshold, minDomainArea: 4 });
    const b = bubbles.skeleton!.up;
    expect(b.bubble.count).toBeGreaterThan(10);
    expect(b.bubble.count).toBeGreaterThanOrEqual(0.8 * bubbles.up.domains);
    expect(b.labyrinth.count).toBe(0);
    expect(b.bubbleDiameterMean).toBeGreaterThan(3);
    expect(KIND_NAMES[bubbles.skeleton!.columns.kind[biggestOf(bubbles, 0)]!]).toBe("labyrinth");
  });

  it("puts kind counts and defect densities in the per-frame row and kinds in the domain rows", () => {
    const sweep = demoSweep({ size: 128, frames: 3 });
    const r = analyzeFrame(sweep.frame(1), { threshold: 127.5, pixelSize: 10, unit: "nm" });
    const row = Object.fromEntries(frameRow(r));
    for (const k of ["up_bubbles", "up_stripes", "up_labyrinths", "down_labyrinths", "up_ends_per_nm2", "up_junctions_per_nm2", "down_stripe_width_mean_nm"]) {
      expect(row).toHaveProperty(k);
    }
    const head = domainHeader("nm");
    const rows = domainRows(r);
    expect(rows[0]).toHaveLength(head.length);
    expect(["bubble", "stripe", "labyrinth"]).toContain(rows[0]![head.indexOf("kind")]);
  });

  it("can be switched off and then adds no skeleton columns", () => {
    const r = analyzeFrame(demoSweep({ size: 64, frames: 1 }).frame(0), { threshold: 127.5, skeleton: "off" });
    expect(r.skeleton).toBeUndefined();
    expect(frameRow(r).some(([k]) => k.includes("bubbles"))).toBe(false);
    expect(domainRows(r)[0]).toHaveLength(domainHeader("px", false).length);
  });

  it("draws an overlay of the last frame", () => {
    const a = createAnalyzer(64, 64);
    expect(() => a.overlay()).toThrow("overlay: analyze a frame with the skeleton on first");
    a.analyze(demoSweep({ size: 64, frames: 3 }).frame(1), { threshold: 127.5 });
    const img = a.overlay({ scale: 2 });
    expect([img.width, img.height]).toEqual([128, 128]);
    let coloured = 0;
    for (let i = 0; i < img.rgba.length; i += 4) if (img.rgba[i + 3] === 255) coloured++;
    expect(coloured).toBe(128 * 128);
    a.dispose();
  });

  it("runs the skeleton under the saddle rule with the labeling's own quad decisions", () => {
    const sweep = demoSweep({ size: 64, frames: 3 });
    const f = sweep.frame(1);
    const r = analyzeFrame(f, { threshold: 127.5, connectivity: "saddle" });
    expect(r.skeleton!.options.connectivity).toBe("saddle");
    // Loops of the skeleton graph = 1 - Euler number for every non-wrapping domain (CHECKS.md:
    // Euler's formula for graphs on a topology-preserving skeleton).
    for (let i = 0; i < r.domains.count; i++) {
      if (!r.domains.wrapsX[i] && !r.domains.wrapsY[i]) expect(r.skeleton!.columns.loops[i]).toBe(1 - r.domains.euler[i]!);
    }
  });
});

function biggestOf(r: ReturnType<typeof analyzeFrame>, p: 0 | 1): number {
  let best = -1;
  for (let i = 0; i < r.domains.count; i++) {
    if (r.domains.phase[i] === p && (best < 0 || r.domains.area[i]! > r.domains.area[best]!)) best = i;
  }
  return best;
}
