import { describe, expect, it } from "vitest";
import { type ForcDistribution, forcDistribution, forcFromSweep } from "../../src/sweep/forc";
import type { ReversalCurve } from "../../src/sweep/reversal-curves";
import { hysteronEnsemble, hysteronReversalCurves, hysteronSweep } from "../../src/sweep/synthetic";

/** Curves sampled from a surface M(Ha, Hb) on Hb = Ha, Ha + step, ... up to hbMax. */
function curvesOf(surface: (ha: number, hb: number) => number, has: number[], step: number, hbMax: number): ReversalCurve[] {
  return has.map((ha) => {
    const field: number[] = [];
    for (let j = 0; ha + j * step <= hbMax + 1e-9; j++) field.push(ha + j * step);
    return { reversalField: ha, field, values: field.map((hb) => surface(ha, hb)) };
  });
}

describe("forcDistribution on hand surfaces", () => {
  it("returns rho = -a6/2 exactly for a quadratic surface, even at unevenly spaced reversal fields", () => {
    // M = 3 + Ha - 2 Ha^2 + 0.5 Hb + Hb^2 + 4 Ha Hb: d2M/dHa dHb = 4, so rho = -2 (definition,
    // Pike et al. 1999), and the second-order fit reproduces a quadratic exactly.
    const surface = (a: number, b: number) => 3 + a - 2 * a * a + 0.5 * b + b * b + 4 * a * b;
    const has = [-1, -0.9, -0.75, -0.7, -0.55, -0.5, -0.35, -0.3, -0.2, -0.1];
    const f = forcDistribution(curvesOf(surface, has, 0.1, 1), { smoothingFactor: 2, fieldStep: 0.1 });
    const defined = f.rho.filter((r): r is number => r !== null);
    expect(defined.length).toBeGreaterThan(20);
    for (const r of defined) expect(r).toBeCloseTo(-2, 8);
  });

  it("marks every point as ok, not measured or with an incomplete window, and counts them", () => {
    const f = forcDistribution(curvesOf((a, b) => a * b, [0, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6], 0.1, 1), { smoothingFactor: 1 });
    expect(f.counts.ok + f.counts.notMeasured + f.counts.incompleteWindow).toBe(f.rho.length);
    f.rho.forEach((r, k) => expect(r === null).toBe(f.status[k] !== "ok"));
    // Hb < Ha is outside every curve: row Ha = 0.3, column Hb = 0.1.
    const nb = f.fields.length;
    expect(f.status[3 * nb + 1]).toBe("not-measured");
    // Hb = Ha has a measured value, but its window reaches below the diagonal.
    expect(f.status[3 * nb + 3]).toBe("incomplete-window");
    expect(f.status[3 * nb + 5]).toBe("ok");
    expect(f.rho.some((r) => r !== null && Number.isNaN(r))).toBe(false);
  });

  it("extends each curve below its reversal field with its reversal value when asked", () => {
    const curves = curvesOf((a, b) => a * b + b, [0, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6], 0.1, 1);
    const measured = forcDistribution(curves, { smoothingFactor: 1 });
    const extended = forcDistribution(curves, { smoothingFactor: 1, region: "extended" });
    expect(extended.counts.ok).toBeGreaterThan(measured.counts.ok);
    const nb = extended.fields.length;
    // Row Ha = 0.5, column Hb = 0.1: M is the reversal value M(0.5, 0.5) = 0.75.
    expect(extended.magnetization[5 * nb + 1]).toBeCloseTo(0.75, 12);
    expect(measured.magnetization[5 * nb + 1]).toBeNull();
    expect(extended.options.region).toBe("extended");
  });

  it("explains that curves too short for the chosen SF leave no point with a complete window", () => {
    const curves = curvesOf((a, b) => a * b, [0, 0.1, 0.2], 0.1, 0.4);
    expect(() => forcDistribution(curves, { smoothingFactor: 2 })).toThrow(
      /no grid point has a complete \(2 SF \+ 1\)\^2 = 25-point window at SF = 2: that needs 5 curves .* got 3 curves/,
    );
  });

  it("rejects malformed curves with what was expected and what arrived", () => {
    const good = { reversalField: 0, field: [0, 1], values: [0, 0] };
    expect(() => forcDistribution([])).toThrow(/at least one reversal curve, got none/);
    expect(() => forcDistribution([good, { ...good }])).toThrow(/one curve per reversal field, got curves 0 and 1 both at Ha = 0/);
    expect(() => forcDistribution([good, { reversalField: 0.5, field: [0.4, 1], values: [0, 0] }])).toThrow(
      /curve 1: expected Hb >= Ha = 0.5, got Hb = 0.4/,
    );
    expect(() => forcDistribution([good, { reversalField: 0.5, field: [0.5, 1], values: [0] }])).toThrow(/equal length, got 2 and 1/);
    expect(() => forcDistribution([good, { reversalField: 0.5, field: [0.5, 1, 0.9], values: [0, 0, 0] }])).toThrow(
      /expected Hb ascending, got 0.9 at sample 2/,
    );
    expect(() => forcDistribution([good], { smoothingFactor: 0 })).toThrow(/integer smoothingFactor >= 1, got 0/);
  });
});

describe("forcDistribution of a hysteron ensemble with Gaussian p_c and p_u", () => {
  // CHECKS.md "Loops and FORC": independent square hysterons with Gaussian p_c(Hc), p_u(Hu) have
  // rho = (Ms/2) p_c p_u (Pike, Roberts & Verosub 1999). Synthetic data with a known answer.
  const model = hysteronEnsemble({ saturation: 1, coercivityMean: 0.5, coercivitySpread: 0.1, interactionMean: 0, interactionSpread: 0.1 });
  const peak = 0.5 / (2 * Math.PI * 0.1 * 0.1); // (Ms/2) p_c(mean) p_u(mean)
  const fine = hysteronReversalCurves(model, { fieldStep: 0.02 });
  const coarse = hysteronReversalCurves(model, { fieldStep: 0.04 });

  /** Largest |rho - (Ms/2) p_c p_u| over the defined points, relative to the peak. */
  const worstError = (f: ForcDistribution) => {
    const nb = f.fields.length;
    let worst = 0;
    f.rho.forEach((r, k) => {
      if (r === null) return;
      const exact = model.forcDensity(f.reversalFields[Math.floor(k / nb)], f.fields[k % nb]);
      worst = Math.max(worst, Math.abs(r - exact));
    });
    return worst / peak;
  };

  it("matches (Ms/2) p_c p_u within 1% of the peak at SF = 1, dH = 0.02 (SF dH / sigma = 0.2)", () => {
    const f = forcDistribution(fine, { smoothingFactor: 1 });
    expect(worstError(f)).toBeLessThan(0.01);
    expect(f.counts.ok).toBeGreaterThan(5000);
  });

  it("shows the SF bias growing with SF dH / sigma, for SF and for the grid step", () => {
    // CHECKS.md: the SF bias grows with SF dH / sigma. SF dH / sigma = 0.2, 0.4, 0.8 at dH = 0.02.
    const e1 = worstError(forcDistribution(fine, { smoothingFactor: 1 }));
    const e2 = worstError(forcDistribution(fine, { smoothingFactor: 2 }));
    const e4 = worstError(forcDistribution(fine, { smoothingFactor: 4 }));
    expect(e1).toBeLessThan(e2);
    expect(e2).toBeLessThan(e4);
    // The bias of a second-order fit scales about as (SF dH / sigma)^2: doubling SF more than doubles it.
    expect(e4 / e2).toBeGreaterThan(2);
    // Same SF = 2, coarser grid dH = 0.04 (SF dH / sigma = 0.8): larger than at dH = 0.02.
    const e2coarse = worstError(forcDistribution(coarse, { smoothingFactor: 2 }));
    expect(e2).toBeLessThan(e2coarse);
  });

  it("puts the peak of the (Hc, Hu) map at the mean coercivity and interaction, at height (Ms/2) p_c p_u", () => {
    const f = forcDistribution(fine, { smoothingFactor: 1 });
    const map = f.coercivityInteraction;
    let best = 0;
    map.rho.forEach((r, k) => {
      if (r !== null && r > (map.rho[best] ?? -Infinity)) best = k;
    });
    const nc = map.coercivity.length;
    expect(map.coercivity[best % nc]).toBeCloseTo(0.5, 6);
    expect(map.interaction[Math.floor(best / nc)]).toBeCloseTo(0, 6);
    expect(Math.abs((map.rho[best] as number) / peak - 1)).toBeLessThan(0.01);
    // On a map grid off the (Ha, Hb) nodes (step 0.015), bilinear resampling still follows the
    // model: worst error 1.5% of the peak (the 1% above plus interpolation, about h^2/8 rho'').
    const off = forcDistribution(fine, { smoothingFactor: 1, coordinateStep: 0.015 }).coercivityInteraction;
    const nc2 = off.coercivity.length;
    let worst = 0;
    let defined = 0;
    off.rho.forEach((r, k) => {
      if (r === null) return;
      const hc = off.coercivity[k % nc2];
      const hu = off.interaction[Math.floor(k / nc2)];
      worst = Math.max(worst, Math.abs(r - model.forcDensity(hu - hc, hu + hc)));
      defined++;
    });
    expect(defined).toBeGreaterThan(1000);
    expect(worst / peak).toBeLessThan(0.015);
  });

  it("gives the same distribution from the per-frame sweep as from its reversal curves", () => {
    const family = { fieldStep: 0.04 };
    const sweep = hysteronSweep(model, family);
    const fromSweep = forcFromSweep(sweep.field, sweep.magnetization, { smoothingFactor: 2 });
    const fromCurves = forcDistribution(hysteronReversalCurves(model, family), { smoothingFactor: 2 });
    expect(fromSweep.curves).toBe(fromCurves.reversalFields.length);
    expect(fromSweep.reversalFields).toEqual(fromCurves.reversalFields);
    expect(fromSweep.rho).toEqual(fromCurves.rho);
  });

  it("keeps rho at 0 below the diagonal of the extended region, where M does not depend on Hb", () => {
    const f = forcDistribution(coarse, { smoothingFactor: 2, region: "extended" });
    const nb = f.fields.length;
    let checked = 0;
    f.rho.forEach((r, k) => {
      const ha = f.reversalFields[Math.floor(k / nb)];
      const hb = f.fields[k % nb];
      if (r === null || hb > ha - 3 * 0.04) return;
      expect(Math.abs(r)).toBeLessThan(1e-9 * peak);
      checked++;
    });
    expect(checked).toBeGreaterThan(100);
  });
});
