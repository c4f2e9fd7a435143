// The table-driven reductions against the direct computation they replace: the annulus-slot
// profile against the radius-per-point kernel, the Wasm structure-tensor sums against the
// TypeScript stencil, and whole analyses on both reduction paths, on odd and even sizes.
import { describe, expect, it } from "vitest";
import { SpectrumKernels } from "../../src/wasm/fft";
import { analyzeSpectrum, createSpectrumWorkspace, structureTensor } from "../../src/spectrum";
import { tensorOrder } from "../../src/spectrum/structure-tensor";
import { createReferenceSpectrumWorkspace } from "../../src/spectrum/workspace";
import { hannWindow } from "../../src/spectrum/window";
import { hexBubbles, mazeFrame, sinusoidFrame, stripeFrame } from "./patterns";
import { seeded } from "./dft";

/** Largest |a - b| relative to the largest |b|. */
function relErr(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let err = 0, scale = 0;
  for (let i = 0; i < b.length; i++) {
    err = Math.max(err, Math.abs(a[i]! - b[i]!));
    scale = Math.max(scale, Math.abs(b[i]!));
  }
  return scale > 0 ? err / scale : err;
}

function noiseFrame(w: number, h: number, seed: number): Float32Array {
  const rnd = seeded(seed);
  return Float32Array.from({ length: w * h }, () => rnd() * 2 - 1);
}

/** Loads, windows and transforms `data` in fresh kernels; the caller disposes them. */
function transformed(w: number, h: number, data: Float32Array): SpectrumKernels {
  const k = new SpectrumKernels(w, h);
  k.setWindow(hannWindow(w), hannWindow(h));
  k.load(data, "grey");
  k.prepare();
  k.forward();
  return k;
}

describe("the annulus-slot profile", () => {
  const shapes = [[8, 8], [9, 9], [16, 9], [9, 16], [31, 30], [64, 63], [97, 131], [128, 96], [250, 17], [1000, 6]] as const;

  it("gives the direct kernel's annulus sums to float precision, and the same weights, on odd and even sizes", () => {
    for (const [w, h] of shapes) {
      const k = transformed(w, h, noiseFrame(w, h, w * 7 + h));
      const side = Math.max(w, h), bins = Math.ceil(side * Math.SQRT1_2) + 2;
      const direct = k.radial(bins, side / w, side / h);
      const table = k.profile(bins, side / w, side / h);
      expect(relErr(table.sums, direct.sums)).toBeLessThan(1e-12);
      expect(Array.from(table.counts)).toEqual(Array.from(direct.counts));
      expect(table.outside).toBe(direct.outside);
      k.dispose();
    }
  });

  it("keeps points beyond the last bin out of the sums and counts them as outside", () => {
    const w = 40, h = 33;
    const k = transformed(w, h, noiseFrame(w, h, 3));
    for (const bins of [1, 5, 17]) {
      const direct = k.radial(bins, 1, 1);
      const table = k.profile(bins, 1, 1);
      expect(relErr(table.sums, direct.sums)).toBeLessThan(1e-12);
      expect(Array.from(table.counts)).toEqual(Array.from(direct.counts));
      expect(table.outside).toBe(direct.outside);
      expect(table.outside).toBeGreaterThan(0);
    }
    k.dispose();
  });

  it("falls back to the direct kernel when the bins do not fit u16 slots", () => {
    // 50000 x 8: 35357 bins, above the 32767 a u16 table holds
    const w = 50000, h = 8;
    const k = transformed(w, h, noiseFrame(w, h, 9));
    const bins = Math.ceil(w * Math.SQRT1_2) + 2;
    const direct = k.radial(bins, 1, w / h);
    const table = k.profile(bins, 1, w / h);
    expect(Array.from(table.sums)).toEqual(Array.from(direct.sums));
    expect(table.outside).toBe(direct.outside);
    k.dispose();
  });

  it("counts every spectrum point once: weights plus outside make width * height", () => {
    for (const [w, h] of shapes) {
      const k = transformed(w, h, noiseFrame(w, h, 1));
      const table = k.profile(6, 1, 1);
      const total = table.counts.reduce((s, v) => s + v, 0) + table.outside;
      // the kept half with weights 1 (ky = 0, ky = H/2) and 2 stands for all w * h points
      expect(total).toBe(w * h);
      k.dispose();
    }
  });

  it("gives the first frame, summed while the table is built, the very numbers of the sweep", () => {
    for (const [w, h] of [[33, 20], [64, 63], [128, 96]] as const) {
      const k = transformed(w, h, noiseFrame(w, h, 11));
      const first = k.profile(50, 1, 1).sums;
      const again = k.profile(50, 1, 1).sums;
      expect(Array.from(again)).toEqual(Array.from(first));
      k.dispose();
    }
  });

  it("reuses its table for new frames of the shape and rebuilds it for new bins", () => {
    const w = 48, h = 37;
    const k = new SpectrumKernels(w, h);
    k.setWindow(hannWindow(w), hannWindow(h));
    for (const [seed, bins] of [[1, 36], [2, 36], [3, 20], [4, 36]] as const) {
      k.load(noiseFrame(w, h, seed), "grey");
      k.prepare();
      k.forward();
      const direct = k.radial(bins, 1, 48 / 37);
      const table = k.profile(bins, 1, 48 / 37);
      expect(relErr(table.sums, direct.sums)).toBeLessThan(1e-12);
    }
    k.dispose();
  });
});

describe("the Wasm structure-tensor sums", () => {
  it("equal the TypeScript stencil's global order exactly on phase maps, open and periodic", () => {
    for (const [w, h] of [[3, 3], [5, 4], [9, 7], [17, 16], [64, 63]] as const) {
      const rnd = seeded(w * h);
      const data = Uint8Array.from({ length: w * h }, () => (rnd() < 0.4 ? 1 : 0));
      for (const boundary of ["open", "periodic"] as const) {
        const ts = structureTensor({ width: w, height: h, data }, { output: "global", boundary });
        const k = new SpectrumKernels(w, h);
        k.load(data, "binary");
        const [sxx, syy, sxy] = k.structureSums(boundary);
        // +-1 samples give gradients in 1/32 steps: both sums are exact
        expect(tensorOrder(sxx, syy, sxy)).toEqual({ order2: ts.order2, angleDeg: ts.angleDeg });
        k.dispose();
      }
    }
  });

  it("wraps the smallest periodic frames and gives no interior to open ones below 3 px", () => {
    for (const [w, h] of [[1, 1], [1, 5], [2, 3], [6, 1]] as const) {
      const data = Uint8Array.from({ length: w * h }, (_, i) => (i * 7) % 3 === 0 ? 1 : 0);
      const ts = structureTensor({ width: w, height: h, data }, { output: "global", boundary: "periodic" });
      const k = new SpectrumKernels(w, h);
      k.load(data, "binary");
      const [sxx, syy, sxy] = k.structureSums("periodic");
      expect(tensorOrder(sxx, syy, sxy)).toEqual({ order2: ts.order2, angleDeg: ts.angleDeg });
      expect(k.structureSums("open")).toEqual([0, 0, 0]);
      k.dispose();
    }
  });

  it("agrees with the TypeScript stencil on grey samples to float precision", () => {
    const f = sinusoidFrame(75, 61, 9.5, 33);
    for (const boundary of ["open", "periodic"] as const) {
      const ts = structureTensor(f, { output: "global", boundary });
      const k = new SpectrumKernels(75, 61);
      k.load(f.data, "grey");
      const [sxx, syy, sxy] = k.structureSums(boundary);
      // the kernel sums in f32 lanes per row, the TypeScript stencil in f64
      const o = tensorOrder(sxx, syy, sxy);
      expect(o.order2).toBeCloseTo(ts.order2!, 6);
      expect(o.angleDeg).toBeCloseTo(ts.angleDeg!, 4);
      k.dispose();
    }
  });
});

describe("analyses on the table and direct reduction paths", () => {
  const frames = [
    mazeFrame(128, 96, 10, 0.2, 4),
    mazeFrame(101, 99, 9, 0.2, 5),
    stripeFrame(90, 77, 8.5, 25),
    hexBubbles(128, 128, 16, 5),
    sinusoidFrame(64, 65, 7, 60),
  ];

  it("give the same profile, period, ring width and order to float precision", () => {
    for (const frame of frames) {
      for (const options of [{}, { boundary: "periodic" as const }, { structureTensor: "off" as const }]) {
        const ref = createReferenceSpectrumWorkspace(frame.width, frame.height);
        const ws = createSpectrumWorkspace(frame.width, frame.height);
        const a = ws.analyze(frame, options), b = ref.analyze(frame, options);
        expect(relErr(a.profile.annulusMean, b.profile.annulusMean)).toBeLessThan(1e-12);
        expect(relErr(a.profile.annulusIntegral, b.profile.annulusIntegral)).toBeLessThan(1e-12);
        expect(a.profile.points).toEqual(b.profile.points);
        expect(a.period).toBeCloseTo(b.period!, 9);
        expect(a.ringHalfWidthQ).toBeCloseTo(b.ringHalfWidthQ!, 9);
        expect(a.order2).toBeCloseTo(b.order2!, 9);
        expect(a.order6).toBeCloseTo(b.order6!, 9);
        if (frame.data instanceof Uint8Array) {
          // phase maps: the tensor sums are exact on both paths
          expect(a.structure).toEqual(b.structure);
        } else if (b.structure) {
          expect(a.structure!.order2).toBeCloseTo(b.structure.order2!, 6);
          expect(a.structure!.angleDeg).toBeCloseTo(b.structure.angleDeg!, 4);
        }
        ws.dispose(); ref.dispose();
      }
    }
  });

  it("computes the local structure tensor the same way on both paths", () => {
    const frame = stripeFrame(64, 64, 10, 30);
    const a = analyzeSpectrum(frame, { structureTensor: "local" });
    const ref = createReferenceSpectrumWorkspace(64, 64);
    const b = ref.analyze(frame, { structureTensor: "local" });
    expect(a.structure).toEqual(b.structure);
    ref.dispose();
  });
});
