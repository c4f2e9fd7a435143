import { describe, it, expect } from "vitest";
import { levelFromSaturation, frameMedian } from "../../src/prep/movie-threshold";
import { thresholdSensitivity } from "../../src/sequence/sensitivity";
import { analyzeFrame } from "../../src/topology/analyze";
import { gaussianRandomField } from "../../src/demo/grf";
import { normalSource } from "../../src/demo/random";

function noisyLevel(seed: number, n: number, level: number, spread: number) {
  const g = normalSource(seed);
  return { width: n, height: n, data: new Float32Array(n * n).map(() => level + spread * g()) };
}

describe("a fixed level for a movie from saturated frames", () => {
  it("puts the level halfway between the medians of the two saturated frames", () => {
    const up = { width: 3, height: 1, data: new Uint8Array([200, 230, 210]) };
    const down = { width: 2, height: 2, data: new Uint8Array([30, 20, 90, 10]) };
    // Halfway between saturated levels (common practice, FIELD.md).
    expect(levelFromSaturation(up, down)).toEqual({ level: (210 + 25) / 2, upMedian: 210, downMedian: 25, contrast: 185 });
  });

  it("takes medians, so hot pixels and dust do not move the level", () => {
    const up = noisyLevel(1, 64, 180, 4), down = noisyLevel(2, 64, 40, 4);
    for (let i = 0; i < 200; i++) { up.data[i * 17] = 0; down.data[i * 13] = 4000; }
    const r = levelFromSaturation(up, down);
    expect(r.level).toBeCloseTo(110, 0);
  });

  it("reports a negative contrast when up is dark, and works on 16-bit and float frames", () => {
    const up = { width: 2, height: 1, data: new Uint16Array([1000, 1200]) };
    const down = { width: 1, height: 1, data: new Float32Array([3000.5]) };
    const r = levelFromSaturation(up, down);
    expect(r.contrast).toBe(1100 - 3000.5);
    expect(r.level).toBe((1100 + 3000.5) / 2);
  });

  it("finds the median of integer samples from their histogram as a sort would", () => {
    const data = new Uint16Array(1001).map((_, i) => (i * 7919) % 65536);
    const sorted = Array.from(data).sort((a, b) => a - b);
    expect(frameMedian({ width: 1001, height: 1, data })).toBe(sorted[500]);
  });

  it("refuses NaN samples and names the frame", () => {
    const bad = { width: 2, height: 1, data: new Float32Array([1, NaN]) };
    expect(() => levelFromSaturation(bad, bad)).toThrow("frameUp: expected finite samples, got 1 NaN or infinite sample(s)");
    expect(() => levelFromSaturation({ width: 1, height: 1, data: new Uint8Array(1) }, bad)).toThrow("frameDown:");
  });
});

describe("threshold sensitivity", () => {
  const field = gaussianRandomField({ width: 256, height: 256, seed: 5, period: 16 });
  const frame = { width: field.width, height: field.height, data: field.data };

  it("analyzes the frame at t - delta, t and t + delta with the other options unchanged", () => {
    const s = thresholdSensitivity(frame, { threshold: 0, boundary: "periodic" }, 0.25);
    expect(s.points.map((p) => p.threshold.level)).toEqual([-0.25, 0, 0.25]);
    const centre = analyzeFrame(frame, { threshold: 0, boundary: "periodic" });
    expect(s.points[1].magnetization).toBe(centre.magnetization);
    expect(s.points[1].up).toEqual(centre.up);
    for (const [i, level] of [-0.25, 0, 0.25].entries()) {
      let up = 0;
      for (const v of frame.data) if (v > level) up++;
      expect(s.points[i]!.magnetization).toBeCloseTo((2 * up) / frame.data.length - 1, 12);
    }
    expect(s.spread.magnetization).toBeCloseTo(s.points[0].magnetization - s.points[2].magnetization, 12);
    expect(s.note).toBeUndefined();
  });

  it("moves the magnetization of a Gaussian field by about 2 erf(delta / sqrt 2)", () => {
    const s = thresholdSensitivity(frame, { threshold: 0, boundary: "periodic" }, 0.25);
    // Area fraction above u of a unit Gaussian field is erfc(u / sqrt 2) / 2 (Adler 1981), so
    // m(u) = -erf(u / sqrt 2) and m(-d) - m(d) = 2 erf(d / sqrt 2) = 0.3949 for d = 0.25.
    expect(s.spread.magnetization).toBeGreaterThan(0.37);
    expect(s.spread.magnetization).toBeLessThan(0.42);
  });

  it("centres on the level Otsu's method chose when no level is given", () => {
    const s = thresholdSensitivity(frame, { boundary: "periodic" }, 0.1);
    const otsu = analyzeFrame(frame, { boundary: "periodic" }).threshold.level;
    expect(s.level).toBe(otsu);
    expect(s.points[1].threshold.level).toBe(otsu);
  });

  it("says when delta is below the step of integer samples", () => {
    const bytes = { width: 4, height: 1, data: new Uint8Array([10, 11, 12, 13]) };
    const s = thresholdSensitivity(bytes, { threshold: 11.5 }, 0.2);
    expect(s.note).toMatch(/only 1 distinct way/);
    expect(thresholdSensitivity(bytes, { threshold: 11.5 }, 1).note).toBeUndefined();
    expect(() => thresholdSensitivity(bytes, {}, 0)).toThrow("delta: expected a finite number > 0, got 0");
  });
});
