import { describe, expect, it } from "vitest";
import { analyzeFrame } from "../src/topology/analyze";
import type { Boundary } from "../src/topology/options";
import { referenceLabel, type ReferenceLabeling } from "./reference/label-reference";
import { randomPhaseMaps, type RandomPhaseMap } from "./reference/random-frames";

/** A phase map drawn as rows of `#` (up) and `.` (down). */
function grid(...rows: string[]): { width: number; height: number; phase: Uint8Array } {
  const width = rows[0]!.length, height = rows.length;
  const phase = new Uint8Array(width * height);
  rows.forEach((row, y) => {
    if (row.length !== width) throw new Error(`grid: row ${y} has ${row.length} cells, expected ${width}`);
    for (let x = 0; x < width; x++) phase[y * width + x] = row[x] === "#" ? 1 : 0;
  });
  return { width, height, phase };
}

const sides = (boundary: Boundary) => ({
  periodicX: boundary === "periodic" || boundary === "periodic-x",
  periodicY: boundary === "periodic" || boundary === "periodic-y",
});

/** Ids of the reference domains of `phase`, in raster order, with their wrap flags as "xy". */
function windings(ref: ReferenceLabeling, p: 0 | 1): string[] {
  const out: string[] = [];
  for (let i = 0; i < ref.count; i++) {
    if (ref.phase[i] === p) out.push(`${ref.wrapsX[i] ? "x" : "-"}${ref.wrapsY[i] ? "y" : "-"}`);
  }
  return out;
}

const RING_AT_CORNER = grid(
  "..#...#.",
  "..#...#.",
  "###...##",
  "........",
  "........",
  "........",
  "###...##",
  "..#...#.",
);

describe("the plain-TS reference labeler", () => {
  it("numbers the domains of both phases in raster order of their first pixel", () => {
    const m = grid(
      "#..#",
      "#..#",
      ".##.",
    );
    const ref = referenceLabel(m.phase, m.width, m.height, { connectivity: 8, periodicX: false, periodicY: false });
    // The up pixels form one 8-connected domain; the down corners at the bottom are cut off.
    expect(Array.from(ref.labels)).toEqual([
      1, 2, 2, 1,
      1, 2, 2, 1,
      3, 1, 1, 4,
    ]);
    expect(Array.from(ref.phase)).toEqual([1, 0, 0, 0]);
    expect(Array.from(ref.area)).toEqual([6, 4, 1, 1]);
  });

  it("joins diagonal up pixels under connectivity 8 and diagonal down pixels under 4", () => {
    const m = grid(
      "#.",
      ".#",
    );
    const eight = referenceLabel(m.phase, 2, 2, { connectivity: 8, periodicX: false, periodicY: false });
    const four = referenceLabel(m.phase, 2, 2, { connectivity: 4, periodicX: false, periodicY: false });
    expect(Array.from(eight.labels)).toEqual([1, 2, 3, 1]);
    expect(Array.from(four.labels)).toEqual([1, 2, 2, 3]);
  });

  it("labels a stripe across the periodic right edge as one domain winding in x", () => {
    const m = grid(
      "......",
      "######",
      "......",
    );
    const ref = referenceLabel(m.phase, m.width, m.height, { connectivity: 8, periodicX: true, periodicY: false });
    expect(windings(ref, 1)).toEqual(["x-"]);
    expect(windings(ref, 0)).toEqual(["x-", "x-"]);
  });

  it("does not call a blob that straddles the periodic sides winding", () => {
    const m = grid(
      "##..##",
      "#....#",
      "##..##",
    );
    const ref = referenceLabel(m.phase, m.width, m.height, { connectivity: 4, periodicX: true, periodicY: false });
    expect(ref.count).toBe(2);
    expect(windings(ref, 1)).toEqual(["--"]);
    expect(ref.liftedBboxX[0]).toBe(4);
    expect(ref.liftedBboxWidth[0]).toBe(4);
    expect(ref.liftedCentroidX[0]).toBeCloseTo(5.5, 12);
  });

  it("does not call a ring around a hole winding, though the ring crosses both periodic sides", () => {
    // A square ring centred on the frame's corner: on the torus it encloses the 3 x 3 hole of
    // down pixels at the four corners; the down rest is crossed by full rows and columns.
    const m = RING_AT_CORNER;
    const ref = referenceLabel(m.phase, m.width, m.height, { connectivity: 8, periodicX: true, periodicY: true });
    expect(windings(ref, 1)).toEqual(["--"]);
    expect(windings(ref, 0)).toEqual(["--", "xy"]);
    expect(ref.area[0]).toBe(9);
    expect(ref.liftedBboxWidth[1]).toBe(5);
  });

  it("finds that an 8-connected diagonal staircase winds along both axes of a periodic square", () => {
    const m = grid(
      "#...",
      ".#..",
      "..#.",
      "...#",
    );
    const eight = referenceLabel(m.phase, 4, 4, { connectivity: 8, periodicX: true, periodicY: true });
    expect(windings(eight, 1)).toEqual(["xy"]);
    const four = referenceLabel(m.phase, 4, 4, { connectivity: 4, periodicX: true, periodicY: true });
    expect(windings(four, 1)).toEqual(["--", "--", "--", "--"]);
    expect(windings(four, 0)).toEqual(["xy"]);
  });

  it("lets a single pixel on a 1 x 1 torus wind along both axes, and along neither when open", () => {
    const one = new Uint8Array([1]);
    expect(windings(referenceLabel(one, 1, 1, { connectivity: 4, periodicX: true, periodicY: true }), 1)).toEqual(["xy"]);
    expect(windings(referenceLabel(one, 1, 1, { connectivity: 4, periodicX: true, periodicY: false }), 1)).toEqual(["x-"]);
    expect(windings(referenceLabel(one, 1, 1, { connectivity: 4, periodicX: false, periodicY: false }), 1)).toEqual(["--"]);
  });
});

/** The first way the kernel's labeling of `m` disagrees with the reference, or undefined. */
function disagreement(m: { width: number; height: number; phase: Uint8Array }, boundary: Boundary, connectivity: 8 | 4): string | undefined {
  const { width, height } = m;
  const { periodicX, periodicY } = sides(boundary);
  const ref = referenceLabel(m.phase, width, height, { connectivity, periodicX, periodicY });
  const r = analyzeFrame({ width, height, data: m.phase }, { threshold: 0.5, keepLabels: true, boundary, connectivity });
  const labels = r.labels!;
  const t = r.domains;
  if (t.count !== ref.count) return `kernel found ${t.count} domains, reference ${ref.count}`;
  // The bijection kernel id <-> reference id, built pixel by pixel; it must be one-to-one.
  const toRef = new Int32Array(t.count + 1), toKernel = new Int32Array(ref.count + 1);
  for (let i = 0; i < width * height; i++) {
    const k = labels[i]!, f = ref.labels[i]!;
    if (k < 1 || k > t.count) return `pixel ${i} has kernel label ${k}, outside 1..${t.count}`;
    if (toRef[k] === 0 && toKernel[f] === 0) { toRef[k] = f; toKernel[f] = k; }
    if (toRef[k] !== f || toKernel[f] !== k) {
      return `pixel ${i}: kernel domain ${k} and reference domain ${f} are not matched one to one`;
    }
  }
  for (let k = 1; k <= t.count; k++) if (toRef[k] === 0) return `kernel id ${k} labels no pixel`;
  const near = (a: number, b: number, size: number) => {
    const d = Math.abs(a - b);
    return Math.min(d, size - d) <= 1e-9; // positions along a periodic axis compare modulo size
  };
  for (let k = 1; k <= t.count; k++) {
    const i = k - 1, j = toRef[k]! - 1;
    const what = `domain ${k} (reference ${j + 1})`;
    if (t.phase[i] !== ref.phase[j]) return `${what}: phase ${t.phase[i]} vs ${ref.phase[j]}`;
    if (t.area[i] !== ref.area[j]) return `${what}: area ${t.area[i]} vs ${ref.area[j]}`;
    if (t.wrapsX[i] !== ref.wrapsX[j]) return `${what}: wrapsX ${t.wrapsX[i]} vs ${ref.wrapsX[j]}`;
    if (t.wrapsY[i] !== ref.wrapsY[j]) return `${what}: wrapsY ${t.wrapsY[i]} vs ${ref.wrapsY[j]}`;
    if (t.edge[i] !== ref.edge[j]) return `${what}: edge ${t.edge[i]} vs ${ref.edge[j]}`;
    for (const axis of ["x", "y"] as const) {
      const X = axis === "x";
      const periodic = X ? periodicX : periodicY;
      const size = X ? width : height;
      const kb = X ? t.bboxX[i]! : t.bboxY[i]!, kw = X ? t.bboxWidth[i]! : t.bboxHeight[i]!;
      const kc = X ? t.centroidX[i]! : t.centroidY[i]!;
      const winds = X ? ref.wrapsX[j] === 1 : ref.wrapsY[j] === 1;
      let rb: number, rw: number, rc: number;
      if (!periodic) {
        rb = X ? ref.bboxX[j]! : ref.bboxY[j]!;
        rw = X ? ref.bboxWidth[j]! : ref.bboxHeight[j]!;
        rc = X ? ref.centroidX[j]! : ref.centroidY[j]!;
      } else if (!winds) {
        rb = X ? ref.liftedBboxX[j]! : ref.liftedBboxY[j]!;
        rw = X ? ref.liftedBboxWidth[j]! : ref.liftedBboxHeight[j]!;
        rc = X ? ref.liftedCentroidX[j]! : ref.liftedCentroidY[j]!;
      } else {
        // A winding domain's box spans the axis (DomainTable docs); its centroid is a circular mean.
        if (kb !== 0 || kw !== size) return `${what}: winding ${axis} box ${kb}+${kw}, expected 0+${size}`;
        continue;
      }
      if (kb !== rb || kw !== rw) return `${what}: ${axis} box ${kb}+${kw} vs ${rb}+${rw}`;
      if (!near(kc, rc, periodic ? size : Infinity)) return `${what}: ${axis} centroid ${kc} vs ${rc}`;
    }
  }
  return undefined;
}

const FRAMES: RandomPhaseMap[] = randomPhaseMaps(20240611, 320);
const BOUNDARIES: Boundary[] = ["open", "periodic", "periodic-x", "periodic-y"];

describe("the labeling kernel against the plain-TS reference", () => {
  it("covers densities 0.2..0.8, smoothed and white noise, strips, squares and odd shapes", () => {
    expect(FRAMES.length).toBeGreaterThanOrEqual(300);
    const densities = FRAMES.map((f) => f.density);
    expect(Math.min(...densities)).toBeLessThan(0.25);
    expect(Math.max(...densities)).toBeGreaterThan(0.75);
    expect(FRAMES.some((f) => f.smoothing === 0)).toBe(true);
    expect(FRAMES.some((f) => f.smoothing >= 2)).toBe(true);
    const shapes = new Set(FRAMES.map((f) => `${f.width}x${f.height}`));
    for (const s of ["1x17", "23x1", "2x2", "97x61", "31x17"]) expect(shapes.has(s)).toBe(true);
  });

  for (const boundary of BOUNDARIES) {
    for (const connectivity of [8, 4] as const) {
      it(`agrees label for label, on wrap flags, areas, boxes and centroids, with ${boundary} sides and up ${connectivity}-connected`, () => {
        const failures: string[] = [];
        for (const [n, m] of FRAMES.entries()) {
          const problem = disagreement(m, boundary, connectivity);
          if (problem) failures.push(`frame ${n} (${m.width}x${m.height}, density ${m.density.toFixed(2)}, smoothing ${m.smoothing}): ${problem}`);
        }
        expect(failures.slice(0, 5)).toEqual([]);
      });
    }
  }

  it("agrees on hand-drawn windings: a straddling blob, a ring, a staircase and a one-pixel torus", () => {
    const cases = [
      grid("##..##", "#....#", "##..##"),
      RING_AT_CORNER,
      grid("#...", ".#..", "..#.", "...#"),
      grid("#"),
      grid("#.", ".#"),
      grid(".#.", "###", ".#."),
    ];
    const failures: string[] = [];
    for (const [n, m] of cases.entries()) {
      for (const boundary of BOUNDARIES) {
        for (const connectivity of [8, 4] as const) {
          const problem = disagreement(m, boundary, connectivity);
          if (problem) failures.push(`case ${n}, ${boundary}, ${connectivity}: ${problem}`);
        }
      }
    }
    expect(failures).toEqual([]);
  });
});
