import { describe, it, expect } from "vitest";
import { LabelingWorkspace } from "../../src/wasm/labeling";
import { SkeletonWorkspace, type CompactSkeletonNeighbours } from "../../src/wasm/skeleton";
import { viewI32, viewU8, viewF32 } from "../../src/wasm/heap";
import { noiseFrame } from "./helpers";

// The skeleton adjacency by skeleton index from bit planes (fixed rules) against the byte-map
// kernel on the same thinned frame: the same pixels, degrees, neighbour slots (in the order
// E, N, W, S, NE, NW, SW, SE), distances and labels.

function tables(c: CompactSkeletonNeighbours) {
  const n = c.count;
  const deg = Array.from(viewU8(c.degree, n));
  const nbr = viewI32(c.neighbours, 8 * n);
  const slots: number[][] = [];
  for (let t = 0; t < n; t++) slots.push(Array.from(nbr.subarray(8 * t, 8 * t + deg[t]!)));
  return {
    count: n, list: Array.from(viewI32(c.list, n)), deg, slots,
    distance: Array.from(viewF32(c.distance, n)), identity: Array.from(viewI32(c.identity, n)),
    label: c.label !== undefined ? Array.from(viewI32(c.label, n)) : undefined,
  };
}

describe("skeleton adjacency from bit planes", () => {
  it("equals the byte-map kernel on seeded frames: both fixed rules, open, periodic and mixed sides, widths around whole words, thin frames", () => {
    const sizes: Array<[number, number]> = [[1, 1], [2, 9], [9, 2], [3, 3], [5, 7], [17, 13], [63, 20], [64, 21], [65, 19], [127, 33], [129, 40], [200, 150]];
    let pixels = 0, rimPixels = 0;
    for (const [w, h] of sizes) {
      for (let s = 0; s < 8; s++) {
        const px = s % 4 === 1 || s % 4 === 3, py = s % 4 >= 2;
        const rule = (s >> 2) as 0 | 1;
        const phase = noiseFrame(w, h, 300 + 17 * s + w + 7 * h, 1 + (s % 3), 2, 0.25 + 0.5 * ((s * 3) % 5) / 4);
        const lab = new LabelingWorkspace(w, h);
        lab.loadPhase(phase);
        const count = lab.label(rule, px, py);
        const sk = new SkeletonWorkspace(w, h);
        sk.run(phase, { periodicX: px, periodicY: py, rule });
        expect(sk.domainTotalsAt(lab.labels().byteOffset, count, new Float64Array(count), new Float64Array(count), new Uint8Array(count))).toBe(-1);
        const bytes = tables(sk.compactNeighbours("bytes"));
        const bits = tables(sk.compactNeighbours());
        const where = `${w} x ${h} seed ${s} rule ${rule} px ${px} py ${py}`;
        expect(bits.count, where).toBe(bytes.count);
        expect(bits.list, where).toEqual(bytes.list);
        expect(bits.deg, where).toEqual(bytes.deg);
        expect(bits.slots, where).toEqual(bytes.slots);
        expect(bits.distance, where).toEqual(bytes.distance);
        expect(bits.identity, where).toEqual(bytes.identity);
        expect(bits.label, where).toEqual(bytes.label);
        pixels += bits.count;
        for (const i of bits.list) { const x = i % w, y = (i - x) / w; if (x === 0 || y === 0 || x === w - 1 || y === h - 1) rimPixels++; }
        sk.dispose(); lab.dispose();
      }
    }
    expect(pixels).toBeGreaterThan(5000);
    expect(rimPixels).toBeGreaterThan(500);
  });
});
