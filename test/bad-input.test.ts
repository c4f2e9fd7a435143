import { describe, it, expect } from "vitest";
import { analyzeFrame, createAnalyzer } from "../src/index";

const ok = { width: 2, height: 2, data: new Uint8Array(4) };

describe("bad input gets an error that says what was expected and what arrived", () => {
  it("rejects zero, negative and non-integer sizes", () => {
    expect(() => analyzeFrame({ ...ok, width: 0 })).toThrow("frame.width: expected a positive integer, got 0");
    expect(() => analyzeFrame({ ...ok, height: -3 })).toThrow("frame.height: expected a positive integer, got -3");
    expect(() => analyzeFrame({ ...ok, width: 1.5 })).toThrow("got 1.5");
    expect(() => analyzeFrame({ ...ok, width: NaN })).toThrow("got NaN");
    expect(() => createAnalyzer(0, 4)).toThrow("analyzer width: expected a positive integer, got 0");
  });

  it("rejects a data length that does not match the size", () => {
    expect(() => analyzeFrame({ width: 3, height: 2, data: new Uint8Array(5) }))
      .toThrow("frame.data: expected 3 x 2 = 6 samples, got 5");
  });

  it("rejects unsupported sample types", () => {
    expect(() => analyzeFrame({ width: 2, height: 2, data: new Float64Array(4) as never }))
      .toThrow("frame.data: expected a Uint8Array, Uint16Array or Float32Array, got Float64Array(4)");
    expect(() => analyzeFrame({ width: 2, height: 2, data: [0, 1, 0, 1] as never }))
      .toThrow("got an array of 4");
    expect(() => analyzeFrame(null as never)).toThrow("frame: expected {width, height, data}, got null");
  });

  it("rejects NaN samples, naming how many", () => {
    const data = new Float32Array([0, NaN, 1, NaN]);
    expect(() => analyzeFrame({ width: 2, height: 2, data }, { threshold: 0.5 }))
      .toThrow("frame: expected finite samples, got 2 NaN sample(s)");
    expect(() => analyzeFrame({ width: 2, height: 2, data })).toThrow("got 2 NaN sample(s)");
  });

  it("rejects options out of range or unknown", () => {
    expect(() => analyzeFrame(ok, { connectivity: 6 as never }))
      .toThrow('options.connectivity: expected one of 8, 4, "saddle", got 6');
    expect(() => analyzeFrame(ok, { boundary: "torus" as never }))
      .toThrow('options.boundary: expected one of "open", "periodic", "periodic-x", "periodic-y", got "torus"');
    expect(() => analyzeFrame(ok, { threshold: "mean" as never })).toThrow('options.threshold: expected one of "otsu", "zero", got "mean"');
    expect(() => analyzeFrame(ok, { threshold: Infinity })).toThrow("options.threshold: expected a finite number");
    expect(() => analyzeFrame(ok, { minDomainArea: -1 })).toThrow("options.minDomainArea: expected a finite number >= 0, got -1");
    expect(() => analyzeFrame(ok, { minDomainArea: 2.5 })).toThrow("expected a whole number of pixels, got 2.5");
    expect(() => analyzeFrame(ok, { pixelSize: 0 })).toThrow("options.pixelSize: expected a finite number > 0, got 0");
    expect(() => analyzeFrame(ok, { pixelSize: NaN })).toThrow("got NaN");
    expect(() => analyzeFrame(ok, { invert: "yes" as never })).toThrow("options.invert: expected true or false");
    expect(() => analyzeFrame(ok, { tresh: 3 } as never)).toThrow("options.tresh: unknown option");
  });

  it("rejects a frame of another shape in a workspace", () => {
    const a = createAnalyzer(4, 4);
    expect(() => a.analyze(ok)).toThrow("frame: expected a 4 x 4 frame for this analyzer, got 2 x 2");
    a.dispose();
    expect(() => a.analyze({ width: 4, height: 4, data: new Uint8Array(16) })).toThrow("disposed");
  });

  it("says why Otsu could not split a uniform frame", () => {
    const r = analyzeFrame({ width: 3, height: 3, data: new Uint8Array(9).fill(200) });
    expect(r.threshold.note).toMatch(/uniform/);
    expect(r.magnetization).toBe(-1);
  });
});

describe("thresholds", () => {
  it("takes samples above a fixed level as up, and below it with invert", () => {
    const data = new Uint8Array([10, 100, 101, 250]);
    const f = { width: 4, height: 1, data };
    expect(analyzeFrame(f, { threshold: 100 }).up.area).toBe(2);
    expect(analyzeFrame(f, { threshold: 100, invert: true }).up.area).toBe(2);
    expect(analyzeFrame(f, { threshold: 100.5 }).up.area).toBe(2);
    expect(analyzeFrame(f, { threshold: 99.9 }).up.area).toBe(3);
    expect(analyzeFrame(f, { threshold: -5 }).up.area).toBe(4);
    expect(analyzeFrame(f, { threshold: 300 }).up.area).toBe(0);
  });

  it("splits a two-level image halfway by Otsu's method", () => {
    // Otsu 1979: for two levels every split between them has the same between-class variance;
    // the middle of that plateau is taken.
    const data = new Uint8Array([0, 0, 255, 255, 0, 255]);
    const r = analyzeFrame({ width: 3, height: 2, data });
    expect(r.threshold.method).toBe("otsu");
    expect(r.threshold.level).toBe(127.5);
    expect(r.up.area).toBe(3);
  });

  it("finds Otsu's level between two noisy populations of 16-bit and float samples", () => {
    const n = 4096;
    const u16 = new Uint16Array(n), f32 = new Float32Array(n);
    for (let i = 0; i < n; i++) {
      const up = i % 3 === 0;
      u16[i] = (up ? 40000 : 10000) + ((i * 7919) % 2000);
      f32[i] = (up ? 1 : -1) + (((i * 7919) % 2000) - 1000) / 4000;
    }
    const a = analyzeFrame({ width: 64, height: 64, data: u16 });
    expect(a.threshold.level).toBeGreaterThan(12000);
    expect(a.threshold.level).toBeLessThan(40000);
    expect(a.up.area).toBe(Math.ceil(n / 3));
    const b = analyzeFrame({ width: 64, height: 64, data: f32 });
    expect(Math.abs(b.threshold.level)).toBeLessThan(0.75);
    expect(b.up.area).toBe(Math.ceil(n / 3));
    expect(analyzeFrame({ width: 64, height: 64, data: f32 }, { threshold: "zero" }).up.area).toBe(Math.ceil(n / 3));
  });
});

describe("the workspace", () => {
  it("keeps Wasm memory flat over 1,000 frames", async () => {
    const { wasmMemoryBytes } = await import("../src/wasm/heap");
    const a = createAnalyzer(64, 64);
    const data = new Uint8Array(64 * 64);
    let first = 0;
    for (let k = 0; k < 1000; k++) {
      for (let i = 0; i < data.length; i++) data[i] = ((i * 2654435761 + k * 97) >>> 7) & 1;
      a.analyze({ width: 64, height: 64, data }, { threshold: 0.5 });
      if (k === 0) first = wasmMemoryBytes();
    }
    expect(wasmMemoryBytes()).toBe(first);
    a.dispose();
  });

  it("reports the same result through a workspace as through analyzeFrame", () => {
    const data = new Uint8Array(40 * 30).map((_, i) => ((i * 48271) >>> 5) & 1);
    const f = { width: 40, height: 30, data };
    const a = createAnalyzer(40, 30);
    expect(a.analyze(f, { threshold: 0.5 })).toEqual(analyzeFrame(f, { threshold: 0.5 }));
    a.dispose();
  });

  it("reports lengths and areas in the unit of a given pixel size", () => {
    const data = new Uint8Array(20 * 20).map((_, i) => (i % 20 < 10 ? 1 : 0));
    const f = { width: 20, height: 20, data };
    const px = analyzeFrame(f, { threshold: 0.5 });
    const nm = analyzeFrame(f, { threshold: 0.5, pixelSize: 25, unit: "nm" });
    expect(nm.options.unit).toBe("nm");
    expect(nm.up.area).toBe(px.up.area * 625);
    expect(nm.wallLength).toBeCloseTo(px.wallLength * 25, 9);
    expect(nm.wallLengthDensity).toBeCloseTo(px.wallLengthDensity / 25, 12);
    expect(nm.domains.centroidX[0]).toBeCloseTo(px.domains.centroidX[0]! * 25, 9);
    expect(nm.magnetization).toBe(px.magnetization);
  });
});
