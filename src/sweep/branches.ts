// Splitting a per-frame field series into monotonic branches of a loop, with the turning points
// (reversal fields) between them.

import { checkFiniteField, checkSameLength } from "./interpolate";

/** Direction of the applied field along a branch. */
export type BranchDirection = "ascending" | "descending";

/** Options of {@link splitBranches}. */
export interface SplitBranchesOptions {
  /**
   * Field steps of at most this size (same unit as the field) count as repeats of the same field
   * value and never start a new branch. Use it for a noisy field log.
   * @default 0
   */
  tolerance?: number;
}

/** One monotonic stretch of the sweep. Frames `startFrame..endFrame` (inclusive) belong to it. */
export interface Branch {
  direction: BranchDirection;
  startFrame: number;
  endFrame: number;
  /** The applied field at each frame of the branch, in sweep order. */
  field: number[];
  /** The column given to {@link splitBranches} at each frame of the branch (absent without one). */
  values?: number[];
  /** Lowest and highest field on the branch. */
  fieldRange: [number, number];
  /** Frames whose field repeats the previous frame's (within the tolerance) inside the branch. */
  repeatedFields: number;
}

/**
 * A reversal of the field direction. The field dwells at `field` from `firstFrame` to `lastFrame`
 * (equal when the turning frame is not repeated): the branch before ends at `firstFrame`, the
 * branch after starts at `lastFrame`.
 */
export interface TurningPoint {
  /** `maximum`: ascending turns into descending; `minimum`: descending turns into ascending. */
  kind: "maximum" | "minimum";
  /** The reversal field (the field at `firstFrame`). */
  field: number;
  firstFrame: number;
  lastFrame: number;
}

/** Result of {@link splitBranches}. */
export interface BranchSplit {
  branches: Branch[];
  turningPoints: TurningPoint[];
  /** Number of frames in the sweep. */
  frames: number;
  options: Required<SplitBranchesOptions>;
}

/**
 * Splits a sweep (one applied-field value per frame) into ascending and descending branches.
 * Repeated field values at a turning point are a dwell: the branch before ends at the dwell's
 * first frame and the branch after starts at its last frame, so neither holds a duplicated
 * turning field. Leading and trailing repeats are trimmed the same way. Repeats inside a branch
 * stay in it and are counted in `repeatedFields`.
 *
 * `values` is any per-frame column (magnetization, bubble count, ...) to carry along.
 */
export function splitBranches(
  field: ArrayLike<number>,
  values?: ArrayLike<number>,
  options: SplitBranchesOptions = {},
): BranchSplit {
  const tolerance = options.tolerance ?? 0;
  if (!(tolerance >= 0)) throw new Error(`splitBranches: expected tolerance >= 0, got ${tolerance}`);
  checkFiniteField("splitBranches", field);
  if (values !== undefined) checkSameLength("splitBranches", field, "field", values, "values");
  const n = field.length;
  const branches: Branch[] = [];
  const turningPoints: TurningPoint[] = [];

  // Direction of each step k -> k + 1: +1, -1 or 0 (a repeat within the tolerance).
  const stepDirection = (k: number): number => {
    const d = field[k + 1] - field[k];
    return d > tolerance ? 1 : d < -tolerance ? -1 : 0;
  };

  let start = -1; // first frame of the current branch
  let direction = 0;
  let lastMove = -1; // frame reached by the last directed step of the current branch
  for (let k = 0; k + 1 < n; k++) {
    const d = stepDirection(k);
    if (d === 0) continue;
    if (direction === 0) {
      // The first directed step: the first branch starts at the end of the leading dwell.
      start = k;
      direction = d;
    } else if (d !== direction) {
      branches.push(makeBranch(field, values, start, lastMove, direction, tolerance));
      turningPoints.push({
        kind: direction > 0 ? "maximum" : "minimum",
        field: field[lastMove],
        firstFrame: lastMove,
        lastFrame: k,
      });
      start = k;
      direction = d;
    }
    lastMove = k + 1;
  }
  if (direction !== 0) branches.push(makeBranch(field, values, start, lastMove, direction, tolerance));
  return { branches, turningPoints, frames: n, options: { tolerance } };
}

function makeBranch(
  field: ArrayLike<number>,
  values: ArrayLike<number> | undefined,
  start: number,
  end: number,
  direction: number,
  tolerance: number,
): Branch {
  const f: number[] = [];
  for (let k = start; k <= end; k++) f.push(field[k]);
  let repeatedFields = 0;
  for (let k = 1; k < f.length; k++) if (Math.abs(f[k] - f[k - 1]) <= tolerance) repeatedFields++;
  const branch: Branch = {
    direction: direction > 0 ? "ascending" : "descending",
    startFrame: start,
    endFrame: end,
    field: f,
    fieldRange: [f.reduce((a, b) => Math.min(a, b)), f.reduce((a, b) => Math.max(a, b))],
    repeatedFields,
  };
  if (values !== undefined) {
    const v: number[] = [];
    for (let k = start; k <= end; k++) v.push(values[k]);
    branch.values = v;
  }
  return branch;
}

/**
 * The slices of another per-frame column on each branch of a split, in branch order: the same
 * branch treatment for any column (e.g. bubble count against field on each branch).
 */
export function branchColumn(split: BranchSplit, column: ArrayLike<number>): number[][] {
  if (column.length !== split.frames) {
    throw new Error(
      `branchColumn: expected a column of ${split.frames} frames (the split sweep), got ${column.length}`,
    );
  }
  return split.branches.map((b) => {
    const out: number[] = [];
    for (let k = b.startFrame; k <= b.endFrame; k++) out.push(column[k]);
    return out;
  });
}
