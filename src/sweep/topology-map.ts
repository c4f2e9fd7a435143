// Any per-frame column (bubble count, Euler characteristic, wall length, ...) along the reversal
// curves, on the same (Ha, Hb) grid as the FORC distribution, and compared with the major loop.

import { checkFiniteField, checkSameLength, interpolateAt, nearestAt } from "./interpolate";
import { type Outcome, missing, ok } from "./outcome";
import {
  type ReversalCurve,
  type ReversalGrid,
  resampleReversalCurves,
  reversalCurvesFromSweep,
} from "./reversal-curves";

/** The grid part of a {@link ReversalGrid} or a FORC distribution. */
export interface GridAxes {
  reversalFields: number[];
  fields: number[];
  options: { fieldStep: number; fieldRange: [number, number]; region: "measured" | "extended" };
}

/** Options of {@link columnOnReversalGrid}. */
export interface ColumnOnGridOptions {
  /**
   * Field steps of at most this size count as repeats when cutting the sweep into curves.
   * @default 0
   */
  fieldTolerance?: number;
}

/**
 * Resamples a per-frame column of a sweep onto the (Ha, Hb) grid of its FORC curves: the sweep is
 * cut into reversal curves as for the FORC, and each is resampled with the same machinery (linear
 * in Hb, same step, range and region). Throws when the sweep's reversal fields are not the grid's.
 */
export function columnOnReversalGrid(
  field: ArrayLike<number>,
  column: ArrayLike<number>,
  grid: GridAxes,
  options: ColumnOnGridOptions = {},
): ReversalGrid {
  checkSameLength("columnOnReversalGrid", field, "field", column, "column");
  return columnCurvesOnReversalGrid(reversalCurvesFromSweep(field, column, options), grid);
}

/** {@link columnOnReversalGrid} for a column already given as reversal curves. */
export function columnCurvesOnReversalGrid(curves: ReversalCurve[], grid: GridAxes): ReversalGrid {
  const out = resampleReversalCurves(curves, grid.options);
  const same =
    out.reversalFields.length === grid.reversalFields.length &&
    out.reversalFields.every((h, i) => Math.abs(h - grid.reversalFields[i]) <= 1e-9 * grid.options.fieldStep);
  if (!same) {
    throw new Error(
      `columnOnReversalGrid: expected the grid's ${grid.reversalFields.length} reversal fields, ` +
        `got ${out.reversalFields.length} curves at Ha = ${out.reversalFields.slice(0, 5).join(", ")}${out.reversalFields.length > 5 ? ", ..." : ""}`,
    );
  }
  return out;
}

/** One branch of the major loop with a column, in sweep order. */
export interface MajorBranchColumns {
  field: number[];
  magnetization: number[];
  /** The column to read (e.g. bubble count) at each frame of the branch. */
  column: number[];
}

/** Options of {@link matchMajorLoop}. */
export interface MatchMajorLoopOptions {
  /**
   * How the column is read between frames: `"linear"` interpolation, or the `"nearest"` frame's
   * value (for counts).
   * @default "linear"
   */
  sampling?: "linear" | "nearest";
}

/** A point of the major branch with its column value. */
export interface MajorLoopPoint {
  field: number;
  magnetization: number;
  value: number;
}

/** Result of {@link matchMajorLoop}. */
export interface MajorLoopMatch {
  point: { field: number; magnetization: number };
  /** The major-branch point at the same field. */
  equalField: Outcome<MajorLoopPoint>;
  /** The first major-branch point (in sweep order) at the same magnetization. */
  equalMagnetization: Outcome<MajorLoopPoint & { crossings: number }>;
  options: Required<MatchMajorLoopOptions>;
}

/**
 * For a reversal-curve point (field, magnetization), finds the major-branch point at equal field
 * and the one at equal magnetization, and reads the column at both. Throws for a malformed branch.
 */
export function matchMajorLoop(
  point: { field: number; magnetization: number },
  branch: MajorBranchColumns,
  options: MatchMajorLoopOptions = {},
): MajorLoopMatch {
  const o: Required<MatchMajorLoopOptions> = { sampling: "linear", ...options };
  const what = "matchMajorLoop";
  checkSameLength(what, branch.field, "field", branch.magnetization, "magnetization");
  checkSameLength(what, branch.field, "field", branch.column, "column");
  checkFiniteField(what, branch.field);
  const n = branch.field.length;
  if (n < 2) throw new Error(`${what}: expected a branch of at least 2 frames, got ${n}`);
  const reversed = branch.field[n - 1] < branch.field[0];
  const order = Array.from({ length: n }, (_, k) => (reversed ? n - 1 - k : k));
  const f = order.map((k) => branch.field[k]);
  for (let k = 1; k < n; k++) {
    if (!(f[k] > f[k - 1])) throw new Error(`${what}: expected a strictly monotonic branch field, got ${f[k]} next to ${f[k - 1]}`);
  }
  const mSorted = order.map((k) => branch.magnetization[k]);
  const cSorted = order.map((k) => branch.column[k]);
  const read = o.sampling === "linear" ? interpolateAt : nearestAt;

  let equalField: Outcome<MajorLoopPoint>;
  const mAt = interpolateAt(f, mSorted, point.field);
  const vAt = read(f, cSorted, point.field);
  if (mAt === undefined || vAt === undefined) {
    equalField = missing(`field ${point.field} is outside the branch (field ${f[0]} to ${f[n - 1]})`);
  } else if (!Number.isFinite(mAt) || !Number.isFinite(vAt)) {
    equalField = missing(`the branch has a non-finite value next to field ${point.field}`);
  } else {
    equalField = ok({ field: point.field, magnetization: mAt, value: vAt });
  }

  // Equal magnetization: every place in sweep order where m reaches the level, exact or crossed.
  const m = branch.magnetization;
  const level = point.magnetization;
  const positions: number[] = [];
  for (let k = 0; k < n; k++) {
    if (m[k] === level) positions.push(k);
    else if (k + 1 < n && (m[k] - level) * (m[k + 1] - level) < 0) positions.push(k + (level - m[k]) / (m[k + 1] - m[k]));
  }
  let equalMagnetization: Outcome<MajorLoopPoint & { crossings: number }>;
  if (positions.length === 0) {
    equalMagnetization = missing(`the branch never reaches m = ${level}`);
  } else {
    const p = positions[0];
    const k = Math.min(Math.floor(p), n - 2);
    const t = p - k;
    const h = branch.field[k] + t * (branch.field[k + 1] - branch.field[k]);
    const value =
      o.sampling === "linear"
        ? branch.column[k] + t * (branch.column[k + 1] - branch.column[k])
        : branch.column[t <= 0.5 ? k : k + 1];
    equalMagnetization = Number.isFinite(value)
      ? ok({ field: h, magnetization: level, value, crossings: positions.length })
      : missing(`the column is not finite next to field ${h}`);
  }
  return { point: { ...point }, equalField, equalMagnetization, options: o };
}
