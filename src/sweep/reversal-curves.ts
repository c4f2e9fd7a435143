// Reversal curves and their regular (Ha, Hb) grid: the grid machinery shared by the FORC
// distribution and by topology columns resampled along reversal curves.

import { splitBranches } from "./branches";
import { bracket, checkFiniteField, checkSameLength, median } from "./interpolate";

/**
 * One reversal curve: after a field reversal at Ha, samples (Hb, value) measured with Hb
 * ascending from Ha. `values` is M for a FORC, or any other per-frame column.
 */
export interface ReversalCurve {
  /** Ha, the reversal field. */
  reversalField: number;
  /** Hb at each sample, ascending, >= Ha. */
  field: number[];
  /** The measured column at each sample (M for a FORC). */
  values: number[];
  /** First and last frame in the sweep, when the curve was cut from one. */
  frames?: [number, number];
}

/** Options of {@link reversalCurvesFromSweep}. */
export interface ReversalCurvesFromSweepOptions {
  /**
   * Field steps of at most this size count as repeats when splitting the sweep.
   * @default 0
   */
  fieldTolerance?: number;
}

/**
 * Cuts reversal curves out of a single per-frame sweep: every ascending branch that follows a
 * descending one is a reversal curve whose reversal field Ha is the turning field between them.
 * The descending branches (the way down to each Ha) are not part of any curve.
 */
export function reversalCurvesFromSweep(
  field: ArrayLike<number>,
  values: ArrayLike<number>,
  options: ReversalCurvesFromSweepOptions = {},
): ReversalCurve[] {
  checkSameLength("reversalCurvesFromSweep", field, "field", values, "values");
  const split = splitBranches(field, values, { tolerance: options.fieldTolerance ?? 0 });
  const curves: ReversalCurve[] = [];
  split.branches.forEach((b, k) => {
    if (b.direction !== "ascending" || k === 0 || split.branches[k - 1].direction !== "descending") return;
    curves.push({
      reversalField: split.turningPoints[k - 1].field,
      field: b.field,
      values: b.values as number[],
      frames: [b.startFrame, b.endFrame],
    });
  });
  return curves;
}

/** Options of {@link resampleReversalCurves}. */
export interface ReversalGridOptions {
  /**
   * Hb step of the grid, in field units. Default: the median spacing of consecutive reversal
   * fields, so that dHb = dHa.
   * @default undefined (the median Ha spacing)
   */
  fieldStep?: number;
  /**
   * Hb range of the grid `[first, last]`. Default: from the lowest Ha to the highest Hb of any
   * curve. The grid holds every `first + k * fieldStep` up to `last`.
   * @default undefined (lowest Ha to highest Hb)
   */
  fieldRange?: [number, number];
  /**
   * `"measured"`: grid points with Hb < Ha have no value. `"extended"` (extended FORC): each
   * curve is extended below its reversal field with its reversal value (its first sample), so
   * points with Hb < Ha hold that value.
   * @default "measured"
   */
  region?: "measured" | "extended";
}

/**
 * Reversal curves resampled onto a regular grid. Rows are curves at their given reversal fields
 * Ha (ascending; need not be evenly spaced), columns are evenly spaced Hb. Each curve is resampled
 * by linear interpolation in Hb between its two bracketing samples; no extrapolation beyond its
 * first or last sample. `values[i * fields.length + j]` is the value at (reversalFields[i],
 * fields[j]), `null` where the curve has no sample there (Hb outside the curve, Hb < Ha unless
 * extended, or a non-finite sample involved).
 */
export interface ReversalGrid {
  reversalFields: number[];
  fields: number[];
  values: (number | null)[];
  /** For each row, the index of its curve in the input. */
  curveIndex: number[];
  options: { fieldStep: number; fieldRange: [number, number]; region: "measured" | "extended" };
}

/**
 * Resamples reversal curves onto a regular (Ha, Hb) grid (see {@link ReversalGrid}). Throws on
 * malformed curves: unequal lengths, non-finite or descending Hb, Hb below Ha, two curves at one Ha.
 * Samples at an equal Hb within a curve are merged into their mean.
 */
export function resampleReversalCurves(
  curves: ReversalCurve[],
  options: ReversalGridOptions = {},
): ReversalGrid {
  if (curves.length === 0) throw new Error("resampleReversalCurves: expected at least one reversal curve, got none");
  const cleaned = curves.map((c, k) => cleanCurve(c, k));
  const order = cleaned.map((_, k) => k).sort((a, b) => cleaned[a].reversalField - cleaned[b].reversalField);
  const reversalFields = order.map((k) => cleaned[k].reversalField);
  for (let i = 1; i < reversalFields.length; i++) {
    if (reversalFields[i] === reversalFields[i - 1]) {
      throw new Error(
        `resampleReversalCurves: expected one curve per reversal field, got curves ${order[i - 1]} and ${order[i]} both at Ha = ${reversalFields[i]}`,
      );
    }
  }
  let fieldStep = options.fieldStep;
  if (fieldStep === undefined) {
    const gaps: number[] = [];
    for (let i = 1; i < reversalFields.length; i++) gaps.push(reversalFields[i] - reversalFields[i - 1]);
    fieldStep = median(gaps);
    if (fieldStep === undefined) {
      throw new Error("resampleReversalCurves: with a single curve, give fieldStep (it cannot be taken from the Ha spacing)");
    }
  }
  if (!(fieldStep > 0)) throw new Error(`resampleReversalCurves: expected fieldStep > 0, got ${fieldStep}`);
  const highest = cleaned.reduce((a, c) => Math.max(a, c.field[c.field.length - 1]), -Infinity);
  const fieldRange: [number, number] = options.fieldRange ?? [reversalFields[0], highest];
  if (!(fieldRange[1] >= fieldRange[0])) {
    throw new Error(`resampleReversalCurves: expected fieldRange [first, last] with last >= first, got [${fieldRange}]`);
  }
  const region = options.region ?? "measured";
  const slack = 1e-9 * fieldStep;
  const nb = Math.floor((fieldRange[1] - fieldRange[0]) / fieldStep + 1e-9) + 1;
  const fields = new Array<number>(nb);
  for (let j = 0; j < nb; j++) fields[j] = fieldRange[0] + j * fieldStep;

  const values = new Array<number | null>(reversalFields.length * nb).fill(null);
  order.forEach((k, i) => {
    const c = cleaned[k];
    for (let j = 0; j < nb; j++) {
      const hb = fields[j];
      let v: number | undefined;
      if (hb < c.reversalField - slack) {
        v = region === "extended" ? c.values[0] : undefined;
      } else {
        const s = bracket(c.field, hb, slack);
        if (s >= 0) {
          if (c.field.length === 1 || hb <= c.field[s]) v = c.values[s];
          else if (hb >= c.field[s + 1]) v = c.values[s + 1];
          else {
            const t = (hb - c.field[s]) / (c.field[s + 1] - c.field[s]);
            v = c.values[s] + t * (c.values[s + 1] - c.values[s]);
          }
        }
      }
      if (v !== undefined && Number.isFinite(v)) values[i * nb + j] = v;
    }
  });
  return {
    reversalFields,
    fields,
    values,
    curveIndex: order,
    options: { fieldStep, fieldRange, region },
  };
}

function cleanCurve(c: ReversalCurve, k: number): ReversalCurve {
  const what = `resampleReversalCurves: curve ${k}`;
  if (!Number.isFinite(c.reversalField)) throw new Error(`${what}: expected a finite reversal field, got ${c.reversalField}`);
  checkSameLength(what, c.field, "field", c.values, "values");
  if (c.field.length === 0) throw new Error(`${what}: expected at least one sample, got none`);
  checkFiniteField(what, c.field, "Hb");
  const field: number[] = [];
  const values: number[] = [];
  for (let s = 0; s < c.field.length; ) {
    if (s > 0 && c.field[s] < c.field[s - 1]) {
      throw new Error(`${what}: expected Hb ascending, got ${c.field[s]} at sample ${s} after ${c.field[s - 1]}`);
    }
    let e = s + 1;
    let sum = c.values[s];
    while (e < c.field.length && c.field[e] === c.field[s]) sum += c.values[e++];
    field.push(c.field[s]);
    values.push(sum / (e - s));
    s = e;
  }
  const tiny = 1e-9 * Math.max(1, Math.abs(c.reversalField));
  if (field[0] < c.reversalField - tiny) {
    throw new Error(`${what}: expected Hb >= Ha = ${c.reversalField}, got Hb = ${field[0]} at its first sample`);
  }
  return { reversalField: c.reversalField, field, values };
}
