// Piecewise-linear helpers shared by the sweep layer: interpolation on a sorted axis, level
// crossings along a sequence, trapezoid integration. Internal; not re-exported by the index.

/**
 * Index `k` with `xs[k] <= x <= xs[k + 1]` on an ascending axis (binary search), or -1 when `x`
 * lies outside `[xs[0], xs[n - 1]]`. `slack` widens the range on both ends.
 */
export function bracket(xs: ArrayLike<number>, x: number, slack = 0): number {
  const n = xs.length;
  if (n === 0 || x < xs[0] - slack || x > xs[n - 1] + slack) return -1;
  if (n === 1) return 0;
  let lo = 0;
  let hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (xs[mid] <= x) lo = mid;
    else hi = mid;
  }
  return lo;
}

/**
 * Linear interpolation of `ys` over an ascending axis `xs` at `x`; `undefined` outside the axis
 * (beyond `slack`, within which the end value is used).
 */
export function interpolateAt(
  xs: ArrayLike<number>,
  ys: ArrayLike<number>,
  x: number,
  slack = 0,
): number | undefined {
  const k = bracket(xs, x, slack);
  if (k < 0) return undefined;
  if (xs.length === 1) return ys[0];
  const x0 = xs[k];
  const x1 = xs[k + 1];
  if (x <= x0) return ys[k];
  if (x >= x1) return ys[k + 1];
  const t = (x - x0) / (x1 - x0);
  return ys[k] + t * (ys[k + 1] - ys[k]);
}

/** Nearest sample of `ys` over an ascending axis `xs` at `x`; `undefined` outside the axis. */
export function nearestAt(
  xs: ArrayLike<number>,
  ys: ArrayLike<number>,
  x: number,
  slack = 0,
): number | undefined {
  const k = bracket(xs, x, slack);
  if (k < 0) return undefined;
  if (xs.length === 1) return ys[0];
  return x - xs[k] <= xs[k + 1] - x ? ys[k] : ys[k + 1];
}

/** A place along a sequence where `ys` reaches a level: fractional position and interpolated x. */
export interface Crossing {
  /** Fractional sample position: `k + t` between samples `k` and `k + 1`. */
  position: number;
  /** `xs` interpolated at the crossing. */
  x: number;
}

/**
 * Every place, in sequence order, where `ys` passes `level` upward (`"up"`: from below to at or
 * above) or downward (`"down"`), linearly interpolated between the two samples that bracket it.
 */
export function crossings(
  xs: ArrayLike<number>,
  ys: ArrayLike<number>,
  level: number,
  direction: "up" | "down",
): Crossing[] {
  const found: Crossing[] = [];
  for (let k = 0; k + 1 < ys.length; k++) {
    const a = ys[k] - level;
    const b = ys[k + 1] - level;
    const passes = direction === "up" ? a < 0 && b >= 0 : a > 0 && b <= 0;
    if (!passes) continue;
    const t = a / (a - b);
    found.push({ position: k + t, x: xs[k] + t * (xs[k + 1] - xs[k]) });
  }
  return found;
}

/** Trapezoid integral of `ys` over `xs` (any order of `xs`; the sign follows it). */
export function trapezoid(xs: ArrayLike<number>, ys: ArrayLike<number>): number {
  let sum = 0;
  for (let k = 0; k + 1 < xs.length; k++) sum += 0.5 * (ys[k] + ys[k + 1]) * (xs[k + 1] - xs[k]);
  return sum;
}

/** `n` evenly spaced values from `start` to `stop` inclusive. */
export function linspace(start: number, stop: number, n: number): number[] {
  if (n === 1) return [start];
  const out = new Array<number>(n);
  for (let k = 0; k < n; k++) out[k] = start + ((stop - start) * k) / (n - 1);
  return out;
}

/** Median of a list of numbers (NaN-free), or `undefined` for an empty list. */
export function median(values: number[]): number | undefined {
  if (values.length === 0) return undefined;
  const s = [...values].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : 0.5 * (s[m - 1] + s[m]);
}

/** Throws when `a` and `b` differ in length, naming both. */
export function checkSameLength(
  what: string,
  a: ArrayLike<number>,
  aName: string,
  b: ArrayLike<number>,
  bName: string,
): void {
  if (a.length !== b.length) {
    throw new Error(
      `${what}: expected ${aName} and ${bName} of equal length, got ${a.length} and ${b.length}`,
    );
  }
}

/** Throws at the first non-finite entry of a field array. */
export function checkFiniteField(what: string, field: ArrayLike<number>, name = "field"): void {
  for (let k = 0; k < field.length; k++) {
    if (!Number.isFinite(field[k])) {
      throw new Error(`${what}: expected a finite ${name} at every frame, got ${field[k]} at frame ${k}`);
    }
  }
}
