// Synthetic sweeps with known answers, for tests and the demo. Everything here is SYNTHETIC:
// model curves, never measured data.

/** A synthetic per-frame sweep: applied field and magnetization at each frame. */
export interface SyntheticSweep {
  field: number[];
  magnetization: number[];
  /** Always true: these data come from a model, not a measurement. */
  synthetic: true;
}

/** Options of {@link tanhLoop}. Fields and m in arbitrary consistent units. */
export interface TanhLoopOptions {
  /** Ms. @default 1 */
  saturation?: number;
  /** Hc. @default 1 */
  coerciveField?: number;
  /** w, the width of each branch's switching. @default 0.5 */
  width?: number;
  /** Field offset of the whole loop (loop shift). @default 0 */
  shift?: number;
  /** The sweep runs +fieldMax -> -fieldMax -> +fieldMax. @default 5 */
  fieldMax?: number;
  /** Field step between frames. @default 0.05 */
  fieldStep?: number;
  /** Frames recorded at the turning field -fieldMax (1 = one frame shared by both branches). @default 1 */
  turningRepeats?: number;
}

/**
 * SYNTHETIC tanh loop sampled along a field sweep starting from positive saturation:
 * M_desc = Ms tanh((H - shift + Hc)/w), M_asc = Ms tanh((H - shift - Hc)/w). For a field range wide
 * against w it has coercive fields shift +- Hc, remanence Ms tanh(Hc/w) (at shift 0) and loop area
 * 4 Ms Hc.
 */
export function tanhLoop(options: TanhLoopOptions = {}): SyntheticSweep & { options: Required<TanhLoopOptions> } {
  const o: Required<TanhLoopOptions> = {
    saturation: 1,
    coerciveField: 1,
    width: 0.5,
    shift: 0,
    fieldMax: 5,
    fieldStep: 0.05,
    turningRepeats: 1,
    ...options,
  };
  if (!(o.fieldStep > 0 && o.fieldMax > 0 && o.width > 0)) {
    throw new Error("tanhLoop: expected fieldStep, fieldMax and width > 0");
  }
  if (!Number.isInteger(o.turningRepeats) || o.turningRepeats < 1) {
    throw new Error(`tanhLoop: expected an integer turningRepeats >= 1, got ${o.turningRepeats}`);
  }
  const steps = Math.round((2 * o.fieldMax) / o.fieldStep);
  const field: number[] = [];
  const magnetization: number[] = [];
  const desc = (h: number) => o.saturation * Math.tanh((h - o.shift + o.coerciveField) / o.width);
  const asc = (h: number) => o.saturation * Math.tanh((h - o.shift - o.coerciveField) / o.width);
  for (let k = 0; k <= steps; k++) {
    const h = o.fieldMax - (2 * o.fieldMax * k) / steps;
    field.push(h);
    magnetization.push(desc(h));
  }
  for (let r = 1; r < o.turningRepeats; r++) {
    field.push(-o.fieldMax);
    magnetization.push(desc(-o.fieldMax));
  }
  for (let k = 1; k <= steps; k++) {
    const h = -o.fieldMax + (2 * o.fieldMax * k) / steps;
    field.push(h);
    magnetization.push(asc(h));
  }
  return { field, magnetization, synthetic: true, options: o };
}

/** Options of {@link hysteronEnsemble}. */
export interface HysteronEnsembleOptions {
  /** Ms, the moment of the whole ensemble. @default 1 */
  saturation?: number;
  /** Mean of the Gaussian p_c(Hc) (truncated to Hc >= 0 and renormalized). @default 0.5 */
  coercivityMean?: number;
  /** Standard deviation of p_c. @default 0.1 */
  coercivitySpread?: number;
  /** Mean of the Gaussian p_u(Hu). @default 0 */
  interactionMean?: number;
  /** Standard deviation of p_u. @default 0.1 */
  interactionSpread?: number;
}

/**
 * SYNTHETIC ensemble of independent square hysterons (a Preisach model): each switches up at
 * alpha = Hu + Hc and down at beta = Hu - Hc, with Hc and Hu independent, Gaussian p_c and p_u.
 * Evaluated analytically (one numerical integral over Hc per value). Its FORC distribution is
 * rho(Ha, Hb) = (Ms/2) p_c(Hc) p_u(Hu) at Hc = (Hb - Ha)/2, Hu = (Ha + Hb)/2 (CHECKS.md; Pike,
 * Roberts & Verosub 1999).
 */
export interface HysteronEnsemble {
  options: Required<HysteronEnsembleOptions>;
  /** M on the reversal curve at Hb after saturating up and reversing at Ha (Hb >= Ha). */
  magnetization(reversalField: number, field: number): number;
  /** M on the major descending branch (from positive saturation) at H. */
  descending(field: number): number;
  /** M on the major ascending branch (from negative saturation) at H. */
  ascending(field: number): number;
  /** The exact rho(Ha, Hb) = (Ms/2) p_c p_u (0 for Hb < Ha). */
  forcDensity(reversalField: number, field: number): number;
}

/** Builds a SYNTHETIC {@link HysteronEnsemble}. */
export function hysteronEnsemble(options: HysteronEnsembleOptions = {}): HysteronEnsemble {
  const o: Required<HysteronEnsembleOptions> = {
    saturation: 1,
    coercivityMean: 0.5,
    coercivitySpread: 0.1,
    interactionMean: 0,
    interactionSpread: 0.1,
    ...options,
  };
  if (!(o.coercivitySpread > 0 && o.interactionSpread > 0)) {
    throw new Error("hysteronEnsemble: expected coercivitySpread and interactionSpread > 0");
  }
  const { coercivityMean: mc, coercivitySpread: sc, interactionMean: mu, interactionSpread: su } = o;
  const mass = upperTail(-mc / sc); // share of p_c at Hc >= 0
  const hcLo = Math.max(0, mc - 9 * sc);
  const hcHi = Math.max(hcLo, mc + 9 * sc);
  const pc = (h: number) => (h < 0 ? 0 : gaussian(h, mc, sc) / mass);
  const pu = (h: number) => gaussian(h, mu, su);
  // Share of hysterons still down after (+saturation -> Ha -> Hb): beta >= Ha and alpha > Hb, i.e.
  // Hu >= max(Ha + Hc, Hb - Hc). Integrated over Hc by Simpson's rule, split at the kink
  // Hc = (Hb - Ha)/2 so that each piece is smooth.
  const downShare = (ha: number, hb: number): number => {
    const integrand = (h: number) => pc(h) * upperTail((Math.max(ha + h, hb - h) - mu) / su);
    const kink = (hb - ha) / 2;
    if (kink > hcLo && kink < hcHi) return simpson(integrand, hcLo, kink, 200) + simpson(integrand, kink, hcHi, 200);
    return simpson(integrand, hcLo, hcHi, 400);
  };
  const magnetization = (ha: number, hb: number) =>
    o.saturation * (1 - 2 * downShare(ha, Math.max(ha, hb)));
  return {
    options: o,
    magnetization,
    descending: (h) => magnetization(h, h),
    ascending: (h) => magnetization(-Infinity, h),
    forcDensity: (ha, hb) => (hb < ha ? 0 : (o.saturation / 2) * pc((hb - ha) / 2) * pu((ha + hb) / 2)),
  };
}

/** Options of {@link hysteronReversalCurves} and {@link hysteronSweep}. */
export interface ReversalFamilyOptions {
  /** Lowest reversal field Ha. @default -1.2 */
  firstReversal?: number;
  /** Highest reversal field Ha. @default 0.2 */
  lastReversal?: number;
  /** Step between reversal fields and between samples along each curve. @default 0.02 */
  fieldStep?: number;
  /** Each curve runs from Ha up to about this field (the saturating field). @default 1.2 */
  fieldMax?: number;
}

function family(o: ReversalFamilyOptions): Required<ReversalFamilyOptions> & { reversals: number[] } {
  const r: Required<ReversalFamilyOptions> = { firstReversal: -1.2, lastReversal: 0.2, fieldStep: 0.02, fieldMax: 1.2, ...o };
  if (!(r.fieldStep > 0) || !(r.lastReversal >= r.firstReversal) || !(r.fieldMax >= r.lastReversal)) {
    throw new Error("reversal family: expected fieldStep > 0 and firstReversal <= lastReversal <= fieldMax");
  }
  const n = Math.floor((r.lastReversal - r.firstReversal) / r.fieldStep + 1e-9) + 1;
  return { ...r, reversals: Array.from({ length: n }, (_, k) => r.firstReversal + k * r.fieldStep) };
}

/** Fields ha, ha + step, ... up to max (inclusive within rounding). */
function rampFrom(ha: number, step: number, max: number): number[] {
  const n = Math.floor((max - ha) / step + 1e-9);
  return Array.from({ length: n + 1 }, (_, j) => ha + j * step);
}

/**
 * SYNTHETIC family of reversal curves of a hysteron ensemble: one curve per Ha from
 * `firstReversal` to `lastReversal`, each sampled at Ha, Ha + step, ... up to `fieldMax`.
 */
export function hysteronReversalCurves(
  model: HysteronEnsemble,
  options: ReversalFamilyOptions = {},
): { reversalField: number; field: number[]; values: number[] }[] {
  const f = family(options);
  return f.reversals.map((ha) => {
    const field = rampFrom(ha, f.fieldStep, f.fieldMax);
    return { reversalField: ha, field, values: field.map((hb) => model.magnetization(ha, hb)) };
  });
}

/**
 * The same SYNTHETIC family as one per-frame sweep, as a movie would record it: for each Ha, down
 * from the top field to Ha along the major descending branch, then up again along the reversal
 * curve (turning frames shared: the top of one curve starts the next descent).
 */
export function hysteronSweep(model: HysteronEnsemble, options: ReversalFamilyOptions = {}): SyntheticSweep {
  const f = family(options);
  const field: number[] = [];
  const magnetization: number[] = [];
  for (const ha of f.reversals) {
    const up = rampFrom(ha, f.fieldStep, f.fieldMax);
    // The top frame of the previous curve is the turning frame: descend from the next field down.
    for (let j = field.length === 0 ? up.length - 1 : up.length - 2; j >= 1; j--) {
      field.push(up[j]);
      magnetization.push(model.descending(up[j]));
    }
    for (const hb of up) {
      field.push(hb);
      magnetization.push(model.magnetization(ha, hb));
    }
  }
  return { field, magnetization, synthetic: true };
}

/** Options of {@link hysteronMajorLoop}. */
export interface HysteronMajorLoopOptions {
  /** The loop runs +fieldMax -> -fieldMax -> +fieldMax. @default 1.2 */
  fieldMax?: number;
  /** Field step between frames. @default 0.02 */
  fieldStep?: number;
}

/** SYNTHETIC major loop of a hysteron ensemble: +fieldMax -> -fieldMax -> +fieldMax. */
export function hysteronMajorLoop(model: HysteronEnsemble, options: HysteronMajorLoopOptions = {}): SyntheticSweep {
  const fieldMax = options.fieldMax ?? 1.2;
  const step = options.fieldStep ?? 0.02;
  const ramp = rampFrom(-fieldMax, step, fieldMax);
  const field = [...ramp].reverse().concat(ramp.slice(1));
  const magnetization = [...ramp].reverse().map(model.descending).concat(ramp.slice(1).map(model.ascending));
  return { field, magnetization, synthetic: true };
}

function gaussian(x: number, mean: number, sd: number): number {
  const z = (x - mean) / sd;
  return Math.exp(-0.5 * z * z) / (sd * Math.sqrt(2 * Math.PI));
}

/** P(Z > z) for a standard normal Z. */
export function upperTail(z: number): number {
  return 0.5 * erfc(z / Math.SQRT2);
}

/**
 * Complementary error function to about 1e-15: the series
 * erf(x) = (2/sqrt(pi)) exp(-x^2) sum (2x^2)^n x / (1 * 3 * ... * (2n + 1)) (all terms positive)
 * for |x| < 2.5, the continued fraction erfc(x) = exp(-x^2)/sqrt(pi) / (x + (1/2)/(x + 1/(x + ...)))
 * above (Abramowitz & Stegun 7.1.6 and 7.1.14).
 */
export function erfc(x: number): number {
  if (x < 0) return 2 - erfc(-x);
  if (x < 2.5) {
    const x2 = x * x;
    let term = x;
    let sum = x;
    for (let n = 0; n < 200 && term > 1e-17 * sum; n++) {
      term *= (2 * x2) / (2 * n + 3);
      sum += term;
    }
    return 1 - (2 / Math.sqrt(Math.PI)) * Math.exp(-x2) * sum;
  }
  let f = x;
  for (let k = 60; k >= 1; k--) f = x + k / 2 / f;
  return Math.exp(-x * x) / (Math.sqrt(Math.PI) * f);
}

function simpson(f: (x: number) => number, a: number, b: number, n: number): number {
  if (b <= a) return 0;
  const h = (b - a) / n;
  let sum = f(a) + f(b);
  for (let k = 1; k < n; k++) sum += (k % 2 ? 4 : 2) * f(a + k * h);
  return (sum * h) / 3;
}
