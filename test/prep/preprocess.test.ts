import { describe, it, expect } from "vitest";
import { preprocessFrame, createPreprocessor } from "../../src/prep/preprocess";
import type { Frame } from "../../src/types";
import { uniformSource } from "../../src/demo/random";

/** A w x h Float32 frame with samples f(x, y). */
function frameOf(w: number, h: number, f: (x: number, y: number) => number): Frame & { data: Float32Array } {
  const data = new Float32Array(w * h);
  for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) data[y * w + x] = f(x, y);
  return { width: w, height: h, data };
}

/** Stripes along y of period `period` px: +1 on the first half of each period, -1 on the second. */
const stripe = (x: number, period: number) => ((x % period) < period / 2 ? 1 : -1);

/** Largest |sample - value| over the pixels at least `margin` px from every side. */
function interiorDeviation(f: Frame, value: (x: number, y: number) => number, margin: number): number {
  let worst = 0;
  for (let y = margin; y < f.height - margin; y++) for (let x = margin; x < f.width - margin; x++) {
    worst = Math.max(worst, Math.abs(f.data[y * f.width + x]! - value(x, y)));
  }
  return worst;
}

describe("flattening by a Gaussian high-pass", () => {
  const n = 256, sigma = 20;

  it("removes a linear ramp away from the open sides, keeping the frame's mean level", () => {
    const ramp = frameOf(n, n, (x, y) => 100 + 0.3 * x - 0.2 * y);
    for (const method of ["direct", "box"] as const) {
      const r = preprocessFrame(ramp, { flatten: { mode: "gaussian-highpass", sigma, method } });
      expect(r.flatten!.removedMean).toBeCloseTo(100 + 0.3 * 127.5 - 0.2 * 127.5, 1);
      // A symmetric kernel of sum 1 maps a linear function onto itself (common practice), away
      // from the mirrored sides by the kernel's reach (4 sigma).
      expect(interiorDeviation(r.frame, () => r.flatten!.removedMean, 4 * sigma)).toBeLessThan(1e-3);
      expect(interiorDeviation(r.frame, () => r.flatten!.removedMean, 0)).toBeGreaterThan(1); // near the sides it is not
    }
  });

  it("leaves sigma^2 / (sigma_b^2 + sigma^2) of a wide Gaussian blob's height", () => {
    const sb = 3 * sigma, A = 40;
    const blob = frameOf(n, n, (x, y) => A * Math.exp(-((x - 128) ** 2 + (y - 128) ** 2) / (2 * sb * sb)));
    const r = preprocessFrame(blob, { flatten: { mode: "gaussian-highpass", sigma, method: "direct", offset: "zero" } });
    // A Gaussian blurred by a Gaussian is a Gaussian with the variances added (common practice):
    // the blob's peak drops to A sb^2 / (sb^2 + sigma^2), the high-pass keeps the rest.
    expect(r.frame.data[128 * n + 128]).toBeCloseTo((A * sigma * sigma) / (sb * sb + sigma * sigma), 2);
    expect(r.frame.data[128 * n + 128]! / A).toBeLessThan(0.11);
  });

  it("keeps the contrast of stripes whose period is far below sigma", () => {
    const f = frameOf(n, n, (x, y) => 120 + 30 * stripe(x, 16) + 0.25 * x + 0.1 * y);
    const r = preprocessFrame(f, { flatten: { mode: "gaussian-highpass", sigma } });
    const mean = r.flatten!.removedMean;
    expect(interiorDeviation(r.frame, (x) => mean + 30 * stripe(x, 16), 3 * sigma)).toBeLessThan(0.3); // 1% of 30
    const raw = interiorDeviation(f, (x) => mean + 30 * stripe(x, 16), 3 * sigma);
    expect(raw).toBeGreaterThan(10); // the ramp was there before
  });

  it("records the resolved options, with the method 'auto' chose", () => {
    const r = preprocessFrame(frameOf(16, 16, () => 1), { flatten: { mode: "gaussian-highpass", sigma: 50 }, smooth: { sigma: 1.5 } });
    expect(r.options).toEqual({
      crop: null, background: null, boundary: "open",
      flatten: { mode: "gaussian-highpass", sigma: 50, method: "box", offset: "mean" },
      smooth: { sigma: 1.5, truncate: 4, method: "direct" },
    });
    expect(JSON.parse(JSON.stringify(r.options))).toEqual(r.options);
  });
});

describe("flattening by a least-squares polynomial surface", () => {
  // u, v: column and row mapped onto [-1, 1], the coordinates of the reported coefficients.
  const w = 40, h = 30;
  const u = (x: number) => (2 * x - (w - 1)) / (w - 1), v = (y: number) => (2 * y - (h - 1)) / (h - 1);
  const quadratic = (x: number, y: number) => 5 + 2 * u(x) - 3 * v(y) + 0.5 * u(x) ** 2 + 1.5 * u(x) * v(y) - v(y) ** 2;

  it("recovers a known quadratic background exactly and leaves a flat frame", () => {
    const r = preprocessFrame(frameOf(w, h, quadratic), { flatten: { mode: "poly", order: 2, offset: "zero" } });
    expect(r.flatten!.terms).toEqual([[0, 0], [1, 0], [0, 1], [2, 0], [1, 1], [0, 2]]);
    const expected = [5, 2, -3, 0.5, 1.5, -1];
    r.flatten!.coefficients!.forEach((c, i) => expect(c).toBeCloseTo(expected[i]!, 5));
    for (const s of r.frame.data) expect(Math.abs(s)).toBeLessThan(1e-5);
  });

  it("finds no cubic terms in a quadratic background, and a plane exactly", () => {
    const cubic = preprocessFrame(frameOf(w, h, quadratic), { flatten: { mode: "poly", order: 3 } });
    expect(cubic.flatten!.coefficients!.slice(6).every((c) => Math.abs(c) < 1e-5)).toBe(true);
    const plane = preprocessFrame(frameOf(w, h, (x, y) => 7 - 0.1 * x + 0.4 * y), { flatten: { mode: "plane" } });
    const mean = plane.flatten!.removedMean;
    for (const s of plane.frame.data) expect(s).toBeCloseTo(mean, 4);
  });

  it("cannot flatten a quadratic background with a plane", () => {
    const r = preprocessFrame(frameOf(w, h, quadratic), { flatten: { mode: "plane" } });
    const mean = r.flatten!.removedMean;
    expect(Math.max(...Array.from(r.frame.data, (s) => Math.abs(s - mean)))).toBeGreaterThan(0.3);
  });

  it("needs more pixels than the order", () => {
    expect(() => preprocessFrame(frameOf(3, 2, () => 0), { flatten: { mode: "poly", order: 2 } }))
      .toThrow("options.flatten: a surface of order 2 needs at least 3 x 3 pixels, got 3 x 2");
  });
});

describe("per-line levelling", () => {
  it("removes a random offset from each row by its median, restoring the pattern", () => {
    const rand = uniformSource(11), offsets = Array.from({ length: 20 }, () => 50 * rand());
    const f = frameOf(32, 20, (x, y) => 5 * stripe(x, 8) + offsets[y]!);
    for (const statistic of ["median", "mean"] as const) {
      const r = preprocessFrame(f, { flatten: { mode: "lines", statistic, offset: "zero" } });
      for (let y = 0; y < 20; y++) for (let x = 0; x < 32; x++) {
        expect(r.frame.data[y * 32 + x]).toBeCloseTo(5 * stripe(x, 8), 4);
      }
    }
  });

  it("lets the median ignore a spike that shifts the mean", () => {
    const f = frameOf(9, 1, (x) => (x === 4 ? 900 : 1));
    const median = preprocessFrame(f, { flatten: { mode: "lines", offset: "zero" } });
    const mean = preprocessFrame(f, { flatten: { mode: "lines", statistic: "mean", offset: "zero" } });
    expect(median.frame.data[0]).toBe(0);
    expect(mean.frame.data[0]).toBeCloseTo(1 - 908 / 9, 4);
  });
});

describe("background reference", () => {
  const w = 24, h = 16;
  const signal = (x: number, y: number) => 60 + 40 * stripe(x + y, 6);
  const gain = (x: number, y: number) => 0.5 + x / w + 0.3 * Math.sin(y / 3);

  it("division by a reference of the same gain restores the signal", () => {
    const frame = frameOf(w, h, (x, y) => signal(x, y) * gain(x, y));
    const reference = frameOf(w, h, (x, y) => 100 * gain(x, y)); // saturated level 100
    const r = preprocessFrame(frame, { background: { mode: "divide" } }, reference);
    for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) expect(r.frame.data[y * w + x]).toBeCloseTo(signal(x, y) / 100, 5);
    expect(r.background).toEqual({ invalidPixels: 0, fill: expect.any(Number) });
    expect(r.options.background).toEqual({ mode: "divide", reference: { width: w, height: h } });
  });

  it("subtraction of a reference restores the signal from integer samples", () => {
    const frame = { width: w, height: h, data: new Uint16Array(w * h) };
    const reference = { width: w, height: h, data: new Uint16Array(w * h) };
    for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) {
      reference.data[y * w + x] = 1000 + 17 * x + 5 * y;
      frame.data[y * w + x] = reference.data[y * w + x]! + signal(x, y);
    }
    const r = preprocessFrame(frame, { background: { mode: "subtract", reference } });
    expect(r.frame.data).toBeInstanceOf(Float32Array);
    for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) expect(r.frame.data[y * w + x]).toBe(signal(x, y));
  });

  it("gives pixels of a zero or non-finite reference the frame's mean and counts them", () => {
    const frame = frameOf(4, 2, (x) => 10 * (x + 1));
    const reference = frameOf(4, 2, () => 2);
    reference.data[1] = 0; reference.data[2] = NaN; reference.data[5] = -Infinity;
    const r = preprocessFrame(frame, { background: { mode: "divide", reference } });
    // Valid quotients: 5, 20 (row 0, x = 0, 3) and 5, 15, 20 (row 1, x = 0, 2, 3): mean 13.
    expect(r.background).toEqual({ invalidPixels: 3, fill: 13 });
    expect(Array.from(r.frame.data)).toEqual([5, 13, 13, 20, 5, 13, 15, 20]);
    const s = preprocessFrame(frame, { background: { mode: "subtract", reference } });
    expect(s.background!.invalidPixels).toBe(2); // subtracting zero is fine
    expect(s.frame.data.every((v) => Number.isFinite(v))).toBe(true);
  });

  it("refuses a reference with no usable sample", () => {
    expect(() => preprocessFrame(frameOf(2, 2, () => 1), { background: { mode: "divide", reference: frameOf(2, 2, () => 0) } }))
      .toThrow("background reference: expected at least one finite, non-zero sample, got none (4 pixels)");
  });

  it("names both shapes when the reference does not match the frame", () => {
    expect(() => preprocessFrame(frameOf(8, 6, () => 1), { background: { mode: "divide" } }, frameOf(6, 8, () => 1)))
      .toThrow("background reference: expected the frame's shape 8 x 6, got 6 x 8");
    expect(() => preprocessFrame(frameOf(8, 6, () => 1), { background: { mode: "divide" } }))
      .toThrow("options.background.reference: expected a reference frame, got undefined");
    expect(() => preprocessFrame(frameOf(8, 6, () => 1), { background: { mode: "ratio" as never } }, frameOf(8, 6, () => 1)))
      .toThrow('options.background.mode: expected one of "divide", "subtract", got "ratio"');
  });

  it("crops the reference with the frame", () => {
    const frame = frameOf(10, 8, (x, y) => 3 * (x + 10 * y));
    const reference = frameOf(10, 8, (x, y) => x + 10 * y + 1);
    const r = preprocessFrame(frame, { crop: { x: 2, y: 3, width: 4, height: 2 }, background: { mode: "subtract", reference } });
    expect(r.frame.width).toBe(4);
    expect(r.frame.height).toBe(2);
    const expected: number[] = [];
    for (let y = 3; y < 5; y++) for (let x = 2; x < 6; x++) expected.push(2 * (x + 10 * y) - 1);
    expect(Array.from(r.frame.data)).toEqual(expected);
  });
});

describe("crop", () => {
  const f = frameOf(10, 8, (x, y) => x + 100 * y);

  it("keeps the rectangle's samples", () => {
    const r = preprocessFrame(f, { crop: { x: 7, y: 6, width: 3, height: 2 } });
    expect(Array.from(r.frame.data)).toEqual([607, 608, 609, 707, 708, 709]);
  });

  it("says what fits when the rectangle does not", () => {
    expect(() => preprocessFrame(f, { crop: { x: 7, y: 0, width: 4, height: 2 } }))
      .toThrow("options.crop.width: expected a whole number in [1, 3] (the frame is 10 wide, crop.x is 7), got 4");
    expect(() => preprocessFrame(f, { crop: { x: 0, y: 8, width: 1, height: 1 } }))
      .toThrow("options.crop.y: expected a whole number in [0, 7] (the frame is 8 high), got 8");
    expect(() => preprocessFrame(f, { crop: { x: 1.5, y: 0, width: 1, height: 1 } })).toThrow("options.crop.x: expected a whole number in [0, 9]");
    expect(() => preprocessFrame(f, { crop: { x: 0, y: 0, width: 0, height: 1 } })).toThrow("got 0");
    expect(() => preprocessFrame(f, { crop: { x: 0, y: 0, width: 2 } as never })).toThrow("options.crop.height: expected a whole number in [1, 8] (the frame is 8 high, crop.y is 0), got undefined");
  });

  it("refuses to cut across a periodic side, but allows the full periodic extent", () => {
    expect(() => preprocessFrame(f, { crop: { x: 0, y: 0, width: 5, height: 8 }, boundary: "periodic" }))
      .toThrow('options.crop: a crop cut across a periodic side is not periodic in x; expected boundary "open" (or the full width 10), got boundary "periodic"');
    const r = preprocessFrame(f, { crop: { x: 0, y: 2, width: 10, height: 3 }, boundary: "periodic-x" });
    expect(r.frame.height).toBe(3);
  });
});

describe("preprocessFrame and the movie workspace", () => {
  it("returns the input itself when nothing is asked", () => {
    const f = { width: 3, height: 1, data: new Uint8Array([1, 2, 3]) };
    const r = preprocessFrame(f);
    expect(r.frame).toBe(f);
    expect(r.options).toEqual({ crop: null, background: null, flatten: null, smooth: null, boundary: "open" });
  });

  it("smooths integer samples into a Float32 frame", () => {
    const f = { width: 5, height: 5, data: new Uint8Array(25).fill(7) };
    const r = preprocessFrame(f, { smooth: { sigma: 1 } });
    expect(r.frame.data).toBeInstanceOf(Float32Array);
    for (const v of r.frame.data) expect(v).toBeCloseTo(7, 5);
  });

  it("wraps only the periodic axis under 'periodic-x'", () => {
    const f = frameOf(12, 12, () => 0);
    f.data[5 * 12 + 0] = 1; // on the left side
    const r = preprocessFrame(f, { smooth: { sigma: 1 }, boundary: "periodic-x" });
    expect(r.frame.data[5 * 12 + 11]).toBeGreaterThan(0.05); // spread across the left/right seam
    const g = frameOf(12, 12, () => 0);
    g.data[0 * 12 + 5] = 1; // on the top side
    const s = preprocessFrame(g, { smooth: { sigma: 1 }, boundary: "periodic-x" });
    expect(s.frame.data[11 * 12 + 5]).toBe(0); // not across the top/bottom side
  });

  it("reuses its buffers frame after frame and checks each frame's shape", () => {
    const p = createPreprocessor(16, 16, { flatten: { mode: "lines" }, smooth: { sigma: 1.5 } });
    const a = p.process(frameOf(16, 16, (x) => x));
    const b = p.process(frameOf(16, 16, (x, y) => y));
    expect(b.frame.data).toBe(a.frame.data);
    expect(() => p.process(frameOf(16, 8, () => 0))).toThrow("frame: expected a 16 x 16 frame for this preprocessor, got 16 x 8");
  });

  it("gives the same result per frame as preprocessFrame", () => {
    const options = { crop: { x: 1, y: 2, width: 20, height: 15 }, flatten: { mode: "gaussian-highpass" as const, sigma: 6 }, smooth: { sigma: 1 } };
    const p = createPreprocessor(24, 20, options);
    const f = frameOf(24, 20, (x, y) => Math.sin(x) + y * 0.1);
    expect(Array.from(p.process(f).frame.data)).toEqual(Array.from(preprocessFrame(f, options).frame.data));
  });

  it("rejects NaN samples and unknown or bad options", () => {
    const f = frameOf(4, 4, () => 0);
    f.data[3] = NaN;
    expect(() => preprocessFrame(f, { smooth: { sigma: 1 } })).toThrow("frame: expected finite samples, got 1 NaN or infinite sample(s)");
    const g = frameOf(4, 4, () => 0);
    expect(() => preprocessFrame(g, { smoth: {} } as never)).toThrow("options.smoth: unknown option");
    expect(() => preprocessFrame(g, { smooth: { sigma: -1 } })).toThrow("options.smooth.sigma: expected a finite number > 0, got -1");
    expect(() => preprocessFrame(g, { flatten: { mode: "median" } as never })).toThrow('options.flatten.mode: expected one of "gaussian-highpass", "plane", "poly", "lines", got "median"');
    expect(() => preprocessFrame(g, { flatten: { mode: "plane", order: 2 } as never })).toThrow("options.flatten.order: unknown option");
    expect(() => preprocessFrame(g, { boundary: "torus" as never })).toThrow('options.boundary: expected one of "open", "periodic", "periodic-x", "periodic-y", got "torus"');
  });
});
