import { describe, it, expect } from "vitest";
import { analyzeFrame, type FrameOptions } from "../../src/index";
import { uniformSource } from "../../src/demo/random";
import { hexGrid, hexShape, squareShape, rotate60, type Bits } from "./helpers";

const R = Math.sqrt(3) / 2;
const HEX: FrameOptions = { grid: "hex", threshold: 0.5, skeleton: "off", spectrum: "off" };
const hex = (f: Bits, o: FrameOptions = {}) => analyzeFrame(f, { ...HEX, ...o });

function randomHex(seed: number, w: number, h: number, p: number): Bits {
  const u = uniformSource(seed);
  const data = new Uint8Array(w * h);
  for (let i = 0; i < w * h; i++) data[i] = u() < p ? 1 : 0;
  return { width: w, height: h, data };
}

describe("a hexagonal frame, drawn by hand", () => {
  it("one site is one up domain of Euler number 1 and makes one hole in the down phase", () => {
    const r = hex(hexGrid(
      ".....",
      " .....",
      "..#..",
      " .....",
      ".....",
    ));
    expect(r.up.domains).toBe(1);
    expect(r.up.euler).toBe(1);
    expect(r.down.domains).toBe(1);
    expect(r.down.euler).toBe(0);
    expect(r.down.holes).toBe(1);
    expect(r.up.area).toBeCloseTo(R, 12); // one site covers sqrt(3)/2 lattice constants squared
    // Six mixed lattice edges around one site: L = (pi sqrt 3 / 12) x 6 (our Crofton weights).
    expect(r.wallLength).toBeCloseTo((Math.PI * Math.sqrt(3) / 12) * 6, 12);
    const i = r.domains.phase[0] === 1 ? 0 : 1;
    expect(r.domains.centroidX[i]).toBeCloseTo(2, 12);
    expect(r.domains.centroidY[i]).toBeCloseTo(2 * R, 12);
  });

  it("a ring of six sites is one domain with one hole; the enclosed site is a down domain of its own", () => {
    // Centre (3, 3) (odd row): neighbours (2, 3), (4, 3), (3, 2), (4, 2), (3, 4), (4, 4).
    const r = hex(hexGrid(
      ".......",
      " .......",
      "...##..",
      " ..#.#..",
      "...##..",
      " .......",
      ".......",
    ));
    expect(r.up.domains).toBe(1);
    expect(r.up.euler).toBe(0);
    expect(r.up.holes).toBe(1);
    expect(r.down.domains).toBe(2);
    expect(r.down.euler).toBe(1); // the enclosed site (1) + the surrounding annulus (0)
    const up = [...r.domains.phase].indexOf(1);
    expect(r.domains.area[up]).toBeCloseTo(6 * R, 12);
    expect(r.domains.centroidX[up]).toBeCloseTo(3.5, 12);
    expect(r.domains.centroidY[up]).toBeCloseTo(3 * R, 12);
  });

  it("a bar of five sites along a row: area, wall length and elongation along x", () => {
    const r = hex(hexGrid(
      ".........",
      " .........",
      "..#####..",
      " .........",
      ".........",
    ));
    const up = [...r.domains.phase].indexOf(1);
    expect(r.domains.area[up]).toBeCloseTo(5 * R, 12);
    expect(r.domains.euler[up]).toBe(1);
    // Phase changes: 2 along the row (its ends) + 2 edges per site to each neighbouring row.
    expect(r.domains.wallLength[up]).toBeCloseTo((Math.PI * Math.sqrt(3) / 12) * (2 + 4 * 5), 12);
    expect(r.domains.orientation[up]).toBeCloseTo(0, 9);
    expect(r.domains.elongation[up]).toBeGreaterThan(3);
  });

  it("sites touching along a row-to-row edge are one domain (six-connectivity), on both phases", () => {
    // (2, 2) and its SE neighbour (2, 3) for an even row; (3, 3) and its SE neighbour (4, 4) for an odd one.
    const r = hex(hexGrid(
      "........",
      " ........",
      "..#.....",
      " ..##....",
      "....#...",
      " ........",
    ));
    expect(r.up.domains).toBe(1);
    expect(r.up.euler).toBe(1);
  });

  it("a pair of sites in neighbouring rows that are not neighbours stays two domains", () => {
    // (2, 2) even row: its row-3 neighbours are (1, 3) and (2, 3); (3, 3) is not one.
    const r = hex(hexGrid(
      "......",
      " ......",
      "..#...",
      " ...#..",
      "......",
    ));
    expect(r.up.domains).toBe(2);
    expect(r.up.euler).toBe(2);
  });
});

describe("hexagonal topology invariants", () => {
  it("on a periodic hexagonal torus E(up) = -E(down) exactly (six-connectivity is self-dual)", () => {
    for (let seed = 1; seed <= 12; seed++) {
      const f = randomHex(seed, 32 + 2 * (seed % 3), 30 + 2 * (seed % 4), 0.3 + 0.04 * seed);
      const r = hex(f, { boundary: "periodic" });
      expect(r.up.euler + r.down.euler).toBe(0);
      let sum = 0;
      for (let i = 0; i < r.domains.count; i++) if (r.domains.phase[i] === 1) sum += r.domains.euler[i]!;
      expect(sum).toBe(r.up.euler);
    }
  });

  it("in the plane, E(up) = up domains - down domains that do not touch the border, and the same the other way", () => {
    for (let seed = 1; seed <= 10; seed++) {
      const f = randomHex(100 + seed, 40, 36, 0.35 + 0.03 * seed);
      const r = hex(f);
      const count = (p: number, interior: boolean) => {
        let n = 0;
        for (let i = 0; i < r.domains.count; i++) {
          if (r.domains.phase[i] === p && (!interior || !r.domains.edge[i])) n++;
        }
        return n;
      };
      expect(r.up.euler).toBe(count(1, false) - count(0, true));
      expect(r.down.euler).toBe(count(0, false) - count(1, true));
    }
  });

  it("two straight stripes winding around the torus in x give Euler 0 and the wrap flags", () => {
    const f = hexShape(24, 16, (_X, Y) => Y > 2 && Y < 6);
    const r = hex(f, { boundary: "periodic" });
    expect(r.up.domains).toBe(1);
    expect(r.up.wrapping).toBe(1);
    expect(r.up.euler).toBe(0);
    expect(r.down.euler).toBe(0);
    const up = [...r.domains.phase].indexOf(1);
    expect(r.domains.wrapsX[up]).toBe(1);
    expect(r.domains.wrapsY[up]).toBe(0);
  });

  it("a stripe along a slanted lattice direction winds around both periodic sides", () => {
    // The SE diagonal from (0, 0): after H = 16 rows it has moved 8 sites along x; W = 8 closes it.
    const w = 8, h = 16;
    const data = new Uint8Array(w * h);
    let x = 0;
    for (let y = 0; y < h; y++) { data[y * w + (x % w)] = 1; if (y & 1) x++; }
    const r = hex({ width: w, height: h, data }, { boundary: "periodic" });
    expect(r.up.domains).toBe(1);
    const up = [...r.domains.phase].indexOf(1);
    expect(r.domains.wrapsY[up]).toBe(1);
    expect(r.up.euler + r.down.euler).toBe(0);
  });

  it("counts, Euler numbers, areas and Crofton lengths are invariant under the lattice's 60-degree rotations", () => {
    for (let seed = 1; seed <= 6; seed++) {
      const w = 64, h = 64, cx = 32, cy = 32;
      const u = uniformSource(500 + seed);
      const base = hexShape(w, h, () => false);
      // A random blob pattern in a disc of radius 12 around the centre site.
      for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) {
        const X = x + (y & 1) / 2 - cx, Y = (y - cy) * R;
        if (X * X + Y * Y < 144 && u() < 0.55) base.data[y * w + x] = 1;
      }
      const ref = hex(base);
      let f = base;
      for (let k = 1; k < 6; k++) {
        f = rotate60(f, cx, cy);
        const r = hex(f);
        expect([r.up.domains, r.down.domains, r.up.euler, r.down.euler, r.up.holes])
          .toEqual([ref.up.domains, ref.down.domains, ref.up.euler, ref.down.euler, ref.up.holes]);
        expect(r.up.area).toBeCloseTo(ref.up.area, 9);
        expect(r.wallLength).toBeCloseTo(ref.wallLength, 9);
        expect([...r.domains.area].sort()).toEqual([...ref.domains.area].sort());
      }
    }
  });

  it("connectivity does not apply on the hexagonal lattice: 8, 4 and saddle give the same result, with a note", () => {
    const f = randomHex(77, 30, 28, 0.5);
    const [a, b, c] = ([8, 4, "saddle"] as const).map((connectivity) => hex(f, { connectivity, boundary: "periodic" }));
    for (const r of [b!, c!]) {
      expect([r.up.domains, r.down.domains, r.up.euler, r.down.euler, r.wallLength]).toEqual([a!.up.domains, a!.down.domains, a!.up.euler, a!.down.euler, a!.wallLength]);
    }
    expect(a!.notes).toEqual(["grid 'hex': both phases are six-connected; options.connectivity is not used"]);
    expect(analyzeFrame(f, { threshold: 0.5, skeleton: "off", spectrum: "off" }).notes).toBeUndefined();
  });

  it("a periodic y side with an odd number of rows is refused with a clear error", () => {
    expect(() => hex(randomHex(1, 8, 9, 0.5), { boundary: "periodic" })).toThrow(/even height.*got 9/);
    expect(() => hex(randomHex(1, 8, 9, 0.5), { boundary: "periodic-x" })).not.toThrow();
    expect(() => analyzeFrame(randomHex(1, 8, 8, 0.5), { grid: "hexagonal" as never })).toThrow(/options.grid: expected one of "square", "hex"/);
    expect(() => hex(randomHex(1, 2, 8, 0.5), { boundary: "periodic-x" })).toThrow(/at least 3 sites a row, got 2/);
    expect(() => hex(randomHex(1, 8, 2, 0.5), { boundary: "periodic-y" })).toThrow(/at least 4 rows, got 2/);
  });
});

describe("hexagonal tables are in physical units", () => {
  it("a disc sampled on the hexagonal and the square lattice gives the same area, wall length and centroid", () => {
    // Lattice constant 0.5 unit on hex; square pixels of the same area per sample.
    const a = 0.5, side = a * Math.sqrt(R);
    const rad = 9; // unit
    const hexF = hexShape(64, 72, (X, Y) => (X * a - 16) ** 2 + (Y * a - 15) ** 2 < rad * rad);
    const sqF = squareShape(70, 70, (X, Y) => (X * side - 16) ** 2 + (Y * side - 15) ** 2 < rad * rad);
    const h = hex(hexF, { pixelSize: a, unit: "um" });
    const s = analyzeFrame(sqF, { threshold: 0.5, skeleton: "off", spectrum: "off", pixelSize: side, unit: "um" });
    const hu = [...h.domains.phase].indexOf(1), su = [...s.domains.phase].indexOf(1);
    const disc = Math.PI * rad * rad, perimeter = 2 * Math.PI * rad;
    expect(Math.abs(h.domains.area[hu]! / disc - 1)).toBeLessThan(0.01);
    expect(Math.abs(s.domains.area[su]! / disc - 1)).toBeLessThan(0.01);
    expect(Math.abs(h.domains.wallLength[hu]! / perimeter - 1)).toBeLessThan(0.04);
    expect(Math.abs(s.domains.wallLength[su]! / perimeter - 1)).toBeLessThan(0.04);
    expect(h.domains.centroidX[hu]).toBeCloseTo(16, 1);
    expect(h.domains.centroidY[hu]).toBeCloseTo(15, 1);
    expect(h.domains.equivalentDiameter[hu]! / (2 * rad)).toBeCloseTo(1, 2);
    expect(h.domains.elongation[hu]).toBeLessThan(1.03);
    expect(h.up.areaFraction).toBeCloseTo(h.domains.area[hu]! / (64 * 72 * R * a * a), 12);
  });

  it("an ellipse's orientation and elongation agree between the two lattices", () => {
    const th = (30 * Math.PI) / 180;
    const inside = (X: number, Y: number) => {
      const u = (X - 30) * Math.cos(th) - (Y - 28) * Math.sin(th), v = (X - 30) * Math.sin(th) + (Y - 28) * Math.cos(th);
      return (u / 20) ** 2 + (v / 8) ** 2 < 1;
    };
    const h = hex(hexShape(60, 66, inside));
    const s = analyzeFrame(squareShape(60, 57, inside), { threshold: 0.5, skeleton: "off", spectrum: "off" });
    const hu = [...h.domains.phase].indexOf(1), su = [...s.domains.phase].indexOf(1);
    // Rows run down, so counter-clockwise as displayed is +30 degrees for a rotation by -30 in (X, Y).
    expect(h.domains.orientation[hu]).toBeCloseTo(s.domains.orientation[su]!, 0);
    expect(Math.abs(h.domains.elongation[hu]! / s.domains.elongation[su]! - 1)).toBeLessThan(0.02);
  });
});

describe("the hexagonal kernels against a plain-TS reference", () => {
  it("give the same domains, sites, Euler numbers, phase changes and centroids on random frames, open and periodic", async () => {
    const { hexReference } = await import("./reference");
    const boundaries = ["open", "periodic", "periodic-x", "periodic-y"] as const;
    for (let seed = 1; seed <= 16; seed++) {
      const boundary = boundaries[seed % 4]!;
      const w = 17 + 5 * (seed % 5), h = 12 + 2 * (seed % 6);
      const f = randomHex(900 + seed, w, h, 0.25 + 0.03 * seed);
      const px = boundary === "periodic" || boundary === "periodic-x", py = boundary === "periodic" || boundary === "periodic-y";
      const ref = hexReference(f.data, w, h, px, py);
      const r = hex(f, { boundary, keepLabels: true });
      expect(r.domains.count).toBe(ref.count);
      expect(Array.from(r.labels!)).toEqual(Array.from(ref.labels));
      for (let d = 0; d < ref.count; d++) {
        expect(r.domains.phase[d]).toBe(ref.phase[d]);
        expect(r.domains.area[d]).toBeCloseTo(ref.sites[d]! * R, 9);
        expect(r.domains.euler[d]).toBe(ref.euler[d]);
        expect(r.domains.wallLength[d]).toBeCloseTo((Math.PI * Math.sqrt(3) / 12) * ref.changes[d]!, 9);
        if (!r.domains.wrapsX[d] && !px) expect(r.domains.centroidX[d]).toBeCloseTo(ref.sumX[d]! / ref.sites[d]!, 9);
      }
    }
  });
});
