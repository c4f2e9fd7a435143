import { describe, expect, it } from "vitest";
import { hysteresisDemo } from "../../src/demo/hysteresis";
import { createAnalyzer } from "../../src/topology/analyze";
import { loopMetrics } from "../../src/sweep/loop";
import { forcDistribution } from "../../src/sweep/forc";
import { excursion } from "../../src/sweep/excursions";
import { interpolateAt } from "../../src/sweep/interpolate";

// The demo model's own numbers (H0 = 10 mT median coercivity) are design values, not outside ones.
const demo = hysteresisDemo();
const m = demo.frames.map((_, k) => {
  const s = demo.state(k);
  let up = 0;
  for (let i = 0; i < s.length; i++) up += s[i]!;
  return (2 * up) / s.length - 1;
});
const rows = (pred: (segment: string) => boolean) => demo.frames.map((_, k) => k).filter((k) => pred(demo.frames[k]!.segment));
const desc = rows((s) => s === "major-descending");
const asc = rows((s) => s === "major-ascending");
const major = [...desc, ...asc];
const metrics = loopMetrics(major.map((k) => demo.frames[k]!.field), major.map((k) => m[k]!));
const curves = demo.reversalFields.map((ha) => {
  const ks = demo.frames.map((_, k) => k).filter((k) => demo.frames[k]!.reversalField === ha);
  return { reversalField: ha, field: ks.map((k) => demo.frames[k]!.field), values: ks.map((k) => m[k]!) };
});
const ascending = { field: asc.map((k) => demo.frames[k]!.field), values: asc.map((k) => m[k]!) };
const descending = { field: desc.map((k) => demo.frames[k]!.field).reverse(), values: desc.map((k) => m[k]!).reverse() };

describe("the hysteretic demo model", () => {
  it("says it is synthetic", () => {
    expect(demo.synthetic).toBe(true);
    expect(demo.scenario).toMatch(/^Synthetic/);
    expect(demo.scenario).toMatch(/not measurements/);
  });

  it("records a major loop of two branches and a family of reversal curves, cheaply sized", () => {
    expect(demo.width).toBe(128);
    expect(desc).toHaveLength(61);
    expect(asc).toHaveLength(60);
    expect(demo.reversalFields).toHaveLength(12);
    expect(demo.frames.length).toBeLessThan(800);
  });

  it("starts saturated up and reaches saturation down", () => {
    expect(m[desc[0]!]).toBe(1);
    expect(m[desc[desc.length - 1]!]).toBeLessThan(-0.99);
    expect(m[asc[asc.length - 1]!]).toBeGreaterThan(0.99);
  });

  it("remembers its history: at zero field the two branches have opposite magnetization", () => {
    const at0 = (ks: number[]) => m[ks.find((k) => demo.frames[k]!.field === 0)!]!;
    expect(at0(desc)).toBeGreaterThan(0.3);
    expect(at0(asc)).toBeLessThan(-0.3);
  });

  it("has a positive coercive field close to the coercivity it was built with", () => {
    expect(metrics.coerciveField.value).toBeGreaterThan(0);
    expect(Math.abs(metrics.coerciveField.value! - demo.model.coercivityScale)).toBeLessThan(2);
    expect(Math.abs(metrics.loopShift.value!)).toBeLessThan(1);
  });

  it("has a remanence between 0 and Ms", () => {
    const mr = metrics.remanence.value!, ms = metrics.saturation.value!;
    expect(mr).toBeGreaterThan(0);
    expect(mr).toBeLessThan(ms);
  });

  it("has a positive FORC density peak off the line Hb = Ha", () => {
    const forc = forcDistribution(curves, { smoothingFactor: 2, fieldStep: demo.fieldStep });
    let best = -Infinity, at = -1;
    forc.rho.forEach((v, k) => { if (v !== null && v > best) { best = v; at = k; } });
    expect(best).toBeGreaterThan(0);
    const nb = forc.fields.length;
    const ha = forc.reversalFields[Math.floor(at / nb)]!, hb = forc.fields[at % nb]!;
    // Square hysterons of coercivity Hk sit at Hc = (Hb - Ha)/2 = Hk; the peak is near H0.
    expect((hb - ha) / 2).toBeGreaterThan(demo.model.coercivityScale / 2);
    expect((hb - ha) / 2).toBeLessThan(demo.model.coercivityScale * 1.5);
  });

  it("has reversal curves that leave the descending branch and rejoin the ascending one", () => {
    let inner = 0;
    for (const c of curves) {
      const mDesc = interpolateAt(descending.field, descending.values, c.reversalField)!;
      expect(c.values[0]).toBeCloseTo(mDesc, 12); // each curve starts on the descending branch
      if (Math.abs(mDesc) > 0.95) continue; // curves from near saturation hardly leave it
      inner++;
      // A few steps up, the curve lies below the descending branch: it has left it.
      const hb = c.field[3]!;
      const left = interpolateAt(descending.field, descending.values, hb)! - c.values[3]!;
      expect(left).toBeGreaterThan(0.01);
      const e = excursion(c, ascending, { tolerance: 0.01 });
      expect(e.leaveField.value).toBe(c.reversalField);
      expect(e.rejoinField.value).toBeGreaterThan(c.reversalField);
      expect(e.rejoinField.value).toBeLessThan(demo.saturationField);
    }
    expect(inner).toBeGreaterThanOrEqual(8);
  });

  it("gives frames whose analyzed magnetization is the model's (the camera noise flips no pixel)", () => {
    const a = createAnalyzer(demo.width, demo.height);
    try {
      for (const k of [0, desc[30]!, asc[35]!, demo.frames.length - 20]) {
        const r = a.analyze(demo.frame(k), { threshold: demo.threshold });
        expect(r.magnetization).toBeCloseTo(m[k]!, 12);
      }
    } finally {
      a.dispose();
    }
  });

  it("forms domains, not salt and pepper: at the coercive field there are few domains per pixel", () => {
    const k = desc.find((j) => demo.frames[j]!.field === -10)!;
    const a = createAnalyzer(demo.width, demo.height);
    try {
      const r = a.analyze(demo.frame(k), { threshold: demo.threshold });
      expect(r.up.domains + r.down.domains).toBeGreaterThan(3);
      expect(r.up.domains + r.down.domains).toBeLessThan((demo.width * demo.height) / 100);
    } finally {
      a.dispose();
    }
  });
});
