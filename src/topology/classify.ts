// Per-domain skeleton columns and the bubble / stripe / labyrinth classification, then the
// per-phase summary. Rule: a junction after pruning makes a labyrinth; otherwise skeleton length
// over mean width below `bubbleMaxAspect` makes a bubble; otherwise a stripe, closed when its
// skeleton has a loop and no end.
import type { SkeletonGraph } from "./skeleton";

export const KIND_BUBBLE = 0;
export const KIND_STRIPE = 1;
export const KIND_LABYRINTH = 2;
/** Names of the kind codes, index = code. */
export const KIND_NAMES = ["bubble", "stripe", "labyrinth"] as const;
export type DomainKind = (typeof KIND_NAMES)[number];

/** Skeleton columns; row i describes the domain with label id i + 1 (as the DomainTable). */
export interface SkeletonColumns {
  count: number;
  /** Length of the pruned skeleton (unit); 1 and sqrt 2 steps between pixel centres. */
  skeletonLength: Float64Array;
  /** End nodes (a one-pixel skeleton counts as a segment of length 0, with two ends). */
  ends: Int32Array;
  /** Junction nodes of degree 3, and of degree 4 or more (a crossing is one degree-4 node). */
  junctions3: Int32Array;
  junctions4plus: Int32Array;
  branches: Int32Array;
  /** Cycle rank of the skeleton graph (holes of a non-wrapping domain; + windings on a torus). */
  loops: Int32Array;
  /** Mean width along the skeleton (unit): 2 x mean distance to the other phase - 1/2 px. */
  meanWidth: Float64Array;
  /**
   * Core length over width: (domain length - width) / width, with width = 2 x largest distance
   * - 1/2 px and domain length = skeletonLength + the half-width at each end (the thinning stops
   * a line end about one half-width short of the domain's tip, like the medial axis). A disc
   * gives about 0, a w x L bar or capsule (L - w) / w.
   */
  aspect: Float64Array;
  /** 0 bubble, 1 stripe, 2 labyrinth (KIND_NAMES). */
  kind: Uint8Array;
  /** 1 for a stripe closed into a ring (a loop and no end). */
  closed: Uint8Array;
}

export interface ClassifyOptions {
  bubbleMaxAspect: number;
  pixelSize: number;
}

/** `maxDistance`: the largest distance to the other phase in each domain (px). */
export function classifyDomains(g: SkeletonGraph, count: number, pointDistance: Float64Array, o: ClassifyOptions): SkeletonColumns {
  const K = count;
  const c: SkeletonColumns = {
    count: K,
    skeletonLength: new Float64Array(K), ends: new Int32Array(K), junctions3: new Int32Array(K),
    junctions4plus: new Int32Array(K), branches: new Int32Array(K), loops: new Int32Array(K),
    meanWidth: new Float64Array(K), aspect: new Float64Array(K), kind: new Uint8Array(K),
    closed: new Uint8Array(K),
  };
  const nodes = new Int32Array(K), sumD = new Float64Array(K), cntD = new Float64Array(K);
  const reach = new Float64Array(K);
  for (let v = 0; v < g.nodeCount; v++) {
    const d = g.nodeDegree[v]!;
    if (d < 0) continue;
    const r = g.nodeDomain[v]! - 1;
    nodes[r]!++;
    // A skeleton of one pixel is a segment of length 0: two ends, like any short bubble's line.
    if (d === 0) c.ends[r]! += 2;
    else if (d === 1) { c.ends[r]!++; reach[r]! += g.nodeHalfWidth[v]!; }
    else if (d === 3) c.junctions3[r]!++;
    else if (d >= 4) c.junctions4plus[r]!++;
  }
  for (let b = 0; b < g.branchCount; b++) {
    if (!g.branchAlive[b]) continue;
    const r = g.branchDomain[b]! - 1;
    c.branches[r]!++;
    if (g.branchA[b]! < 0) nodes[r]!++; // a ring counts as one node and one self-loop
    c.skeletonLength[r]! += g.branchLength[b]!;
    sumD[r]! += g.branchSumDistance[b]!;
    cntD[r]! += g.branchPixels[b]!;
  }
  const s = o.pixelSize;
  for (let r = 0; r < K; r++) {
    const hasSkeleton = nodes[r]! > 0;
    c.loops[r] = hasSkeleton ? c.branches[r]! - nodes[r]! + 1 : 0;
    // Distance is centre to centre to the first other-phase pixel: the middle line of a stripe
    // w px wide has (w + 1) / 2 (odd w) or w / 2 (even w), hence 2 d - 1/2, within 1/2 px.
    const meanD = cntD[r]! > 0 ? sumD[r]! / cntD[r]! : pointDistance[r]!;
    const width = Math.max(1, 2 * meanD - 0.5);
    c.meanWidth[r] = width * s;
    c.skeletonLength[r] = c.skeletonLength[r]! * s;
    const fullWidth = Math.max(1, 2 * pointDistance[r]! - 0.5);
    c.aspect[r] = Math.max(0, c.skeletonLength[r]! / s + reach[r]! - fullWidth) / fullWidth;
    if (c.junctions3[r]! + c.junctions4plus[r]! > 0) c.kind[r] = KIND_LABYRINTH;
    else if (c.aspect[r]! < o.bubbleMaxAspect) c.kind[r] = KIND_BUBBLE;
    else {
      c.kind[r] = KIND_STRIPE;
      c.closed[r] = c.loops[r]! > 0 && c.ends[r] === 0 ? 1 : 0;
    }
  }
  return c;
}

export interface KindCounts {
  count: number;
  /** Summed area of domains of this kind over the frame area. */
  areaFraction: number;
}

/** Skeleton statistics of one phase; densities per frame area (unit^-2, unit^-1 for lengths). */
export interface PhaseSkeletonSummary {
  domains: number;
  bubble: KindCounts;
  stripe: KindCounts & { closed: number };
  labyrinth: KindCounts;
  endsDensity: number;
  /** Junction nodes (all degrees), degree 3, degree >= 4, per area. */
  junctionDensity: number;
  junctions3Density: number;
  junctions4plusDensity: number;
  /** Equivalent diameter sqrt(4 A / pi) of the bubbles: mean and standard deviation (unit; NaN without bubbles). */
  bubbleDiameterMean: number;
  bubbleDiameterStd: number;
  /** Mean width of the stripes, weighted by skeleton length (unit; NaN without stripes). */
  stripeWidthMean: number;
  /** Pruned skeleton length per frame area (unit^-1). */
  skeletonLengthDensity: number;
}

export function summarizePhase(
  c: SkeletonColumns, domainPhase: Uint8Array, areaPx: Float64Array, p: 0 | 1, framePixels: number, pixelSize: number,
): PhaseSkeletonSummary {
  const s2 = pixelSize * pixelSize;
  const frameArea = framePixels * s2;
  const out: PhaseSkeletonSummary = {
    domains: 0,
    bubble: { count: 0, areaFraction: 0 }, stripe: { count: 0, areaFraction: 0, closed: 0 },
    labyrinth: { count: 0, areaFraction: 0 },
    endsDensity: 0, junctionDensity: 0, junctions3Density: 0, junctions4plusDensity: 0,
    bubbleDiameterMean: NaN, bubbleDiameterStd: NaN, stripeWidthMean: NaN, skeletonLengthDensity: 0,
  };
  let ends = 0, j3 = 0, j4 = 0, len = 0, bd = 0, bd2 = 0, sw = 0, sl = 0;
  for (let r = 0; r < c.count; r++) {
    if (domainPhase[r] !== p) continue;
    out.domains++;
    const a = areaPx[r]! / framePixels;
    const k = c.kind[r]!;
    const bucket = k === KIND_BUBBLE ? out.bubble : k === KIND_STRIPE ? out.stripe : out.labyrinth;
    bucket.count++;
    bucket.areaFraction += a;
    if (k === KIND_STRIPE && c.closed[r]) out.stripe.closed++;
    if (k === KIND_BUBBLE) {
      const d = Math.sqrt((4 * areaPx[r]!) / Math.PI) * pixelSize;
      bd += d; bd2 += d * d;
    }
    if (k === KIND_STRIPE) { sw += c.meanWidth[r]! * c.skeletonLength[r]!; sl += c.skeletonLength[r]!; }
    ends += c.ends[r]!; j3 += c.junctions3[r]!; j4 += c.junctions4plus[r]!; len += c.skeletonLength[r]!;
  }
  const nb = out.bubble.count;
  if (nb > 0) {
    out.bubbleDiameterMean = bd / nb;
    out.bubbleDiameterStd = nb > 1 ? Math.sqrt(Math.max(0, (bd2 - (bd * bd) / nb) / (nb - 1))) : 0;
  }
  if (out.stripe.count > 0) out.stripeWidthMean = sl > 0 ? sw / sl : NaN;
  out.endsDensity = ends / frameArea;
  out.junctions3Density = j3 / frameArea;
  out.junctions4plusDensity = j4 / frameArea;
  out.junctionDensity = (j3 + j4) / frameArea;
  out.skeletonLengthDensity = len / frameArea;
  return out;
}
