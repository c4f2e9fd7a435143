// The bit-parallel thinning (assembly/thin.ts, thinBits): the facts its comments rest on, checked
// by enumeration, and the kernel on every 4 x 4 frame.
import { describe, it, expect } from "vitest";
import { thinPhases } from "../../src/wasm/skeleton";
import { label, eulerPerDomain, countBlocks } from "./helpers";

// Ring order E, NE, N, NW, W, SW, S, SE (y down), as in the kernel.
const RING = [[1, 0], [1, -1], [0, -1], [-1, -1], [-1, 0], [-1, 1], [0, 1], [1, 1]] as const;
const bit = (c: number, k: number) => (c >> (k & 7)) & 1;

/**
 * Simple point by its definition (Rosenfeld 1975, from memory; Kong & Rosenfeld 1989): exactly one
 * component of the object's ring pixels touches the centre, and exactly one of the background's,
 * with the 8-connected side joining diagonal ring pixels and the 4-connected one not.
 */
function simpleByDefinition(c: number, eight: boolean): boolean {
  const comps = (set: number, diag: boolean) => {
    const uf = [0, 1, 2, 3, 4, 5, 6, 7];
    const find = (a: number): number => (uf[a] === a ? a : find(uf[a]!));
    const join = (a: number, b: number) => { uf[find(a)] = find(b); };
    for (let k = 0; k < 8; k++) if (bit(set, k) && bit(set, k + 1)) join(k, (k + 1) & 7);
    if (diag) for (const k of [0, 2, 4, 6]) if (bit(set, k) && bit(set, k + 2)) join(k, (k + 2) & 7);
    const roots = new Set<number>();
    for (let k = 0; k < 8; k++) if (bit(set, k) && (diag || k % 2 === 0)) roots.add(find(k));
    return roots.size;
  };
  return comps(c, eight) === 1 && comps(255 ^ c, !eight) === 1;
}

/** Yokoi's connectivity number test, as the kernel computes it on bit planes. */
function simpleByYokoi(c: number, eight: boolean): boolean {
  let n = 0;
  for (const k of [0, 2, 4, 6]) {
    n += eight ? (1 - bit(c, k)) & (bit(c, k + 1) | bit(c, k + 2)) : bit(c, k) & (1 - (bit(c, k + 1) & bit(c, k + 2)));
  }
  return n === 1;
}

function isEnd(c: number, eight: boolean): boolean {
  let t = 0;
  for (let k = 0; k < 8; k++) if (bit(c, k) && (eight || k % 2 === 0)) t++;
  return t === 1;
}

function ring(img: Uint8Array, w: number, h: number, i: number): number {
  const x = i % w, y = Math.floor(i / w);
  let c = 0;
  RING.forEach(([dx, dy], k) => {
    const xx = x + dx, yy = y + dy;
    if (xx >= 0 && yy >= 0 && xx < w && yy < h && img[yy * w + xx]) c |= 1 << k;
  });
  return c;
}

describe("bit-parallel thinning", () => {
  it("tests simple points as the definition does, on all 256 rings (Yokoi, Toriwaki & Fukumura 1975)", () => {
    let agree = 0;
    for (const eight of [true, false]) for (let c = 0; c < 256; c++) {
      expect(simpleByYokoi(c, eight), `ring ${c}, ${eight ? 8 : 4}-connected`).toBe(simpleByDefinition(c, eight));
      agree++;
    }
    expect(agree).toBe(512);
  });

  it("deletes one side's border at once only where one-by-one deletion would (Ronse 1988 sets)", () => {
    // Ronse's minimal non-simple sets on the square grid are single pixels, 8-adjacent pairs and
    // subsets of 2 x 2 squares: if every such subset of the candidates of a pass can be deleted
    // one after the other, deleting all candidates at once keeps the topology. Every such subset
    // fits the 2 x 2 core of a 4 x 4 window, whose rings the window holds: all 2^16 windows.
    const sides = [2, 6, 0, 4]; // N, S, E, W ring positions
    let sets = 0;
    for (const eight of [true, false]) for (const side of sides) {
      for (let m = 0; m < 1 << 16; m++) {
        const img = new Uint8Array(16);
        for (let i = 0; i < 16; i++) img[i] = (m >> i) & 1;
        const cand = [5, 6, 9, 10].filter((i) => {
          if (!img[i]) return false;
          const c = ring(img, 4, 4, i);
          return !bit(c, side) && simpleByDefinition(c, eight) && !isEnd(c, eight);
        });
        for (let s = 1; s < 1 << cand.length; s++) {
          const sub = cand.filter((_v, j) => (s >> j) & 1);
          if (sub.length < 2) continue;
          const t = img.slice();
          for (const i of sub) {
            expect(simpleByDefinition(ring(t, 4, 4, i), eight)).toBe(true);
            t[i] = 0;
          }
          sets++;
        }
      }
    }
    expect(sets).toBeGreaterThan(10000);
  });

  it("keeps every domain's Euler number and the domain count on all 2^16 frames of 4 x 4, both rules", () => {
    const w = 4, h = 4;
    let frames = 0, withBlocks = 0;
    for (const rule of [0, 1] as const) for (let m = 0; m < 1 << 16; m += 1) {
      const phase = new Uint8Array(16);
      for (let i = 0; i < 16; i++) phase[i] = (m >> i) & 1;
      const L = label(phase, w, h, false, false, rule);
      const { skeleton, blocksLeft } = thinPhases(phase, w, h, { periodicX: false, periodicY: false, rule });
      const before = eulerPerDomain(L, null, false, false, rule);
      const after = eulerPerDomain(L, skeleton, false, false, rule);
      const Ls = label(phase.map((v, i) => (skeleton[i] ? v : 2)), w, h, false, false, rule);
      let kept = 0;
      for (let d = 1; d <= Ls.count; d++) if (Ls.domainPhase[d] !== 2) kept++;
      if (kept !== L.count || after.some((v, k) => v !== before[k])) {
        expect.fail(`frame ${m.toString(2).padStart(16, "0")} (rule ${rule}) changed its topology`);
      }
      // A 2 x 2 block of the 4-connected phase wedged between pixels of the other phase can be
      // unbreakable without changing topology; the kernel reports each one it leaves.
      const blocks = countBlocks(skeleton, w, h, false, false, phase);
      expect(blocks).toBe(blocksLeft);
      if (blocks > 0) withBlocks++;
      frames++;
    }
    expect(frames).toBe(2 * 65536);
    // Measured: 66 frames (rule 0 and 1 together), the same 66 as the list-based thinning.
    expect(withBlocks).toBeLessThanOrEqual(66);
  });
});
