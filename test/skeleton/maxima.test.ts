import { describe, it, expect } from "vitest";
import { LabelingWorkspace } from "../../src/wasm/labeling";
import { SkeletonWorkspace } from "../../src/wasm/skeleton";
import { createAnalyzer } from "../../src/topology/analyze";
import { analyzeSkeletons } from "../../src/topology/skeleton-analysis";
import { noiseFrame } from "./helpers";

// The largest distance of each domain read only at pixels without a larger 4-neighbour
// (domainMaximaAt) against the maximum over every pixel of the domain (domainTotalsAt), on the
// same labels and distance map.
describe("largest distance per domain from the candidate pixels", () => {
  it("equals the maximum over all pixels on random frames, open and periodic, both fixed rules, thin and one-pixel frames", () => {
    const sizes: Array<[number, number]> = [[1, 1], [1, 9], [9, 1], [2, 7], [7, 2], [3, 3], [5, 4], [17, 13], [40, 31], [64, 64], [97, 53]];
    let frames = 0, domains = 0;
    for (const [w, h] of sizes) {
      for (let s = 0; s < 12; s++) {
        const px = s % 4 === 1 || s % 4 === 3, py = s % 4 >= 2;
        const rule = (s >> 2) % 2 as 0 | 1;
        const phase = noiseFrame(w, h, 700 + 31 * s + w * h, 1 + (s % 3), 2, 0.2 + 0.6 * ((s * 7) % 9) / 8);
        if (s === 11) phase.fill(1); // one phase: every distance is the cap
        const lab = new LabelingWorkspace(w, h);
        lab.loadPhase(phase);
        const count = lab.label(rule, px, py);
        const sk = new SkeletonWorkspace(w, h);
        sk.run(phase, { periodicX: px, periodicY: py, rule });
        const at = lab.labels().byteOffset;
        const area = new Float64Array(count), all = new Float64Array(count), dp = new Uint8Array(count);
        expect(sk.domainTotalsAt(at, count, area, all, dp)).toBe(-1);
        const some = new Float64Array(count).fill(-1);
        expect(sk.domainMaximaAt(at, count, some)).toBe(-1);
        expect(Array.from(some), `${w} x ${h} seed ${s} px ${px} py ${py} rule ${rule}`).toEqual(Array.from(all));
        frames++; domains += count;
        sk.dispose(); lab.dispose();
      }
    }
    expect(frames).toBe(sizes.length * 12);
    expect(domains).toBeGreaterThan(1000);
  });

  it("names a pixel it reads whose label is outside 1..count", () => {
    const w = 12, h = 10;
    const phase = noiseFrame(w, h, 5, 1, 2, 0.5);
    const lab = new LabelingWorkspace(w, h);
    lab.loadPhase(phase);
    const count = lab.label(0, false, false);
    const sk = new SkeletonWorkspace(w, h);
    sk.run(phase, { periodicX: false, periodicY: false, rule: 0 });
    lab.labels()[0] = count + 1; // a rim pixel: always read
    expect(sk.domainMaximaAt(lab.labels().byteOffset, count, new Float64Array(count))).toBe(0);
    sk.dispose(); lab.dispose();
  });

  it("gives the frame analysis the same skeleton columns as labels handed over as plain arrays, under all three rules", () => {
    for (const connectivity of [8, 4, "saddle"] as const) {
      for (const boundary of ["open", "periodic"] as const) {
        const w = 80, h = 72;
        const phase = noiseFrame(w, h, 91, 2, 3, 0.45);
        const data = new Uint8Array(w * h);
        for (let i = 0; i < data.length; i++) data[i] = phase[i] ? 180 + (i % 7) : 60 + (i % 5);
        const fa = createAnalyzer(w, h);
        const res = fa.analyze({ width: w, height: h, data }, { threshold: 120, boundary, connectivity, minDomainArea: 3 });
        // (the saddle decisions of the frame, from the analyzer's labeling workspace)
        const quads = connectivity === "saddle" ? (fa as unknown as { ws: LabelingWorkspace }).ws.quads()!.slice() : undefined;
        const plain = analyzeSkeletons(
          { width: w, height: h, phase: fa.phase().slice(), labels: fa.labels().slice(), count: res.domains.count },
          { boundary, connectivity, ...(quads ? { quads } : {}) },
        );
        const got = res.skeleton!.columns;
        expect(Array.from(got.aspect), `${connectivity} ${boundary}`).toEqual(Array.from(plain.columns.aspect));
        expect(Array.from(got.kind)).toEqual(Array.from(plain.columns.kind));
        expect(res.skeleton!.up).toEqual(plain.up);
        expect(res.skeleton!.down).toEqual(plain.down);
        fa.dispose();
      }
    }
  });
});
