// Orientational order of the ring: power-weighted averages of e^{2 i theta} and e^{6 i theta}
// over the ring band, theta the angle of the wavevector.

/** Order parameters of an angular distribution. */
export interface RingOrder {
  /** Nematic (two-fold) order |<e^{2 i theta}>|, 0 (isotropic) .. 1 (one stripe direction). */
  order2: number;
  /** Direction of the dominant wavevector (normal to the stripes), degrees in [0, 180). */
  order2AngleDeg: number;
  /** Six-fold order |<e^{6 i theta}>|, 1 for a perfect hexagonal (bubble) lattice. */
  order6: number;
  /** Angle of one of the six wavevectors, degrees in [0, 60). */
  order6AngleDeg: number;
}

/** Normalises an angle in degrees into [0, period). */
export function wrapDeg(deg: number, period: number): number {
  let d = deg % period;
  if (d < 0) d += period;
  if (d >= period - 1e-9) d = 0;
  return d;
}

/**
 * Order parameters from power-weighted moments [sum P, sum P cos 2t, sum P sin 2t,
 * sum P cos 6t, sum P sin 6t] (bond-orientational order, Halperin & Nelson 1978, PRL 41:121,
 * applied to the ring's power as weight). Undefined when the ring holds no power.
 */
export function ringOrder(m: ArrayLike<number>): RingOrder | undefined {
  const p = m[0]!;
  if (!(p > 0)) return undefined;
  const c2 = m[1]! / p, s2 = m[2]! / p, c6 = m[3]! / p, s6 = m[4]! / p;
  return {
    order2: Math.min(1, Math.hypot(c2, s2)),
    order2AngleDeg: wrapDeg((Math.atan2(s2, c2) * 90) / Math.PI, 180),
    order6: Math.min(1, Math.hypot(c6, s6)),
    order6AngleDeg: wrapDeg((Math.atan2(s6, c6) * 30) / Math.PI, 60),
  };
}
