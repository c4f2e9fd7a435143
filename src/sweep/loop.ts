// Loop metrics of a hysteresis loop m(H): coercive fields, loop shift, remanence, squareness,
// saturation, loop area, nucleation and saturation fields, switching-field distribution.

import { type Branch, type BranchDirection, splitBranches } from "./branches";
import {
  checkFiniteField,
  checkSameLength,
  crossings,
  interpolateAt,
  linspace,
  trapezoid,
} from "./interpolate";
import { type Outcome, combine, missing, ok } from "./outcome";

/** Options of {@link loopMetrics}. */
export interface LoopMetricsOptions {
  /**
   * eps: a branch is saturated where |m| >= (1 - eps) Ms. Nucleation and saturation fields are
   * where |m| leaves / reaches that level (relative to Ms).
   * @default 0.02
   */
  saturationMargin?: number;
  /**
   * How Ms is estimated: `"max-abs"` = the largest |m| on the two branches used; `"plateau"` = the
   * mean |m| over the frames of those branches whose |H| is at least `plateauFraction` times the
   * largest |H| on them.
   * @default "max-abs"
   */
  saturationEstimate?: "max-abs" | "plateau";
  /**
   * Fraction of the largest |H| above which a frame counts as on the plateau (`"plateau"` only).
   * @default 0.9
   */
  plateauFraction?: number;
  /**
   * Frames of one branch at the same field: `"average"` merges them into one sample with their
   * mean m; `"reject"` reports the branch as unusable.
   * @default "average"
   */
  duplicateFields?: "average" | "reject";
  /**
   * Number of points of the common field grid (the overlap of both branches' field ranges,
   * evenly spaced) for the loop area and the switching-field distribution.
   * @default 401
   */
  gridPoints?: number;
  /**
   * Which branch of each direction to use when the sweep has several: the one spanning the
   * widest field range (the later one on a tie), or the last one.
   * @default "widest"
   */
  branchSelection?: "widest" | "last";
  /**
   * Field steps of at most this size count as repeats when splitting into branches.
   * @default 0
   */
  fieldTolerance?: number;
}

/** Metrics of one branch of the loop. */
export interface BranchMetrics {
  direction: BranchDirection;
  /** First and last frame of the branch in the sweep, or `null` when the sweep has none. */
  frames: [number, number] | null;
  /** Lowest and highest field on the branch, or `null`. */
  fieldRange: [number, number] | null;
  /**
   * Field of the interpolated zero crossing of m: Hc+ on the ascending branch (m from - to +),
   * Hc- on the descending one (m from + to -). The first crossing in sweep order when there are
   * several (see `zeroCrossings`).
   */
  coerciveField: Outcome<number>;
  /** How many times m crosses 0 in the branch's sense (1 for a clean loop). */
  zeroCrossings: number;
  /** m interpolated at H = 0. */
  remanence: Outcome<number>;
  /** Field where |m| first falls below (1 - eps) Ms, leaving saturation. */
  nucleationField: Outcome<number>;
  /** Field where m first reaches (1 - eps) Ms of the opposite sign. */
  saturationField: Outcome<number>;
}

/** dm/dH of both branches on the common field grid. */
export interface SwitchingFieldDistribution {
  /** Common field grid (ascending), the overlap of both branches. */
  field: number[];
  /** dm/dH of the ascending branch (finite differences: central inside, one-sided at the ends). */
  ascending: number[];
  /** dm/dH of the descending branch, same scheme. */
  descending: number[];
}

/** Result of {@link loopMetrics}. Fields and m keep the units of the input. */
export interface LoopMetrics {
  ascending: BranchMetrics;
  descending: BranchMetrics;
  /** Ms, with the estimate used (`options.saturationEstimate`). */
  saturation: Outcome<number> & { method: "max-abs" | "plateau" };
  /** Hc = (Hc+ - Hc-)/2. */
  coerciveField: Outcome<number>;
  /** Loop shift (exchange-bias-like offset) = (Hc+ + Hc-)/2. */
  loopShift: Outcome<number>;
  /** Mr = (m_desc(0) - m_asc(0))/2. */
  remanence: Outcome<number>;
  /** Mr / Ms. */
  squareness: Outcome<number>;
  /** Integral of m_desc - m_asc over the common field grid (trapezoid), in field x m units. */
  loopArea: Outcome<number>;
  switchingFieldDistribution: Outcome<SwitchingFieldDistribution>;
  /** Branches found in the sweep and the index (in split order) of the two used. */
  branches: { total: number; ascendingIndex: number | null; descendingIndex: number | null };
  options: Required<LoopMetricsOptions>;
}

const defaults: Required<LoopMetricsOptions> = {
  saturationMargin: 0.02,
  saturationEstimate: "max-abs",
  plateauFraction: 0.9,
  duplicateFields: "average",
  gridPoints: 401,
  branchSelection: "widest",
  fieldTolerance: 0,
};

/** A branch checked for use: sweep-order samples plus an ascending-field copy. */
type Prepared =
  | {
      usable: true;
      branch: Branch;
      field: number[];
      m: number[];
      sortedField: number[];
      sortedM: number[];
    }
  | { usable: false; branch: Branch | undefined; reason: string };

/**
 * Loop metrics of a sweep with applied field `field` and magnetization `m` per frame. The sweep is
 * split into branches ({@link splitBranches}); one ascending and one descending branch are used.
 * Whatever the input does not allow is reported with a reason; arrays of unequal length or a
 * non-finite field throw.
 */
export function loopMetrics(
  field: ArrayLike<number>,
  m: ArrayLike<number>,
  options: LoopMetricsOptions = {},
): LoopMetrics {
  const o: Required<LoopMetricsOptions> = { ...defaults, ...options };
  checkSameLength("loopMetrics", field, "field", m, "m");
  checkFiniteField("loopMetrics", field);
  if (!(o.saturationMargin > 0 && o.saturationMargin < 1)) {
    throw new Error(`loopMetrics: expected 0 < saturationMargin < 1, got ${o.saturationMargin}`);
  }
  if (!(o.plateauFraction >= 0 && o.plateauFraction < 1)) {
    throw new Error(`loopMetrics: expected 0 <= plateauFraction < 1, got ${o.plateauFraction}`);
  }
  if (!Number.isInteger(o.gridPoints) || o.gridPoints < 2) {
    throw new Error(`loopMetrics: expected an integer gridPoints >= 2, got ${o.gridPoints}`);
  }

  const split = splitBranches(field, m, { tolerance: o.fieldTolerance });
  const pick = (direction: BranchDirection): number | null => {
    let best: number | null = null;
    split.branches.forEach((b, k) => {
      if (b.direction !== direction) return;
      if (best === null || o.branchSelection === "last") {
        best = k;
        return;
      }
      const w = b.fieldRange[1] - b.fieldRange[0];
      const bw = split.branches[best].fieldRange[1] - split.branches[best].fieldRange[0];
      if (w >= bw) best = k;
    });
    return best;
  };
  const ascendingIndex = pick("ascending");
  const descendingIndex = pick("descending");
  const asc = prepare(
    ascendingIndex === null ? undefined : split.branches[ascendingIndex],
    "ascending",
    o,
  );
  const desc = prepare(
    descendingIndex === null ? undefined : split.branches[descendingIndex],
    "descending",
    o,
  );

  const saturation = estimateSaturation([asc, desc], o);
  const ascending = branchMetrics(asc, "ascending", saturation, o);
  const descending = branchMetrics(desc, "descending", saturation, o);

  const coerciveField = combine(ascending.coerciveField, descending.coerciveField, (p, q) => (p - q) / 2);
  const loopShift = combine(ascending.coerciveField, descending.coerciveField, (p, q) => (p + q) / 2);
  const remanence = combine(descending.remanence, ascending.remanence, (d, a) => (d - a) / 2);
  const squareness = combine<number, number, number>(remanence, saturation, (mr, ms) => mr / ms);

  let loopArea: Outcome<number>;
  let switchingFieldDistribution: Outcome<SwitchingFieldDistribution>;
  if (!asc.usable || !desc.usable) {
    const reason = !asc.usable ? asc.reason : (desc as { reason: string }).reason;
    loopArea = missing(reason);
    switchingFieldDistribution = missing(reason);
  } else {
    const lo = Math.max(asc.sortedField[0], desc.sortedField[0]);
    const hi = Math.min(asc.sortedField[asc.sortedField.length - 1], desc.sortedField[desc.sortedField.length - 1]);
    if (!(hi > lo)) {
      const reason = `the two branches share no field range (ascending ${fmtRange(asc.sortedField)}, descending ${fmtRange(desc.sortedField)})`;
      loopArea = missing(reason);
      switchingFieldDistribution = missing(reason);
    } else {
      const grid = linspace(lo, hi, o.gridPoints);
      const ma = grid.map((h) => interpolateAt(asc.sortedField, asc.sortedM, h, 1e-12 * (hi - lo)) as number);
      const md = grid.map((h) => interpolateAt(desc.sortedField, desc.sortedM, h, 1e-12 * (hi - lo)) as number);
      loopArea = ok(trapezoid(grid, md.map((v, k) => v - ma[k])));
      switchingFieldDistribution = ok({
        field: grid,
        ascending: gradient(grid, ma),
        descending: gradient(grid, md),
      });
    }
  }

  return {
    ascending,
    descending,
    saturation,
    coerciveField,
    loopShift,
    remanence,
    squareness,
    loopArea,
    switchingFieldDistribution,
    branches: { total: split.branches.length, ascendingIndex, descendingIndex },
    options: o,
  };
}

function fmtRange(sorted: number[]): string {
  return `${sorted[0]} to ${sorted[sorted.length - 1]}`;
}

function prepare(
  branch: Branch | undefined,
  direction: BranchDirection,
  o: Required<LoopMetricsOptions>,
): Prepared {
  if (branch === undefined) {
    return { usable: false, branch, reason: `the sweep has no ${direction} branch` };
  }
  const f = branch.field;
  const v = branch.values as number[];
  const where = `the ${direction} branch (frames ${branch.startFrame}..${branch.endFrame})`;
  let bad = 0;
  let firstBad = -1;
  for (let k = 0; k < v.length; k++) {
    if (!Number.isFinite(v[k])) {
      if (firstBad < 0) firstBad = k;
      bad++;
    }
  }
  if (bad > 0) {
    return {
      usable: false,
      branch,
      reason: `m is not finite at ${bad} frame(s) of ${where}, first at frame ${branch.startFrame + firstBad} (m = ${v[firstBad]})`,
    };
  }
  const sense = direction === "ascending" ? 1 : -1;
  for (let k = 1; k < f.length; k++) {
    if (sense * (f[k] - f[k - 1]) < 0) {
      return {
        usable: false,
        branch,
        reason: `the field is not monotonic within ${where}: ${f[k]} at frame ${branch.startFrame + k} after ${f[k - 1]}`,
      };
    }
  }
  // Merge runs of equal field.
  const field: number[] = [];
  const m: number[] = [];
  for (let k = 0; k < f.length; ) {
    let j = k + 1;
    let sum = v[k];
    while (j < f.length && f[j] === f[k]) sum += v[j++];
    if (j - k > 1 && o.duplicateFields === "reject") {
      return {
        usable: false,
        branch,
        reason: `${where} holds ${j - k} frames at the same field ${f[k]} (from frame ${branch.startFrame + k}); duplicateFields is "reject"`,
      };
    }
    field.push(f[k]);
    m.push(sum / (j - k));
    k = j;
  }
  if (field.length < 2) {
    return { usable: false, branch, reason: `${where} holds fewer than two distinct fields` };
  }
  const sortedField = direction === "ascending" ? field : [...field].reverse();
  const sortedM = direction === "ascending" ? m : [...m].reverse();
  return { usable: true, branch, field, m, sortedField, sortedM };
}

function estimateSaturation(
  branches: Prepared[],
  o: Required<LoopMetricsOptions>,
): Outcome<number> & { method: "max-abs" | "plateau" } {
  const method = o.saturationEstimate;
  const usable = branches.filter((b) => b.usable) as Extract<Prepared, { usable: true }>[];
  if (usable.length === 0) {
    const reasons = branches.map((b) => (b.usable ? "" : b.reason)).join("; ");
    return { ...missing<number>(`no usable branch: ${reasons}`), method };
  }
  let ms: number;
  if (method === "max-abs") {
    ms = 0;
    for (const b of usable) for (const v of b.m) ms = Math.max(ms, Math.abs(v));
  } else {
    let hMax = 0;
    for (const b of usable) for (const h of b.field) hMax = Math.max(hMax, Math.abs(h));
    let sum = 0;
    let count = 0;
    for (const b of usable) {
      b.field.forEach((h, k) => {
        if (Math.abs(h) >= o.plateauFraction * hMax) {
          sum += Math.abs(b.m[k]);
          count++;
        }
      });
    }
    ms = sum / count; // count >= 1: the frame at hMax qualifies
  }
  if (!(ms > 0)) return { ...missing<number>("m is 0 on every frame used, so Ms is 0"), method };
  return { value: ms, method };
}

function branchMetrics(
  p: Prepared,
  direction: BranchDirection,
  saturation: Outcome<number>,
  o: Required<LoopMetricsOptions>,
): BranchMetrics {
  if (!p.usable) {
    const reason = missing<number>(p.reason);
    return {
      direction,
      frames: p.branch ? [p.branch.startFrame, p.branch.endFrame] : null,
      fieldRange: p.branch ? p.branch.fieldRange : null,
      coerciveField: reason,
      zeroCrossings: 0,
      remanence: reason,
      nucleationField: reason,
      saturationField: reason,
    };
  }
  const sense = direction === "ascending" ? "up" : "down";
  const zero = crossings(p.field, p.m, 0, sense);
  const mRange = `m from ${p.m.reduce((a, b) => Math.min(a, b))} to ${p.m.reduce((a, b) => Math.max(a, b))}`;
  const coerciveField =
    zero.length > 0
      ? ok(zero[0].x)
      : missing<number>(`the ${direction} branch never crosses m = 0 (${mRange})`);
  const mr = interpolateAt(p.sortedField, p.sortedM, 0);
  const remanence =
    mr !== undefined
      ? ok(mr)
      : missing<number>(`the ${direction} branch does not reach H = 0 (field ${fmtRange(p.sortedField)})`);

  let nucleationField: Outcome<number>;
  let saturationField: Outcome<number>;
  if (saturation.value === undefined) {
    nucleationField = missing(`Ms is unknown: ${saturation.reason}`);
    saturationField = nucleationField;
  } else {
    const level = (1 - o.saturationMargin) * saturation.value;
    // Descending: from +level down to -level; ascending: from -level up to +level.
    const from = direction === "descending" ? level : -level;
    const startsSaturated = direction === "descending" ? p.m[0] >= level : p.m[0] <= -level;
    if (!startsSaturated) {
      nucleationField = missing(
        `the ${direction} branch does not start saturated: m = ${p.m[0]} at its first frame, ` +
          `|m| below (1 - eps) Ms = ${level}`,
      );
    } else {
      const leave = crossings(p.field, p.m, from, sense);
      nucleationField =
        leave.length > 0
          ? ok(leave[0].x)
          : missing(`the ${direction} branch never leaves saturation (|m| stays >= ${level})`);
    }
    const reach = crossings(p.field, p.m, -from, sense);
    saturationField =
      reach.length > 0
        ? ok(reach[0].x)
        : missing(
            `the ${direction} branch never reaches m = ${-from} ((1 - eps) Ms of the opposite sign; ${mRange})`,
          );
  }
  return {
    direction,
    frames: [p.branch.startFrame, p.branch.endFrame],
    fieldRange: p.branch.fieldRange,
    coerciveField,
    zeroCrossings: zero.length,
    remanence,
    nucleationField,
    saturationField,
  };
}

/** dy/dx on an ascending grid: central differences inside, one-sided at both ends. */
function gradient(x: number[], y: number[]): number[] {
  const n = x.length;
  const out = new Array<number>(n);
  out[0] = (y[1] - y[0]) / (x[1] - x[0]);
  out[n - 1] = (y[n - 1] - y[n - 2]) / (x[n - 1] - x[n - 2]);
  for (let k = 1; k < n - 1; k++) out[k] = (y[k + 1] - y[k - 1]) / (x[k + 1] - x[k - 1]);
  return out;
}
