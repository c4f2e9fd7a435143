import { describe, it, expect } from "vitest";
import { analyzeSkeletons, type SkeletonAnalysis, type SkeletonOptions } from "../../src/topology/skeleton-analysis";
import { skeletonGraph, squareDirectionGeometry, type SkeletonGraph, type SkeletonGraphInput } from "../../src/topology/skeleton";
import { referenceAnalysisAfterRun, referenceSkeletonGraph } from "../reference/skeleton-graph-reference";
import { noiseFrame, label, rng } from "./helpers";

// The fast skeleton graph, classification and summaries against the frozen plain-TS code of
// dc1b092 (test/reference/skeleton-graph-reference.ts) on the same thinned frames: every node,
// branch and per-domain column, both summaries and the pruned skeleton agree; sums of lengths
// and widths within 1e-9 (they are summed in the same order, so they agree exactly in practice).

type Kind = "maze" | "bubbles" | "stripes" | "noise";

function frame(kind: Kind, w: number, h: number, seed: number): Uint8Array {
  if (kind === "maze") return noiseFrame(w, h, seed, 1 + (seed % 3), 2, 0.5);
  if (kind === "bubbles") return noiseFrame(w, h, seed, 2 + (seed % 2), 2, 0.2 + 0.1 * (seed % 2));
  if (kind === "noise") return noiseFrame(w, h, seed, 0, 0, 0.3 + 0.4 * ((seed % 5) / 4));
  // Stripes: a wavy grating of period 5..12 at a seeded angle, with a little noise.
  const rand = rng(seed);
  const period = 5 + (seed % 8), angle = rand() * Math.PI, c = Math.cos(angle), s = Math.sin(angle);
  const out = new Uint8Array(w * h);
  for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) {
    const u = x * c + y * s + 1.5 * Math.sin((x * s - y * c) / 7);
    out[y * w + x] = Math.sin((2 * Math.PI * u) / period) + 0.4 * (rand() - 0.5) > 0 ? 1 : 0;
  }
  return out;
}

function saddleQuads(phase: Uint8Array, w: number, h: number, seed: number): Uint8Array {
  const rand = rng(seed);
  const quads = new Uint8Array(w * h);
  // Saddle decisions where the quad's corners alternate (random side), 2 elsewhere.
  for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) {
    const x1 = (x + 1) % w, y1 = (y + 1) % h;
    const a = phase[y * w + x], b = phase[y * w + x1], c = phase[y1 * w + x], d = phase[y1 * w + x1];
    quads[y * w + x] = a === d && b === c && a !== b ? (rand() < 0.5 ? 0 : 1) : 2;
  }
  return quads;
}

const close = (a: number, b: number) => Math.abs(a - b) <= 1e-9 || (Number.isNaN(a) && Number.isNaN(b));

function sameArray(name: string, got: ArrayLike<number>, want: ArrayLike<number>, approx = false): void {
  expect(got.length, `${name}: length`).toBe(want.length);
  for (let i = 0; i < want.length; i++) {
    if (approx ? !close(got[i]!, want[i]!) : got[i] !== want[i]) {
      expect(got[i], `${name}[${i}]`).toBe(want[i]);
    }
  }
}

function sameGraph(tag: string, g: SkeletonGraph, r: SkeletonGraph): void {
  expect([g.nodeCount, g.branchCount], `${tag}: nodes and branches`).toEqual([r.nodeCount, r.branchCount]);
  for (const k of ["nodePixel", "nodeDomain", "nodeDegree", "branchA", "branchB", "branchDomain", "branchPixels",
    "branchAlive", "pixelOwner", "branchParent", "nodeParent", "branchIntoNode", "nodeIntoBranch"] as const) {
    sameArray(`${tag} ${k}`, g[k], r[k]);
  }
  for (const k of ["nodeHalfWidth", "branchLength", "branchSumDistance", "branchMaxDistance"] as const) {
    sameArray(`${tag} ${k}`, g[k], r[k], true);
  }
}

function sameSummary(tag: string, got: object, want: object): void {
  const flat = (o: object, p = ""): Array<[string, number]> =>
    Object.entries(o).flatMap(([k, v]) => (typeof v === "object" ? flat(v as object, `${p}${k}.`) : [[`${p}${k}`, v as number]]));
  const g = flat(got), w = flat(want);
  expect(g.map(([k]) => k), `${tag}: summary fields`).toEqual(w.map(([k]) => k));
  for (let i = 0; i < w.length; i++) {
    if (!close(g[i]![1], w[i]![1])) expect(g[i]![1], `${tag} ${w[i]![0]}`).toBe(w[i]![1]);
  }
}

interface Case { tag: string; w: number; h: number; periodic: boolean; connectivity: 8 | 4 | "saddle"; phase: Uint8Array; quads?: Uint8Array; options: SkeletonOptions }

/** Runs analyzeSkeletons and the reference on its thinned frame; returns both. */
function runCase(c: Case) {
  const rule = c.connectivity === 8 ? 0 : c.connectivity === 4 ? 1 : 2;
  const L = label(c.phase, c.w, c.h, c.periodic, c.periodic, rule, c.quads);
  const options: SkeletonOptions = { ...c.options, boundary: c.periodic ? "periodic" : "open", connectivity: c.connectivity, quads: c.quads };
  const a = analyzeSkeletons({ width: c.w, height: c.h, phase: c.phase, labels: L.labels, count: L.count }, options);
  const input: SkeletonGraphInput = {
    width: c.w, height: c.h, phase: c.phase, labels: L.labels, count: L.count, skeleton: a.skeleton, distance: a.distance,
    periodicX: c.periodic, periodicY: c.periodic, rule, quads: c.quads,
  };
  const ref = referenceAnalysisAfterRun(
    input,
    { spurFactor: a.options.spurFactor, junctionMergeFactor: a.options.junctionMergeFactor },
    { bubbleMaxAspect: a.options.bubbleMaxAspect, pixelSize: a.options.pixelSize },
  );
  return { a, ref, input };
}

function compare(tag: string, a: SkeletonAnalysis, ref: ReturnType<typeof referenceAnalysisAfterRun>): void {
  sameGraph(tag, a.graph, ref.graph);
  const c = a.columns, rc = ref.columns;
  expect(c.count, `${tag}: count`).toBe(rc.count);
  for (const k of ["ends", "junctions3", "junctions4plus", "branches", "loops", "kind", "closed"] as const) sameArray(`${tag} ${k}`, c[k], rc[k]);
  for (const k of ["skeletonLength", "meanWidth", "aspect"] as const) sameArray(`${tag} ${k}`, c[k], rc[k], true);
  sameSummary(`${tag} up`, a.up, ref.up);
  sameSummary(`${tag} down`, a.down, ref.down);
  sameArray(`${tag} pruned`, a.pruned, ref.pruned);
}

const SIZES: Array<[number, number]> = [
  [1, 1], [1, 2], [2, 1], [2, 2], [3, 3], [1, 17], [23, 1], [4, 3], [5, 5], [7, 13], [16, 16],
  [31, 17], [17, 31], [45, 38], [64, 64], [97, 61], [128, 128], [256, 256],
];
const KINDS: Kind[] = ["maze", "bubbles", "stripes", "noise"];
const RULES: Array<8 | 4 | "saddle"> = [8, 4, "saddle"];
// Option variants: the defaults, no pruning, strong pruning and merging, a pixel size.
const VARIANTS: SkeletonOptions[] = [
  {}, { spurFactor: 0, junctionMergeFactor: 0 }, { spurFactor: 6, junctionMergeFactor: 2.5, bubbleMaxAspect: 2 },
  { pixelSize: 0.37, thinning: "distance" },
];

function cases(): Case[] {
  const out: Case[] = [];
  let seed = 900;
  for (const [w, h] of SIZES) {
    const big = w * h >= 128 * 128;
    for (const kind of KINDS) for (const periodic of [false, true]) for (const connectivity of RULES) {
      seed++;
      // The largest frames: every kind and rule once per boundary, default options.
      if (big && (seed % 3 !== 0)) continue;
      const phase = frame(kind, w, h, seed);
      const quads = connectivity === "saddle" ? saddleQuads(phase, w, h, seed) : undefined;
      const options = VARIANTS[seed % VARIANTS.length]!;
      out.push({ tag: `${kind} ${w}x${h} ${periodic ? "periodic" : "open"} ${connectivity} #${seed}`, w, h, periodic, connectivity, phase, quads, options });
    }
  }
  return out;
}

describe("fast skeleton graph against the frozen reference", () => {
  const all = cases();

  it("agrees on every node, branch, column, summary and pruned pixel of seeded frames", () => {
    let branches = 0, merged = 0, pruned = 0, rings = 0;
    for (const c of all) {
      const { a, ref } = runCase(c);
      compare(c.tag, a, ref);
      const g = ref.graph;
      branches += g.branchCount;
      for (let b = 0; b < g.branchCount; b++) {
        if (g.branchIntoNode[b]! >= 0) merged++;
        if (!g.branchAlive[b]) pruned++;
        if (g.branchA[b]! < 0) rings++;
      }
    }
    // The frames exercise pruning, merging and rings, not only trivial graphs.
    expect(all.length).toBeGreaterThan(300);
    expect(branches).toBeGreaterThan(10000);
    expect(merged).toBeGreaterThan(50);
    expect(pruned).toBeGreaterThan(1000);
    expect(rings).toBeGreaterThan(20);
  }, 120_000);

  it("keeps earlier results intact when the buffers are reused for later frames", () => {
    const picked = all.filter((_c, i) => i % 17 === 0);
    const kept = picked.map((c) => ({ c, ...runCase(c) }));
    // Other shapes and sizes in between, then compare the kept results again.
    for (const c of all.filter((_c, i) => i % 13 === 5)) runCase(c);
    for (const { c, a, ref } of kept) compare(`${c.tag} (kept)`, a, ref);
    // pixelOwner and pruned are filled in on first read: still plain enumerable data to a copy.
    for (const { c, a, ref } of kept.slice(0, 5)) {
      const copy = structuredClone({ graph: a.graph, pruned: a.pruned });
      sameArray(`${c.tag} cloned pixelOwner`, copy.graph.pixelOwner, ref.graph.pixelOwner);
      sameArray(`${c.tag} cloned pruned`, copy.pruned, ref.pruned);
      expect(Object.keys(a)).toContain("pruned");
      expect(Object.keys(a.graph)).toContain("pixelOwner");
    }
  }, 120_000);

  it("uses a given direction geometry instead of the square tables", () => {
    const w = 64, h = 48;
    const phase = frame("maze", w, h, 4242);
    for (const periodic of [false, true]) {
      const { a, input } = runCase({ tag: "geometry", w, h, periodic, connectivity: 8, phase, options: {} });
      const o = { spurFactor: 0, junctionMergeFactor: 0 };
      const square = squareDirectionGeometry(w, h, periodic, periodic);
      // The square tables given explicitly: the same graph as without them (and as the reference).
      sameGraph("explicit square", skeletonGraph({ ...input, directionGeometry: square }, o), referenceSkeletonGraph(input, o));
      // Every step and chord doubled: every length doubles exactly (no pruning or merging).
      const doubled = { step: square.step.map((v) => 2 * v), chord: square.chord.map((v) => 2 * v) };
      const g1 = skeletonGraph(input, o), g2 = skeletonGraph({ ...input, directionGeometry: doubled }, o);
      expect(g2.branchCount).toBe(g1.branchCount);
      expect(g1.branchCount).toBeGreaterThan(20);
      for (let b = 0; b < g1.branchCount; b++) expect(g2.branchLength[b]).toBe(2 * g1.branchLength[b]!);
      expect(a.graph.branchCount).toBeGreaterThan(0);
    }
  });
});
