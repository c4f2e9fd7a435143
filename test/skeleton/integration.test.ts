import { describe, it, expect } from "vitest";
import { createAnalyzer } from "../../src/topology/analyze";
import { analyzeSkeletons } from "../../src/topology/skeleton-analysis";
import { noiseFrame } from "./helpers";

describe("with the labeling layer", () => {
  it("takes FrameAnalyzer's phase and label views directly", () => {
    const w = 96, h = 80;
    const phase = noiseFrame(w, h, 21, 3, 3, 0.5);
    const data = new Uint8Array(w * h);
    for (let i = 0; i < data.length; i++) data[i] = phase[i] ? 200 : 50;
    const fa = createAnalyzer(w, h);
    const res = fa.analyze({ width: w, height: h, data }, { threshold: 128, boundary: "periodic" });
    const sk = analyzeSkeletons({ width: w, height: h, phase: fa.phase(), labels: fa.labels(), count: res.domains.count }, { boundary: "periodic" });
    expect(sk.columns.count).toBe(res.domains.count);
    // Euler's formula for graphs (CHECKS.md) against the labeling layer's own Euler numbers.
    for (let r = 0; r < res.domains.count; r++) {
      if (res.domains.wrapsX[r] || res.domains.wrapsY[r]) continue;
      expect(sk.columns.loops[r]).toBe(1 - res.domains.euler[r]!);
    }
    fa.dispose();
  });
});
