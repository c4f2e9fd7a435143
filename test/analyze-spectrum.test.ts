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
