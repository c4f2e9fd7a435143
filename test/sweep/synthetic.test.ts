import { describe, expect, it } from "vitest";
import { erfc, hysteronEnsemble, hysteronMajorLoop, tanhLoop, upperTail } from "../../src/sweep/synthetic";

describe("synthetic sweeps", () => {
  it("labels every sweep as synthetic", () => {
    expect(tanhLoop().synthetic).toBe(true);
    expect(hysteronMajorLoop(hysteronEnsemble()).synthetic).toBe(true);
  });

  it("samples the tanh loop from positive saturation down and back up", () => {
    const loop = tanhLoop({ fieldMax: 1, fieldStep: 0.5, turningRepeats: 2 });
    expect(loop.field).toEqual([1, 0.5, 0, -0.5, -1, -1, -0.5, 0, 0.5, 1]);
    expect(loop.magnetization[2]).toBeCloseTo(Math.tanh(1 / 0.5), 12);
    expect(loop.magnetization[7]).toBeCloseTo(-Math.tanh(1 / 0.5), 12);
  });

  it("computes erfc consistently on both sides of its switch at 2.5 and with d erf/dx = 2/sqrt(pi) exp(-x^2)", () => {
    // Series and continued fraction meet at x = 2.5 (Abramowitz & Stegun 7.1.6, 7.1.14).
    expect(erfc(2.5 - 1e-13)).toBeCloseTo(erfc(2.5), 14);
    expect(erfc(-0.7) + erfc(0.7)).toBeCloseTo(2, 15);
    for (const x of [0.3, 1, 2, 2.49, 2.51, 3.5]) {
      const h = 1e-5;
      const slope = -(erfc(x + h) - erfc(x - h)) / (2 * h);
      expect(slope / ((2 / Math.sqrt(Math.PI)) * Math.exp(-x * x))).toBeCloseTo(1, 7);
    }
    expect(upperTail(0)).toBe(0.5);
  });

  it("gives the hysteron ensemble a major loop symmetric under H -> -H, m -> -m when Hu is centred", () => {
    const model = hysteronEnsemble({ coercivityMean: 0.4, coercivitySpread: 0.08, interactionSpread: 0.15 });
    for (const h of [-0.6, -0.2, 0, 0.3, 0.7]) {
      expect(model.ascending(h)).toBeCloseTo(-model.descending(-h), 9);
      expect(model.magnetization(h, h)).toBe(model.descending(h));
    }
    expect(model.descending(2)).toBeCloseTo(1, 9);
    expect(model.ascending(-2)).toBeCloseTo(-1, 9);
  });

  it("lets a reversal curve start on the descending branch and end on the ascending one", () => {
    const model = hysteronEnsemble();
    expect(model.magnetization(-0.3, -0.3)).toBe(model.descending(-0.3));
    expect(model.magnetization(-0.3, 1.5)).toBeCloseTo(model.ascending(1.5), 9);
    expect(model.forcDensity(0.2, 0.1)).toBe(0);
  });
});
