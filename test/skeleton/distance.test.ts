import { describe, it, expect } from "vitest";
import { thinPhases } from "../../src/wasm/skeleton";
import { noiseFrame, rng } from "./helpers";

/** Brute force: distance from each pixel to the nearest pixel of the other phase. */
function brute(phase: Uint8Array, w: number, h: number, px: boolean, py: boolean, cap: number): Float64Array {
  const out = new Float64Array(w * h);
  for (let i = 0; i < w * h; i++) {
    const x = i % w, y = (i - x) / w;
    let best = Infinity;
    for (let j = 0; j < w * h; j++) {
      if (phase[j] === phase[i]) continue;
      let dx = Math.abs((j % w) - x), dy = Math.abs(Math.floor(j / w) - y);
      if (px) dx = Math.min(dx, w - dx);
      if (py) dy = Math.min(dy, h - dy);
      best = Math.min(best, Math.hypot(dx, dy));
    }
    out[i] = Math.min(best, cap);
  }
  return out;
}

describe("distance to the other phase", () => {
  it("matches brute force on random frames, open, periodic and mixed (exact EDT, Felzenszwalb & Huttenlocher 2012)", () => {
    for (let s = 0; s < 24; s++) {
      const w = 17 + (s % 5) * 6, h = 13 + (s % 4) * 7;
      const px = s % 4 === 1 || s % 4 === 3, py = s % 4 >= 2;
      const phase = noiseFrame(w, h, 400 + s, 1 + (s % 3), 2, 0.15 + 0.7 * ((s * 5) % 8) / 7);
      const { distance } = thinPhases(phase, w, h, { periodicX: px, periodicY: py, rule: 0 });
      const ref = brute(phase, w, h, px, py, w + h);
      for (let i = 0; i < w * h; i++) expect(distance[i], `frame ${s} pixel ${i}`).toBeCloseTo(ref[i]!, 4);
    }
  });
  it("gives the cap on a frame of one phase and 1 next to a wall", () => {
    const w = 9, h = 5;
    const { distance } = thinPhases(new Uint8Array(w * h).fill(1), w, h, { periodicX: false, periodicY: false, rule: 0 });
    expect(Array.from(new Set(distance))).toEqual([w + h]);
    const phase = new Uint8Array(w * h);
    for (let i = 0; i < w * h; i++) phase[i] = i % w < 4 ? 1 : 0;
    const d = thinPhases(phase, w, h, { periodicX: false, periodicY: false, rule: 0 }).distance;
    expect([d[3], d[4], d[0], d[8]]).toEqual([1, 1, 4, 5]);
  });
  it("matches brute force where whole rows or columns hold one phase (horizontal and vertical bands, open and periodic)", () => {
    for (let s = 0; s < 16; s++) {
      const w = 11 + (s % 4) * 5, h = 9 + (s % 3) * 6;
      const px = s % 2 === 1, py = (s >> 1) % 2 === 1;
      const phase = new Uint8Array(w * h);
      for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) {
        phase[y * w + x] = s < 8 ? (y % 7 < 3 ? 1 : 0) : (x % 6 < 2 || (x === 4 && y === 3) ? 1 : 0);
      }
      const { distance } = thinPhases(phase, w, h, { periodicX: px, periodicY: py, rule: 0 });
      const ref = brute(phase, w, h, px, py, w + h);
      for (let i = 0; i < w * h; i++) expect(distance[i], `frame ${s} pixel ${i}`).toBeCloseTo(ref[i]!, 4);
    }
  });
});

/**
 * Exact squared distance (integer) from each pixel to the nearest pixel of the other phase, or
 * Infinity: a plain search, by list when the other phase is sparse and by square rings around
 * the pixel otherwise (ring k holds only pixels at distance >= k, so the search stops once k^2
 * reaches the best found). Periodic axes take the nearest image (common practice).
 */
function exactSquared(phase: Uint8Array, w: number, h: number, px: boolean, py: boolean): Float64Array {
  const out = new Float64Array(w * h).fill(Infinity);
  const lists: number[][] = [[], []];
  for (let i = 0; i < w * h; i++) lists[phase[i]!]!.push(i);
  const ax = (d: number) => (px ? Math.min(Math.abs(d), w - Math.abs(d)) : Math.abs(d));
  const ay = (d: number) => (py ? Math.min(Math.abs(d), h - Math.abs(d)) : Math.abs(d));
  for (let i = 0; i < w * h; i++) {
    const x = i % w, y = (i - x) / w, other = lists[1 - phase[i]!]!;
    let best = Infinity;
    if (other.length <= 64) {
      for (const j of other) {
        const dx = ax((j % w) - x), dy = ay(Math.floor(j / w) - y);
        best = Math.min(best, dx * dx + dy * dy);
      }
    } else {
      for (let k = 1; k * k < best && k <= w + h; k++) {
        for (let dy = -k; dy <= k; dy++) for (let dx = -k; dx <= k; dx++) {
          if (Math.abs(dx) !== k && Math.abs(dy) !== k) continue;
          let xx = x + dx, yy = y + dy;
          if (px) xx = ((xx % w) + w) % w; else if (xx < 0 || xx >= w) continue;
          if (py) yy = ((yy % h) + h) % h; else if (yy < 0 || yy >= h) continue;
          if (phase[yy * w + xx] === phase[i]) continue;
          const ex = ax(xx - x), ey = ay(yy - y);
          best = Math.min(best, ex * ex + ey * ey);
        }
      }
    }
    out[i] = best;
  }
  return out;
}

type Kind = "one phase" | "checkerboard" | "few pixels" | "noise" | "maze" | "stripes";

function frameOf(kind: Kind, w: number, h: number, seed: number): Uint8Array {
  const rand = rng(seed);
  const phase = new Uint8Array(w * h);
  switch (kind) {
    case "one phase": phase.fill(seed & 1); break;
    case "checkerboard": for (let i = 0; i < w * h; i++) phase[i] = ((i % w) + Math.floor(i / w) + seed) & 1; break;
    case "few pixels": {
      phase.fill(seed & 1);
      const k = 1 + Math.floor(rand() * 3);
      for (let q = 0; q < k; q++) phase[Math.floor(rand() * w * h)] = 1 - (seed & 1);
      break;
    }
    case "noise": { const p = [0.05, 0.5, 0.95][seed % 3]!; for (let i = 0; i < w * h; i++) phase[i] = rand() < p ? 1 : 0; break; }
    case "maze": return noiseFrame(w, h, seed, 1 + (seed % 4), 2, 0.2 + 0.6 * rand());
    case "stripes": {
      const across = seed & 1, period = 2 + Math.floor(rand() * 12), up = 1 + Math.floor(rand() * (period - 1));
      for (let i = 0; i < w * h; i++) phase[i] = ((across ? i % w : Math.floor(i / w)) % period) < up ? 1 : 0;
      break;
    }
  }
  return phase;
}

describe("distance to the other phase, bit for bit", () => {
  // The kernel gives f32(sqrt(d^2)) capped at width + height for the exact integer d^2: the same
  // bits as rounding the exact distance to f32 (cap, a small integer, is exact in f32).
  const geometries = [[false, false], [true, true], [true, false], [false, true]] as const;
  const check = (kind: Kind, w: number, h: number, seed: number) => {
    const phase = frameOf(kind, w, h, seed);
    for (const [px, py] of geometries) {
      const { distance } = thinPhases(phase, w, h, { periodicX: px, periodicY: py, rule: 0 });
      const d2 = exactSquared(phase, w, h, px, py);
      for (let i = 0; i < w * h; i++) {
        const want = Math.fround(Math.min(Math.sqrt(d2[i]!), w + h));
        if (distance[i] !== want) {
          expect.fail(`${kind} ${w} x ${h} seed ${seed} periodic ${px}/${py}: pixel ${i} is ${distance[i]}, exact ${want}`);
        }
      }
    }
  };
  const small = [[1, 1], [1, 2], [2, 1], [1, 9], [9, 1], [1, 40], [40, 1], [2, 2], [3, 3], [4, 4], [2, 7], [7, 2],
    [5, 6], [8, 8], [9, 12], [16, 16], [17, 23], [31, 32], [33, 3], [3, 33], [47, 61], [64, 64], [100, 37]] as const;
  const kinds: Kind[] = ["one phase", "checkerboard", "few pixels", "noise", "maze", "stripes"];
  it("on small frames of every kind: one phase, checkerboards, single pixels, noise, mazes, stripes", () => {
    let seed = 1;
    for (const [w, h] of small) for (const kind of kinds) for (let rep = 0; rep < 3; rep++) check(kind, w, h, seed++);
  });
  it("on larger mazes and noise, odd and even sizes", () => {
    let seed = 900;
    for (const [w, h] of [[128, 128], [129, 97], [200, 64], [255, 256]] as const) {
      check("maze", w, h, seed++);
      check("noise", w, h, seed++);
      check("stripes", w, h, seed++);
    }
  });
  it("where distances exceed a hundred pixels (a few pixels of one phase in a wide frame)", () => {
    let seed = 700;
    for (const [w, h] of [[300, 300], [260, 9], [9, 260], [301, 150]] as const) {
      check("few pixels", w, h, seed++);
      check("one phase", w, h, seed++);
    }
  });
  it("on rows and columns up to 1024 pixels long", () => {
    let seed = 500;
    for (const [w, h] of [[1024, 24], [24, 1024], [1024, 1], [1, 1024], [1023, 5]] as const) {
      for (const kind of kinds) check(kind, w, h, seed++);
    }
  });
});
