import { describe, it, expect } from "vitest";
import { analyzeFrame, hexGaussianRandomField, KIND_NAMES, type FrameOptions, type FrameResult } from "../../src/index";
import { hexGrid, hexShape, rotate60, type Bits } from "./helpers";

const HEX: FrameOptions = { grid: "hex", threshold: 0.5, spectrum: "off" };

function segDist(x: number, y: number, ax: number, ay: number, bx: number, by: number): number {
  const dx = bx - ax, dy = by - ay;
  const t = Math.max(0, Math.min(1, ((x - ax) * dx + (y - ay) * dy) / (dx * dx + dy * dy || 1)));
  return Math.hypot(x - ax - t * dx, y - ay - t * dy);
}

/** Capsules of half-width r from (cx, cy) along the given angles (physical coordinates, lattice constants). */
function star(w: number, h: number, cx: number, cy: number, arm: number, r: number, angles: number[]): Bits {
  return hexShape(w, h, (X, Y) => angles.some((a) => {
    const t = (a * Math.PI) / 180;
    return segDist(X, Y, cx, cy, cx + arm * Math.cos(t), cy + arm * Math.sin(t)) <= r;
  }));
}

function upDomain(r: FrameResult) {
  const sk = r.skeleton!.columns;
  const ids = [...r.domains.phase].flatMap((p, i) => (p === 1 ? [i] : []));
  expect(ids.length).toBe(1);
  const i = ids[0]!;
  return {
    kind: KIND_NAMES[sk.kind[i]!], ends: sk.ends[i]!, j3: sk.junctions3[i]!, j4: sk.junctions4plus[i]!,
    loops: sk.loops[i]!, length: sk.skeletonLength[i]!, width: sk.meanWidth[i]!, closed: sk.closed[i]!,
  };
}

describe("hexagonal skeletons of drawn and generated shapes", () => {
  it("one site is a bubble with a one-site skeleton (two ends, length 0)", () => {
    const r = analyzeFrame(hexGrid(".....", " .....", "..#..", " .....", "....."), HEX);
    const d = upDomain(r);
    expect(d).toMatchObject({ kind: "bubble", ends: 2, j3: 0, j4: 0, loops: 0 });
    expect(d.length).toBe(0);
  });

  it("a disc is a bubble", () => {
    const r = analyzeFrame(hexShape(40, 44, (X, Y) => Math.hypot(X - 20, Y - 19) < 8), HEX);
    expect(upDomain(r)).toMatchObject({ kind: "bubble", j3: 0, j4: 0, loops: 0 });
  });

  it("a bar 40 long and 5 wide along a row is a stripe with two ends; its length and width come out in lattice constants", () => {
    const r = analyzeFrame(hexShape(60, 30, (X, Y) => Math.abs(X - 30) <= 20 && Math.abs(Y - 13) <= 2.5), HEX);
    const d = upDomain(r);
    expect(d).toMatchObject({ kind: "stripe", ends: 2, j3: 0, j4: 0, loops: 0 });
    expect(d.length).toBeGreaterThan(30);
    expect(d.length).toBeLessThan(41);
    expect(d.width).toBeGreaterThan(4);
    expect(d.width).toBeLessThan(7);
  });

  it("the same bar turned by 90 degrees (across the rows) is still a stripe; both skeletons are within 10% of the bar's length", () => {
    const along = upDomain(analyzeFrame(hexShape(60, 30, (X, Y) => Math.abs(X - 30) <= 20 && Math.abs(Y - 13) <= 2.5), HEX));
    const across = upDomain(analyzeFrame(hexShape(30, 60, (X, Y) => Math.abs(X - 14) <= 2.5 && Math.abs(Y - 26) <= 20), HEX));
    expect(across).toMatchObject({ kind: "stripe", ends: 2, j3: 0, j4: 0 });
    expect(Math.abs(along.length / 40 - 1)).toBeLessThan(0.1);
    expect(Math.abs(across.length / 40 - 1)).toBeLessThan(0.1);
    expect(Math.abs(across.width / along.width - 1)).toBeLessThan(0.25);
  });

  it("a Y of three thick arms is a labyrinth with one degree-3 junction and three ends", () => {
    const r = analyzeFrame(star(60, 64, 30, 28, 18, 2.5, [90, 210, 330]), HEX);
    expect(upDomain(r)).toMatchObject({ kind: "labyrinth", ends: 3, j3: 1, j4: 0, loops: 0 });
  });

  it("a plus of four thick arms is a labyrinth with one degree-4 junction", () => {
    const r = analyzeFrame(star(60, 64, 30, 28, 18, 2.5, [0, 90, 180, 270]), HEX);
    expect(upDomain(r)).toMatchObject({ kind: "labyrinth", ends: 4, j3: 0, j4: 1, loops: 0 });
  });

  it("a thick ring is a closed stripe with one loop and no end", () => {
    const r = analyzeFrame(hexShape(50, 56, (X, Y) => Math.abs(Math.hypot(X - 25, Y - 24) - 14) <= 2.5), HEX);
    expect(upDomain(r)).toMatchObject({ kind: "stripe", ends: 0, j3: 0, j4: 0, loops: 1, closed: 1 });
  });

  it("kinds and defect counts of a Y are the same after each 60-degree rotation of the lattice", () => {
    let f = star(64, 64, 32, 32 * Math.sqrt(3) / 2, 16, 2.5, [90, 210, 330]);
    const ref = upDomain(analyzeFrame(f, HEX));
    for (let k = 1; k < 6; k++) {
      f = rotate60(f, 32, 32);
      const d = upDomain(analyzeFrame(f, HEX));
      expect([d.kind, d.ends, d.j3, d.j4, d.loops]).toEqual([ref.kind, ref.ends, ref.j3, ref.j4, ref.loops]);
    }
  });
});

describe("a hexagonal bubble lattice", () => {
  it("is 256 bubbles of the drawn diameter on a periodic torus, and the other phase one labyrinth", () => {
    // Discs of radius 3 at the sites of a triangular lattice of spacing 8 (rows along x), 16 x 16 on a 128 x 128 torus.
    const a = 8;
    const f = hexShape(128, 128, (X, Y) => {
      let best = Infinity;
      const j0 = Math.round(Y / (a * Math.sqrt(3) / 2));
      for (let j = j0 - 1; j <= j0 + 1; j++) {
        const off = (((j % 2) + 2) % 2) * a / 2, i0 = Math.round((X - off) / a);
        for (let i = i0 - 1; i <= i0 + 1; i++) best = Math.min(best, Math.hypot(X - (i * a + off), Y - j * a * Math.sqrt(3) / 2));
      }
      return best < 3;
    });
    const r = analyzeFrame(f, { ...HEX, boundary: "periodic", pixelSize: 0.5, unit: "um" });
    const up = r.skeleton!.up, down = r.skeleton!.down;
    expect(up.bubble.count).toBe(256);
    expect(up.stripe.count + up.labyrinth.count).toBe(0);
    expect(Math.abs(up.bubbleDiameterMean / (2 * 3 * 0.5) - 1)).toBeLessThan(0.1);
    expect(down.domains).toBe(1);
    expect(down.labyrinth.count).toBe(1);
    // Two junctions per bubble in the honeycomb of the down phase's skeleton (one per triangle of bubbles).
    expect(down.junctionDensity * r.up.area / r.up.areaFraction).toBeCloseTo(512, -1);
  });
});

describe("hexagonal thinning keeps topology", () => {
  it("every non-wrapping domain's skeleton has 1 - Euler loops, on periodic mazes and open noise", () => {
    for (const [seed, boundary] of [[1, "periodic"], [2, "periodic"], [3, "open"]] as const) {
      const f = hexGaussianRandomField({ width: 128, height: 128, period: 9, seed });
      const r = analyzeFrame(f, { grid: "hex", threshold: 0.3 * (seed - 2), boundary, spectrum: "off" });
      const c = r.skeleton!.columns;
      let checked = 0;
      for (let i = 0; i < r.domains.count; i++) {
        if (r.domains.wrapsX[i] || r.domains.wrapsY[i]) continue;
        expect(c.loops[i]).toBe(1 - r.domains.euler[i]!);
        checked++;
      }
      expect(checked).toBeGreaterThan(20);
      // Mazes: most of the area in labyrinths or stripes, with junctions and ends.
      expect(r.skeleton!.up.junctionDensity).toBeGreaterThan(0);
      expect(r.skeleton!.up.endsDensity).toBeGreaterThan(0);
    }
  });
});
