import { describe, it, expect } from "vitest";
import { analyzeFrame, type FrameOptions } from "../src/index";
import { grid, complement } from "./helpers/grid";

const binary: FrameOptions = { threshold: 0.5 };

function upEuler(f: ReturnType<typeof grid>, connectivity: 8 | 4, boundary: FrameOptions["boundary"] = "open") {
  return analyzeFrame(f, { ...binary, connectivity, boundary }).up.euler;
}

describe("bit-quad Euler numbers of hand-countable shapes", () => {
  // Values from CHECKS.md, after Gray 1971 (IEEE Trans. Comput. C-20:551) and Pratt,
  // Digital Image Processing, "Shape analysis": E4 / E8 with the subscript = foreground connectivity.
  const cases: Array<[string, string[], number, number]> = [
    ["one pixel", ["...", ".#.", "..."], 1, 1],
    ["a diagonal pair", ["#.", ".#"], 2, 1],
    ["a 3x3 ring", ["###", "#.#", "###"], 0, 0],
    ["a plus sign without its centre", [".#.", "#.#", ".#."], 4, 0],
    ["a 3x3 checkerboard", ["#.#", ".#.", "#.#"], 5, 1],
  ];
  for (const [name, rows, e4, e8] of cases) {
    it(`gives ${name} E4 = ${e4} and E8 = ${e8}`, () => {
      expect(upEuler(grid(...rows), 4)).toBe(e4);
      expect(upEuler(grid(...rows), 8)).toBe(e8);
    });
  }

  it("counts an empty frame as zero domains of up and one of down", () => {
    const r = analyzeFrame(grid("....", "...."), binary);
    expect(r.up.domains).toBe(0);
    expect(r.up.euler).toBe(0);
    expect(r.down.domains).toBe(1);
    expect(r.down.euler).toBe(1);
    expect(r.magnetization).toBe(-1);
  });

  it("counts a full frame as one up domain", () => {
    const r = analyzeFrame(grid("###", "###"), binary);
    expect(r.up.domains).toBe(1);
    expect(r.up.euler).toBe(1);
    expect(r.down.domains).toBe(0);
    expect(r.magnetization).toBe(1);
    expect(r.wallLength).toBe(0);
  });

  it("handles a single pixel frame", () => {
    const r = analyzeFrame({ width: 1, height: 1, data: new Uint8Array([200]) }, { threshold: 100 });
    expect(r.up.domains).toBe(1);
    expect(r.up.euler).toBe(1);
    expect(r.domains.count).toBe(1);
  });

  it("labels a 1 x N and an N x 1 strip of alternating runs", () => {
    const row = grid("##..#.###");
    const col = { width: 1, height: row.width, data: row.data };
    for (const f of [row, col]) {
      const r = analyzeFrame(f, binary);
      expect(r.up.domains).toBe(3);
      expect(r.down.domains).toBe(2);
      expect(r.up.euler).toBe(3);
      expect(r.down.euler).toBe(2);
    }
  });
});

describe("connectivity of the two phases", () => {
  it("joins a diagonal pair in the 8-connected phase and separates the 4-connected one", () => {
    const f = grid("#.", ".#");
    const r8 = analyzeFrame(f, { ...binary, connectivity: 8 });
    expect([r8.up.domains, r8.down.domains]).toEqual([1, 2]);
    const r4 = analyzeFrame(f, { ...binary, connectivity: 4 });
    expect([r4.up.domains, r4.down.domains]).toEqual([2, 1]);
  });

  it("counts a checkerboard's 4-connected phase pixel by pixel", () => {
    const f = grid("#.#.#", ".#.#.", "#.#.#", ".#.#.");
    const r = analyzeFrame(f, { ...binary, connectivity: 8 });
    expect(r.up.domains).toBe(1);
    expect(r.down.domains).toBe(10);
  });

  it("decides each saddle quad by the grey mean under the saddle rule", () => {
    // Three diagonal quads in a row. Quad means: 0.75 (up pair joins), -0.25 and -1 (down pairs
    // join), so up is {(0,0),(1,1)}, {(2,0)}, {(3,1)} and down is {(1,0),(2,1),(3,0)}, {(0,1)}.
    const data = new Float32Array([
      3, -1, 1, -3,
      -1, 2, -3, 1,
    ]);
    const r = analyzeFrame({ width: 4, height: 2, data }, { threshold: "zero", connectivity: "saddle" });
    expect(r.up.domains).toBe(3);
    expect(r.down.domains).toBe(2);
    expect(r.up.euler).toBe(3);
    expect(r.down.euler).toBe(2);
  });
});

describe("Euler number = domains - holes (every non-wrapping domain)", () => {
  it("holds for a ring with a speck inside", () => {
    const f = grid(
      ".......",
      ".#####.",
      ".#...#.",
      ".#.#.#.",
      ".#...#.",
      ".#####.",
      ".......",
    );
    const r = analyzeFrame(f, binary);
    expect(r.up.domains).toBe(2);
    expect(r.up.holes).toBe(1);
    expect(r.up.euler).toBe(r.up.domains - r.up.holes);
    expect(r.down.domains).toBe(2);
    // The outer down domain has the ring as a hole; the inner one (a 4-connected ring) the speck.
    expect(r.down.holes).toBe(2);
    expect(r.down.euler).toBe(r.down.domains - r.down.holes);
    const ring = Array.from(r.domains.area).indexOf(16);
    expect(r.domains.holes[ring]).toBe(1);
  });

  it("matches the per-domain Euler numbers' sum for random frames", async () => {
    const { randomFrame } = await import("./helpers/grid");
    for (let seed = 1; seed <= 40; seed++) {
      const f = randomFrame(seed, 17 + seed, 23, 0.3 + 0.01 * seed, seed % 3);
      for (const connectivity of [8, 4] as const) {
        const r = analyzeFrame(f, { ...binary, connectivity });
        for (const [p, s] of [[1, r.up], [0, r.down]] as const) {
          let sum = 0, count = 0;
          for (let i = 0; i < r.domains.count; i++) {
            if (r.domains.phase[i] === p) { sum += r.domains.euler[i]!; count++; }
          }
          expect(sum).toBe(s.euler);
          expect(count).toBe(s.domains);
          expect(s.euler).toBe(s.domains - s.holes);
        }
      }
    }
  });
});

describe("topology on the torus", () => {
  // On a torus E8(X) = -E4(complement of X), exactly (CHECKS.md, Gray 1971 duality).
  it("gives E8(X) = -E4(complement) on random periodic frames", async () => {
    const { randomFrame } = await import("./helpers/grid");
    for (let seed = 1; seed <= 60; seed++) {
      const f = randomFrame(seed, 8 + (seed % 13), 9 + (seed % 7), 0.2 + (seed % 7) * 0.1, seed % 2);
      const e8 = analyzeFrame(f, { ...binary, connectivity: 8, boundary: "periodic" }).up.euler;
      const e4c = analyzeFrame(complement(f), { ...binary, connectivity: 4, boundary: "periodic" }).up.euler;
      expect(e8 + e4c).toBe(0);
      // and within one frame: up (8) against down (4)
      const r = analyzeFrame(f, { ...binary, connectivity: 8, boundary: "periodic" });
      expect(r.up.euler + r.down.euler).toBe(0);
    }
  });

  it("gives two straight wrapping stripes Euler number 0", () => {
    const f = grid(
      "........",
      "########",
      "........",
      "........",
      "########",
      "........",
    );
    const r = analyzeFrame(f, { ...binary, boundary: "periodic" });
    expect(r.up.domains).toBe(2);
    expect(r.up.euler).toBe(0);
    expect(r.up.wrapping).toBe(2);
    expect(r.down.domains).toBe(2);
    expect(r.down.euler).toBe(0);
    expect(Array.from(r.domains.wrapsX)).toEqual([1, 1, 1, 1]);
    expect(Array.from(r.domains.wrapsY)).toEqual([0, 0, 0, 0]);
  });
});

describe("Crofton wall length", () => {
  it("measures a straight wall of length L along a row as about L", () => {
    // L = (pi/8)[N0 + N90 + (N45 + N135)/sqrt 2] (Ohser & Muecklich 2000); a horizontal wall of
    // 64 px is crossed by 64 columns and by 2 x 64 diagonals: (pi/8)(64 + 128/sqrt 2) = 60.67.
    const rows = [];
    for (let y = 0; y < 8; y++) rows.push((y < 4 ? "#" : ".").repeat(64));
    const r = analyzeFrame(grid(...rows), { ...binary, boundary: "periodic-x" });
    expect(r.wallLength).toBeCloseTo((Math.PI / 8) * (64 + 128 / Math.SQRT2), 9);
  });

  it("measures a digital disc's perimeter within 3% of 2 pi r", () => {
    const n = 201, rad = 80;
    const data = new Uint8Array(n * n);
    for (let y = 0; y < n; y++) for (let x = 0; x < n; x++) {
      data[y * n + x] = (x - 100) ** 2 + (y - 100) ** 2 <= rad * rad ? 1 : 0;
    }
    const r = analyzeFrame({ width: n, height: n, data }, binary);
    expect(Math.abs(r.wallLength / (2 * Math.PI * rad) - 1)).toBeLessThan(0.03);
    const disc = r.domains.phase.indexOf(1);
    expect(r.domains.wallLength[disc]).toBeCloseTo(r.wallLength, 9);
    expect(r.domains.elongation[disc]).toBeLessThan(1.01);
    expect(Math.abs(r.domains.equivalentDiameter[disc]! / (2 * rad) - 1)).toBeLessThan(0.01);
    expect(r.domains.centroidX[disc]).toBeCloseTo(100, 9);
  });
});

describe("minimum domain area", () => {
  it("absorbs specks into the surrounding phase and reports how many", () => {
    const f = grid(
      "#.........",
      "..........",
      "...####...",
      "...####.#.",
      "...####...",
      "....#.....",
    );
    const r = analyzeFrame(f, { ...binary, minDomainArea: 3 });
    expect(r.up.absorbed).toBe(2); // the corner pixel and the lone pixel at (8, 3)
    expect(r.up.domains).toBe(1);
    expect(r.domains.area[r.domains.phase.indexOf(1)]).toBe(13);
  });
});
