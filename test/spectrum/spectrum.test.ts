// Spectrum analysis: bad input first, then stripe waves, sinusoids, a bubble lattice and a
// random-field maze with known answers, then units, workspace reuse and rendering.
import { describe, expect, it } from "vitest";
import {
  analyzeSpectrum, createSpectrumWorkspace, periodFromWallLength, powerSpectrum, renderSpectrum,
  structureTensor,
} from "../../src/spectrum";
import { hexBubbles, latticeStripes, mazeFrame, ringField, sinusoidFrame, stripeFrame } from "./patterns";

const angleGap = (a: number, b: number, period: number) => {
  const d = Math.abs(a - b) % period;
  return Math.min(d, period - d);
};

describe("analyzeSpectrum on bad input", () => {
  const frame = stripeFrame(64, 64, 8, 0);

  it("throws on a pixel size of zero, a negative or NaN one", () => {
    for (const pixelSize of [0, -1, NaN, Infinity]) {
      expect(() => analyzeSpectrum(frame, { pixelSize })).toThrow(/pixelSize must be a finite number > 0/);
    }
  });

  it("throws when the data length does not match width * height, saying both", () => {
    expect(() => analyzeSpectrum({ width: 10, height: 10, data: new Uint8Array(99) })).toThrow(
      /holds 99 samples, expected width \* height = 100/,
    );
  });

  it("throws on an unknown option value, naming the allowed ones", () => {
    expect(() => analyzeSpectrum(frame, { window: "hamming" as "hann" })).toThrow(/'hann', 'none'/);
  });

  it("answers a frame too small for a ring with period undefined and a reason", () => {
    const r = analyzeSpectrum({ width: 4, height: 64, data: new Uint8Array(256) });
    expect(r.period).toBeUndefined();
    expect(r.reason).toMatch(/too small/);
  });

  it("answers a uniform frame with period undefined and a reason, not NaN", () => {
    for (const data of [new Uint8Array(4096), new Uint8Array(4096).fill(1), new Float32Array(4096).fill(0.7)]) {
      const r = analyzeSpectrum({ width: 64, height: 64, data });
      expect(r.period).toBeUndefined();
      expect(r.reason).toMatch(/uniform/);
      expect(r.order2).toBeUndefined();
    }
  });

  it("answers a frame holding NaN with a reason", () => {
    const data = new Float32Array(4096).fill(1);
    data[77] = NaN;
    const r = analyzeSpectrum({ width: 64, height: 64, data });
    expect(r.period).toBeUndefined();
    expect(r.reason).toMatch(/NaN/);
  });

  it("refuses a workspace below 8 px a side, and frames of another shape", () => {
    expect(() => createSpectrumWorkspace(7, 64)).toThrow(/at least 8 px/);
    const ws = createSpectrumWorkspace(32, 32);
    expect(() => ws.analyze(frame)).toThrow(/32 x 32 frames, got 64 x 64/);
    ws.dispose();
  });
});

describe("stripe waves", () => {
  it("puts the harmonics of a +-1 stripe wave of up-fraction f at P2/P1 = cos^2(pi f), P3/P1 = 1/9 at f = 1/2", () => {
    // Fourier amplitudes of a rectangular wave ~ sin(n pi f) / n (CHECKS.md "Spectrum").
    // Sampled on pixels with period P = 64 the discrete amplitudes are sin(n pi f) / sin(n pi / P),
    // which moves P2/P1 by 1/cos^2(pi/64) (+0.24%) and P3/P1 by 0.6%: tolerances allow for it.
    const w = 256, k = 4; // period 64 px, periodic
    for (const f of [0.25, 0.375, 0.5, 0.625]) {
      const s = powerSpectrum(latticeStripes(w, w, k, 0, f), { boundary: "periodic" });
      const at = (n: number) => s.power[s.centerY * w + s.centerX + n * k]!;
      const p1 = at(1);
      expect(at(2) / p1).toBeCloseTo(Math.cos(Math.PI * f) ** 2, 2);
      if (f === 0.5) {
        expect(Math.abs((at(3) / p1) * 9 - 1)).toBeLessThan(0.01);
        // the exact discrete ratio (sin(pi / 64) / sin(3 pi / 64))^2
        expect(at(3) / p1).toBeCloseTo((Math.sin(Math.PI / 64) / Math.sin((3 * Math.PI) / 64)) ** 2, 5);
      }
    }
  });

  it("finds the angle of stripes within 1 degree and order2 near 1 at several angles", () => {
    for (const angle of [0, 17, 30, 45, 72, 90, 135, 160]) {
      const r = analyzeSpectrum(stripeFrame(256, 256, 12.5, angle));
      expect(angleGap(r.order2AngleDeg!, angle, 180)).toBeLessThan(1);
      expect(r.order2!).toBeGreaterThan(0.99);
      expect(Math.abs(r.period! / 12.5 - 1)).toBeLessThan(0.015);
    }
  });

  it("finds the same period for stripes of different duty cycles", () => {
    for (const duty of [0.3, 0.5, 0.7]) {
      const r = analyzeSpectrum(latticeStripes(240, 240, 15, 0, duty), { boundary: "periodic" });
      expect(r.period).toBeCloseTo(16, 9);
      expect(r.order2).toBeCloseTo(1, 6);
    }
  });

  it("gives the structure tensor's orientation as a second estimate", () => {
    const r = analyzeSpectrum(stripeFrame(256, 256, 12.5, 30), { structureTensor: "local" });
    expect(angleGap(r.structure!.angleDeg!, 30, 180)).toBeLessThan(2);
    expect(r.structure!.order2!).toBeGreaterThan(0.85);
    expect(r.structure!.meanCoherence!).toBeGreaterThan(0.8);
  });
});

describe("sinusoids", () => {
  it("gives the exact period of a sinusoid that fits the periodic frame", () => {
    const axis = analyzeSpectrum(sinusoidFrame(256, 256, 16, 0), { boundary: "periodic" });
    expect(axis.period).toBeCloseTo(16, 9);
    // wavevector (12, 16) cycles per frame: |q| = 20 / 256
    const oblique = analyzeSpectrum(latticeStripes(256, 256, 12, 16), { boundary: "periodic", signal: "binary" });
    expect(oblique.period).toBeCloseTo(12.8, 9);
    expect(oblique.order2AngleDeg!).toBeCloseTo((Math.atan2(16, 12) * 180) / Math.PI, 6);
  });

  it("finds a sinusoid's period on an open, windowed frame within 2%", () => {
    const r = analyzeSpectrum(sinusoidFrame(256, 256, 10.7, 20));
    expect(r.options.window).toBe("hann");
    expect(Math.abs(r.period! / 10.7 - 1)).toBeLessThan(0.02);
    expect(angleGap(r.order2AngleDeg!, 20, 180)).toBeLessThan(1);
  });

  it("flags the correlation length of a perfect wave as not resolved by the frame", () => {
    const r = analyzeSpectrum(sinusoidFrame(256, 256, 16, 0), { boundary: "periodic" });
    expect(r.corrLengthResolved).toBe(false);
  });
});

describe("hexagonal bubble lattice", () => {
  it("puts the first ring at q = 2 / (sqrt(3) a) with six-fold order near 1", () => {
    // first reciprocal shell of a triangular lattice of spacing a (CHECKS.md "Spectrum")
    const a = 16;
    const r = analyzeSpectrum(hexBubbles(512, 512, a, 5));
    expect(Math.abs(r.peakQ! / (2 / (Math.sqrt(3) * a)) - 1)).toBeLessThan(0.01);
    expect(r.order6!).toBeGreaterThan(0.95);
    expect(r.order2!).toBeLessThan(0.15);
    // one lattice vector along x puts the reciprocal vectors at 30 + 60 n degrees
    expect(angleGap(r.order6AngleDeg!, 30, 60)).toBeLessThan(1);
  });
});

describe("random-field maze", () => {
  it("finds the design period of a thresholded ring-spectrum Gaussian field within 3%", () => {
    // design value: the field's power ring peaks at q0 = 1 / 16 px (generated in patterns.ts)
    for (const seed of [1, 2]) {
      const r = analyzeSpectrum(mazeFrame(512, 512, 16, 0.15, seed), { boundary: "periodic" });
      expect(Math.abs(r.period! / 16 - 1)).toBeLessThan(0.03);
      expect(r.order2!).toBeLessThan(0.1);
      expect(r.corrLengthResolved).toBe(true);
    }
  });

  it("measures the ring width of the field itself as xi = 1 / (2 pi HWHM)", () => {
    // power ring exp(-(q - q0)^2 / (2 s^2)) has HWHM s sqrt(2 ln 2) in q
    const s = 0.15 / 16;
    const field = { width: 512, height: 512, data: ringField(512, 512, 16, 0.15, 3) };
    const r = analyzeSpectrum(field, { boundary: "periodic" });
    expect(r.ringHalfWidthQ! / (s * Math.sqrt(2 * Math.LN2))).toBeGreaterThan(0.85);
    expect(r.ringHalfWidthQ! / (s * Math.sqrt(2 * Math.LN2))).toBeLessThan(1.15);
    expect(r.corrLength).toBeCloseTo(1 / (2 * Math.PI * r.ringHalfWidthQ!), 9);
  });
});

describe("profiles, units and workspaces", () => {
  it("normalises the annulus integral so that it integrates to the variance", () => {
    const frame = mazeFrame(128, 96, 10, 0.2, 4);
    const r = analyzeSpectrum(frame, { boundary: "periodic" });
    const total = r.profile.annulusIntegral.reduce((s, v) => s + v, 0) * r.profile.binWidth;
    expect(total / r.variance!).toBeCloseTo(1, 4);
    expect(r.profile.q.length).toBe(r.profile.annulusMean.length);
  });

  it("reports lengths in the unit of the pixel size", () => {
    const px = analyzeSpectrum(sinusoidFrame(128, 128, 16, 0), { boundary: "periodic" });
    const nm = analyzeSpectrum(sinusoidFrame(128, 128, 16, 0), { boundary: "periodic", pixelSize: 12.5, lengthUnit: "nm" });
    expect(nm.unit).toBe("nm");
    expect(nm.period).toBeCloseTo(px.period! * 12.5, 9);
    expect(nm.peakQ).toBeCloseTo(px.peakQ! / 12.5, 12);
    expect(nm.options.pixelSize).toBe(12.5);
  });

  it("gives the same results from a reused workspace as from one-shot calls", () => {
    const ws = createSpectrumWorkspace(128, 128);
    for (const seed of [5, 6, 7]) {
      const frame = mazeFrame(128, 128, 12, 0.2, seed);
      const a = ws.analyze(frame, { boundary: "periodic" });
      const b = analyzeSpectrum(frame, { boundary: "periodic" });
      expect(a.period).toBe(b.period);
      expect(a.order2).toBe(b.order2);
    }
    ws.dispose();
    expect(() => ws.analyze(mazeFrame(128, 128, 12, 0.2, 1))).toThrow(/disposed/);
  });

  it("renders the log spectrum with the ring marked, as raw RGBA or grey pixels", () => {
    const frame = stripeFrame(64, 48, 8, 0);
    const r = analyzeSpectrum(frame);
    const s = powerSpectrum(frame);
    const img = renderSpectrum(s, { peakQ: r.peakQ! });
    expect([img.width, img.height, img.channels, img.data.length]).toEqual([64, 48, 4, 64 * 48 * 4]);
    // the ring crosses the +x axis at q* (8 px period: 8 columns right of the centre)
    const o = 4 * (s.centerY * 64 + s.centerX + 8);
    expect([img.data[o], img.data[o + 1], img.data[o + 3]]).toEqual([255, 40, 255]);
    const grey = renderSpectrum(s, { format: "grey" });
    expect(grey.data.length).toBe(64 * 48);
    expect(Math.max(...grey.data)).toBe(255);
  });
});

describe("periodFromWallLength", () => {
  it("returns 2 / L_A for stripes (two walls per period)", () => {
    // straight stripes of period 16 px have 2 walls of length H per 16 columns: L_A = 2 / 16
    expect(periodFromWallLength(2 / 16)).toBe(16);
    expect(periodFromWallLength(0)).toBeUndefined();
    expect(() => periodFromWallLength(NaN)).toThrow(/finite/);
  });
});

describe("structureTensor", () => {
  it("returns local orientation and coherence fields of the frame's size", () => {
    const st = structureTensor(stripeFrame(96, 64, 10, 60), { sigmaPx: 3 });
    expect(st.orientationDeg!.length).toBe(96 * 64);
    expect(angleGap(st.angleDeg!, 60, 180)).toBeLessThan(2);
    expect(st.meanCoherence!).toBeGreaterThan(0.8);
  });
});
