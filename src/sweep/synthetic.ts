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
