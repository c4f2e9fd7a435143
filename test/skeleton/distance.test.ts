import { describe, it, expect } from "vitest";
import { thinPhases } from "../../src/wasm/skeleton";
import { noiseFrame } from "./helpers";

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
