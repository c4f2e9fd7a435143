// Domain period from the wall length per area.

/**
 * Period of a stripe pattern from its wall length per area L_A: a stripe pattern of period P
 * has two walls per period, so L_A = 2 / P and P = 2 / L_A (common practice; exact for straight
 * parallel stripes, an estimate for curved ones). Units: L_A in 1/length gives P in length.
 * Returns undefined for L_A <= 0 (no walls); throws on NaN or infinite input.
 */
export function periodFromWallLength(wallLengthDensity: number): number | undefined {
  if (typeof wallLengthDensity !== "number" || !Number.isFinite(wallLengthDensity)) {
    throw new RangeError(`domtopo: wall length per area must be a finite number, got ${String(wallLengthDensity)}`);
  }
  if (wallLengthDensity <= 0) return undefined;
  return 2 / wallLengthDensity;
}
