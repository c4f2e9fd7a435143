import { describe, it, expect } from "vitest";
import { analyzeFrame, type FrameOptions, type FrameResult } from "../src/index";
import { gaussianRandomField } from "../src/demo/grf";
import { grid, shift, rotate90, flipX, transpose, randomFrame } from "./helpers/grid";

const periodic: FrameOptions = { threshold: 0.5, boundary: "periodic" };

describe("domains that wind around the torus", () => {
  it("labels a domain that wraps across the right edge as one", () => {
    const f = grid(
      "##....##",
      "........",
      "........",
    );
    const open = analyzeFrame(f, { threshold: 0.5 });
    expect(open.up.domains).toBe(2);
    const r = analyzeFrame(f, { threshold: 0.5, boundary: "periodic-x" });
    expect(r.up.domains).toBe(1);
    const i = r.domains.phase.indexOf(1);
    expect(r.domains.wrapsX[i]).toBe(0);
    expect(r.domains.area[i]).toBe(4);
    expect(r.domains.bboxX[i]).toBe(6); // runs past the right side: x = 6 .. 9
    expect(r.domains.bboxWidth[i]).toBe(4);
    expect(r.domains.centroidX[i]).toBeCloseTo(7.5, 12);
  });

  it("flags a diagonal line that winds in x and y under 8-connectivity only", () => {
    const f = grid("#.....", ".#....", "..#...", "...#..", "....#.", ".....#");
    const r8 = analyzeFrame(f, { ...periodic, connectivity: 8 });
    expect(r8.up.domains).toBe(1);
    expect([r8.domains.wrapsX[r8.domains.phase.indexOf(1)], r8.domains.wrapsY[r8.domains.phase.indexOf(1)]]).toEqual([1, 1]);
    expect(r8.up.euler).toBe(0); // a closed curve on the torus
    const r4 = analyzeFrame(f, { ...periodic, connectivity: 4 });
    expect(r4.up.domains).toBe(6);
    expect(r4.up.wrapping).toBe(0);
    expect(r4.down.domains).toBe(1);
    expect(r4.down.wrapping).toBe(1);
  });

  it("does not flag a domain that touches all four sides without winding", () => {
    const f = grid(
      "#####...",
      "....#...",
      "....#...",
      "....####",
      "......#.",
      "......#.",
    );
    const r = analyzeFrame(f, periodic);
    expect(r.up.domains).toBe(1);
    const i = r.domains.phase.indexOf(1);
    expect([r.domains.wrapsX[i], r.domains.wrapsY[i], r.domains.edge[i]]).toEqual([0, 0, 0]);
    expect(r.domains.bboxWidth[i]).toBe(8);
    expect(r.domains.bboxHeight[i]).toBe(6);
    expect(r.domains.holes[i]).toBe(0);
    // The same frame with open sides: one domain, cut by the border.
    const open = analyzeFrame(f, { threshold: 0.5 });
    expect(open.domains.edge[open.domains.phase.indexOf(1)]).toBe(1);
  });

  it("does not flag a spiral that reaches both sides of a periodic frame", () => {
    // One up domain (4-connected): an open outer arm along the right side that pokes out to the
    // left side in the bottom row, then spirals inwards. Opposite sides never both hold up.
    const f = grid(
      "...........",
      ".##########",
      ".#........#",
      ".#.######.#",
      ".#.#....#.#",
      ".#.#.##.#.#",
      ".#.#..#.#.#",
      ".#.####.#.#",
      ".#......#.#",
      ".########.#",
      "##.........",
    );
    const r = analyzeFrame(f, { ...periodic, connectivity: 4 });
    expect(r.up.domains).toBe(1);
    const i = r.domains.phase.indexOf(1);
    expect(r.domains.bboxWidth[i]).toBe(11);
    expect(r.domains.bboxHeight[i]).toBe(10);
    expect([r.domains.wrapsX[i], r.domains.wrapsY[i]]).toEqual([0, 0]);
    expect(r.domains.euler[i]).toBe(1);
    // Under 8-connectivity the bottom-left pixel meets the right arm diagonally across the
    // side: now the spiral does wind around x.
    const r8 = analyzeFrame(f, { ...periodic, connectivity: 8 });
    expect(r8.domains.wrapsX[r8.domains.phase.indexOf(1)]).toBe(1);
  });

  it("finds the percolating phase of a periodic maze and keeps the torus identity", () => {
    const field = gaussianRandomField({ width: 128, height: 128, period: 16, seed: 7 });
    const r = analyzeFrame(field, { threshold: "zero", boundary: "periodic" });
    expect(r.up.wrapping + r.down.wrapping).toBeGreaterThan(0);
    expect(r.up.euler + r.down.euler).toBe(0);
    for (let i = 0; i < r.domains.count; i++) {
      if (r.domains.wrapsX[i] || r.domains.wrapsY[i]) {
        expect(r.domains.holes[i]).toBeNaN();
        expect(r.domains.edge[i]).toBe(0);
      }
    }
  });
});

function signature(r: FrameResult) {
  const rows: string[] = [];
  for (let i = 0; i < r.domains.count; i++) {
    rows.push([r.domains.phase[i], r.domains.area[i], r.domains.euler[i],
      r.domains.wrapsX[i]! + r.domains.wrapsY[i]!, r.domains.wallLength[i]!.toFixed(6)].join(":"));
  }
  rows.sort();
  const p = (s: FrameResult["up"]) => [s.domains, s.area, s.euler, s.holes, s.wrapping, s.edge];
  return { up: p(r.up), down: p(r.down), wall: r.wallLength.toFixed(6), m: r.magnetization, rows };
}

/** Swaps the x and y roles of a signature's wrap counts (they are summed, so nothing to do). */
describe("invariance under the symmetries of the square lattice", () => {
  const seeds = Array.from({ length: 12 }, (_, i) => i + 1);

  it("keeps every per-phase number and the domain multiset under cyclic shifts of periodic frames", () => {
    for (const seed of seeds) {
      const f = randomFrame(seed, 29, 19, 0.35 + seed * 0.02, seed % 3);
      for (const connectivity of [8, 4] as const) {
        const base = signature(analyzeFrame(f, { ...periodic, connectivity }));
        for (const [dx, dy] of [[1, 0], [0, 1], [7, 11], [28, 18]]) {
          expect(signature(analyzeFrame(shift(f, dx!, dy!), { ...periodic, connectivity }))).toEqual(base);
        }
      }
    }
  });

  it("keeps them under 90-degree rotations, flips and transposition, open and periodic", () => {
    for (const seed of seeds) {
      const f = randomFrame(100 + seed, 23, 31, 0.3 + seed * 0.03, seed % 2);
      for (const boundary of ["open", "periodic"] as const) {
        for (const connectivity of [8, 4] as const) {
          const o = { threshold: 0.5, boundary, connectivity };
          const base = signature(analyzeFrame(f, o));
          let g = f;
          for (let k = 0; k < 3; k++) {
            g = rotate90(g);
            expect(signature(analyzeFrame(g, o))).toEqual(base);
          }
          expect(signature(analyzeFrame(flipX(f), o))).toEqual(base);
          expect(signature(analyzeFrame(transpose(f), o))).toEqual(base);
        }
      }
    }
  });

  it("keeps the saddle rule's topology under rotation of grey frames", () => {
    const field = gaussianRandomField({ width: 64, height: 64, period: 9, seed: 3 });
    const data = field.data;
    const rot = new Float32Array(64 * 64);
    for (let y = 0; y < 64; y++) for (let x = 0; x < 64; x++) rot[x * 64 + (63 - y)] = data[y * 64 + x]!;
    for (const boundary of ["open", "periodic"] as const) {
      const o = { threshold: 0.3, connectivity: "saddle" as const, boundary };
      const a = analyzeFrame(field, o), b = analyzeFrame({ width: 64, height: 64, data: rot }, o);
      expect(signature(b)).toEqual(signature(a));
    }
  });
});
