import { describe, it, expect } from "vitest";
import { analyzeFrame, demoSweep, frameRow } from "../src/index";

describe("the spectrum in analyzeFrame", () => {
  it("reads the demo maze's design period (240 nm) from the phase map within 3%", () => {
    // 512 px frames hold about 21 periods; at 256 px the realization's own scatter is ~5%.
    for (const seed of [3, 4, 5]) {
      const sweep = demoSweep({ size: 512, frames: 3, seed });
      const r = analyzeFrame(sweep.frame(1), { threshold: sweep.threshold, pixelSize: sweep.pixelSize, unit: "nm" });
      expect(r.spectrum).toBeDefined();
      expect(r.spectrum!.unit).toBe("nm");
      expect(Math.abs(r.spectrum!.period! / 240 - 1)).toBeLessThan(0.03);
      const row = Object.fromEntries(frameRow(r));
      expect(row.period_nm).toBe(r.spectrum!.period);
      expect(typeof row.period_from_walls_nm).toBe("number");
    }
  });

  it("can be switched off, and then leaves no spectrum columns", () => {
    const sweep = demoSweep({ size: 64, frames: 1 });
    const r = analyzeFrame(sweep.frame(0), { threshold: 127.5, spectrum: "off" });
    expect(r.spectrum).toBeUndefined();
    expect(frameRow(r).some(([k]) => k.startsWith("period"))).toBe(false);
  });

  it("says why a frame too small for a ring has no period, instead of a NaN", () => {
    const r = analyzeFrame({ width: 4, height: 4, data: new Uint8Array(16).map((_, i) => i & 1) }, { threshold: 0.5 });
    expect(r.spectrum!.period).toBeUndefined();
    expect(r.spectrum!.reason).toMatch(/too small/);
    const row = Object.fromEntries(frameRow(r));
    expect(row.period_px).toBe("");
    expect(row.spectrum_note).toMatch(/too small/);
  });

  it("keeps the spectrum's pixel size and boundary in the frame options", () => {
    expect(() => analyzeFrame({ width: 8, height: 8, data: new Uint8Array(64) }, { spectrum: { pixelSize: 3 } as never }))
      .toThrow("options.spectrum.pixelSize: set it on the frame options (options.pixelSize)");
  });
});

describe("periods outside the search", () => {
  it("never reports a period beyond the searched range, saying why instead", async () => {
    const { hysteresisDemo } = await import("../src/demo/hysteresis");
    const demo = hysteresisDemo();
    let seen = 0, undefinedWithReason = 0;
    for (let k = 0; k < demo.frames.length; k += 7) {
      const f = demo.frame(k);
      const r = analyzeFrame(f, { threshold: 127.5, skeleton: "off" });
      const s = r.spectrum!;
      seen++;
      if (s.period === undefined) { expect(s.reason).toBeTruthy(); undefinedWithReason++; continue; }
      expect(s.period).toBeLessThanOrEqual(s.options.maxPeriodPx * s.options.pixelSize! + 1e-9);
      expect(s.period).toBeGreaterThanOrEqual(s.options.minPeriodPx * s.options.pixelSize! - 1e-9);
    }
    expect(seen).toBeGreaterThan(50);
    expect(undefinedWithReason).toBeGreaterThan(0);
  });
});
