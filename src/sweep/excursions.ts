// Excursions of a reversal curve from the major loop: where it leaves, how far it goes, where it
// rejoins, and the area between the two.

import { checkFiniteField, checkSameLength, interpolateAt, trapezoid } from "./interpolate";
import { type Outcome, missing, ok } from "./outcome";

/** A curve sampled against field: a reversal curve or one branch of the major loop. */
export interface FieldCurve {
  /** Field at each sample, monotonic (either direction for a major-loop branch). */
  field: number[];
  /** M (or any column) at each sample. */
  values: number[];
}

/** Options of {@link excursion}. */
export interface ExcursionOptions {
  /**
   * tol: the curve is off the major branch where |M_curve - M_major| > tol (units of M).
   * @default 0.01
   */
  tolerance?: number;
}

/** Result of {@link excursion}. Deviations are M_curve - M_major at equal field. */
export interface Excursion {
  /** Field range where both curves have samples, or `null` when they share none. */
  overlap: [number, number] | null;
  /** First field (ascending) where |deviation| exceeds tol, linearly interpolated. */
  leaveField: Outcome<number>;
  /** First field after leaving where |deviation| is back to tol or less, interpolated. */
  rejoinField: Outcome<number>;
  /** The signed deviation of largest size and the field where it occurs. */
  maxDeviation: Outcome<{ deviation: number; field: number }>;
  /** Integral of the deviation over the overlap (trapezoid), field x M units; signed. */
  area: Outcome<number>;
  /** Integral of |deviation| over the overlap, same rule. */
  absoluteArea: Outcome<number>;
  options: Required<ExcursionOptions>;
}

/**
 * Compares a reversal curve with a major-loop branch (usually the branch of the same field
 * direction). Both are linearly interpolated; the deviation is evaluated at every sample field of
 * either curve inside their common range, so piecewise-linear data are handled exactly.
 * Throws for malformed curves (unequal lengths, non-finite or non-monotonic field).
 */
export function excursion(curve: FieldCurve, major: FieldCurve, options: ExcursionOptions = {}): Excursion {
  const o: Required<ExcursionOptions> = { tolerance: 0.01, ...options };
  if (!(o.tolerance >= 0)) throw new Error(`excursion: expected tolerance >= 0, got ${o.tolerance}`);
  const c = ascendingCurve("excursion: reversal curve", curve);
  const mj = ascendingCurve("excursion: major branch", major);
  const lo = Math.max(c.field[0], mj.field[0]);
  const hi = Math.min(c.field[c.field.length - 1], mj.field[mj.field.length - 1]);
  if (!(hi >= lo)) {
    const reason = `the curve (field ${c.field[0]} to ${c.field[c.field.length - 1]}) and the major branch (field ${mj.field[0]} to ${mj.field[mj.field.length - 1]}) share no field range`;
    return { overlap: null, leaveField: missing(reason), rejoinField: missing(reason), maxDeviation: missing(reason), area: missing(reason), absoluteArea: missing(reason), options: o };
  }
  const h = [...new Set([lo, hi, ...c.field, ...mj.field].filter((x) => x >= lo && x <= hi))].sort((a, b) => a - b);
  const d = h.map((x) => (interpolateAt(c.field, c.values, x) as number) - (interpolateAt(mj.field, mj.values, x) as number));
  const bad = d.findIndex((v) => !Number.isFinite(v));
  if (bad >= 0) {
    const reason = `a value is not finite near field ${h[bad]}`;
    return { overlap: [lo, hi], leaveField: missing(reason), rejoinField: missing(reason), maxDeviation: missing(reason), area: missing(reason), absoluteArea: missing(reason), options: o };
  }

  let worst = 0;
  for (let k = 1; k < d.length; k++) if (Math.abs(d[k]) > Math.abs(d[worst])) worst = k;
  const maxDeviation = ok({ deviation: d[worst], field: h[worst] });
  const area = ok(trapezoid(h, d));
  const absoluteArea = ok(absoluteTrapezoid(h, d));

  const tol = o.tolerance;
  const leaveAt = d.findIndex((v) => Math.abs(v) > tol);
  let leaveField: Outcome<number>;
  let rejoinField: Outcome<number>;
  if (leaveAt < 0) {
    const reason = `the curve stays within tol = ${tol} of the major branch (largest |deviation| ${Math.abs(d[worst])})`;
    leaveField = missing(reason);
    rejoinField = missing(reason);
  } else {
    leaveField = ok(leaveAt === 0 ? h[0] : levelCrossing(h, d, leaveAt - 1, Math.sign(d[leaveAt]) * tol));
    let back = -1;
    for (let k = leaveAt + 1; k < d.length; k++) {
      if (Math.abs(d[k]) <= tol) {
        back = k;
        break;
      }
    }
    rejoinField =
      back < 0
        ? missing(`the curve has not rejoined the major branch by field ${hi} (deviation ${d[d.length - 1]} there)`)
        : ok(levelCrossing(h, d, back - 1, Math.sign(d[back - 1]) * tol));
  }
  return { overlap: [lo, hi], leaveField, rejoinField, maxDeviation, area, absoluteArea, options: o };
}

/** {@link excursion} of each of several reversal curves against one major branch. */
export function excursions(curves: FieldCurve[], major: FieldCurve, options: ExcursionOptions = {}): Excursion[] {
  return curves.map((c) => excursion(c, major, options));
}

/** Field where the straight line between samples k and k + 1 of d reaches `level`. */
function levelCrossing(h: number[], d: number[], k: number, level: number): number {
  const t = (level - d[k]) / (d[k + 1] - d[k]);
  return h[k] + Math.min(1, Math.max(0, t)) * (h[k + 1] - h[k]);
}

/** Trapezoid integral of |d| for piecewise-linear d, splitting intervals where d changes sign. */
function absoluteTrapezoid(h: number[], d: number[]): number {
  let sum = 0;
  for (let k = 0; k + 1 < h.length; k++) {
    const a = d[k];
    const b = d[k + 1];
    const w = h[k + 1] - h[k];
    if (a * b >= 0) sum += 0.5 * (Math.abs(a) + Math.abs(b)) * w;
    else sum += (0.5 * (a * a + b * b) * w) / (Math.abs(a) + Math.abs(b));
  }
  return sum;
}

function ascendingCurve(what: string, c: FieldCurve): FieldCurve {
  checkSameLength(what, c.field, "field", c.values, "values");
  if (c.field.length === 0) throw new Error(`${what}: expected at least one sample, got none`);
  checkFiniteField(what, c.field);
  const n = c.field.length;
  const reversed = n > 1 && c.field[n - 1] < c.field[0];
  const field = reversed ? [...c.field].reverse() : c.field;
  const values = reversed ? [...c.values].reverse() : c.values;
  for (let k = 1; k < n; k++) {
    if (!(field[k] > field[k - 1])) {
      throw new Error(`${what}: expected a strictly monotonic field, got ${field[k]} next to ${field[k - 1]}`);
    }
  }
  return { field, values };
}
