// A quantity that is either computed or comes with the reason it could not be.

/**
 * One computed number (or object) of a sweep result. When the input does not allow it, `value` is
 * `undefined` and `reason` says why in plain words, so a result never carries a silent NaN.
 */
export type Outcome<T> = { value: T; reason?: undefined } | { value: undefined; reason: string };

/** A computed outcome. */
export function ok<T>(value: T): Outcome<T> {
  return { value };
}

/** An outcome that could not be computed, with the reason. */
export function missing<T>(reason: string): Outcome<T> {
  return { value: undefined, reason };
}

/** Combines two outcomes with `f`, or passes on the first reason. */
export function combine<A, B, T>(a: Outcome<A>, b: Outcome<B>, f: (a: A, b: B) => T): Outcome<T> {
  if (a.value === undefined) return missing(a.reason ?? "not computed");
  if (b.value === undefined) return missing(b.reason ?? "not computed");
  return ok(f(a.value, b.value));
}
