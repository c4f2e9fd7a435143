// The built-in hysteretic demo: an invented Preisach-like lattice. Each pixel is a square hysteron
// that switches up at alpha = -s X + Hk and down at beta = -s X - Hk, where X is a unit-variance
// Gaussian random field with a ring spectrum (so neighbouring pixels switch together and the
// states form domains) and Hk = H0 (1 + 0.3 Y) > 0 is a local coercivity from a smoother field Y.
// A pixel turns up when H >= alpha, down when H <= beta, and otherwise keeps its state, so the
// frames remember the field history: a major loop and first-order reversal curves (FORC).
// SYNTHETIC: the frames are generated, never measured.
import type { Frame } from "../types";
import { gaussianRandomField, hexGaussianRandomField } from "./grf";
import { normalSource, uniformSource } from "./random";
import { checkSize } from "../frame";

export interface HysteresisDemoOptions {
  /** Frame side in pixels (a power of two). @default 128 */
  size?: number;
  /** Frames on each branch of the major loop, both turning fields included. @default 61 */
  framesPerBranch?: number;
  /** Number of first-order reversal curves. @default 12 */
  reversalCurves?: number;
  /** Seed of both random fields and of the camera noise. @default 5 */
  seed?: number;
  /** `'hex'`: the fields sampled at hexagonal sites in offset rows (see DemoSweepOptions.grid). @default 'square' */
  grid?: "square" | "hex";
}

/** Where a frame sits in the field history. */
export type HysteresisSegment = "major-descending" | "major-ascending" | `reversal ${number}`;

export interface HysteresisFrameInfo {
  segment: HysteresisSegment;
  /** Ha of the reversal curve (`null` on the major loop). */
  reversalField: number | null;
  /** The applied field of the frame (Hb on a reversal curve). */
  field: number;
}

export interface HysteresisDemo {
  /** What the data pretend to be; they are generated, not measured. */
  scenario: string;
  synthetic: true;
  pixelSize: number;
  unit: string;
  fieldUnit: string;
  width: number;
  height: number;
  /** Grey level halfway between the saturated levels (the fixed threshold to use). */
  threshold: number;
  /** The major loop runs +saturationField -> -saturationField -> +saturationField. */
  saturationField: number;
  /** Field step between frames of a branch or a reversal curve. */
  fieldStep: number;
  /** Model constants: s (field per unit of X) and H0 (median coercivity), in field units. */
  model: { interactionScale: number; coercivityScale: number; coercivityVariation: number; periodPx: number };
  /** The reversal fields Ha, descending (the order of the curves). */
  reversalFields: number[];
  /** Every frame in recording order: major descending, major ascending, then curve after curve. */
  frames: HysteresisFrameInfo[];
  /** Frame k as 8-bit grey samples (bright = up), with camera noise. */
  frame(k: number): Frame & { data: Uint8Array };
  /** The noise-free state of frame k (1 up, 0 down). */
  state(k: number): Uint8Array;
}

const PIXEL_NM = 20;
const PERIOD_PX = 16;
/** s: field (mT) that moves a pixel's switching fields by one standard deviation of X. */
const INTERACTION_MT = 8;
/** H0: median coercivity (mT). */
const COERCIVITY_MT = 10;
const COERCIVITY_VARIATION = 0.3;
const SATURATION_MT = 60;
/** Reversal fields are this many field steps apart. */
const REVERSAL_SPACING_STEPS = 2;

const round6 = (x: number) => Number(x.toFixed(6));

/** A SYNTHETIC hysteretic sweep (major loop plus reversal curves) of an invented film. */
export function hysteresisDemo(options: HysteresisDemoOptions = {}): HysteresisDemo {
  const size = checkSize("hysteresis demo size", options.size ?? 128);
  const perBranch = checkSize("hysteresis demo framesPerBranch", options.framesPerBranch ?? 61);
  if (perBranch < 3) throw new Error(`hysteresis demo framesPerBranch: expected at least 3, got ${perBranch}`);
  const curves = checkSize("hysteresis demo reversalCurves", options.reversalCurves ?? 12);
  const seed = options.seed ?? 5;
  const grf = options.grid === "hex" ? hexGaussianRandomField : gaussianRandomField;
  const x = grf({ width: size, height: size, period: PERIOD_PX, bandwidth: 0.15, seed });
  const y = grf({ width: size, height: size, spectrum: "gaussian", smoothing: 12, seed: seed + 101 });
  const n = size * size;
  const alpha = new Float32Array(n);
  const beta = new Float32Array(n);
  for (let i = 0; i < n; i++) {
    // Keep Hk positive (alpha > beta) even where Y is far out in its tail.
    const hk = COERCIVITY_MT * Math.max(0.1, 1 + COERCIVITY_VARIATION * y.data[i]!);
    const middle = -INTERACTION_MT * x.data[i]!;
    alpha[i] = middle + hk;
    beta[i] = middle - hk;
  }
  const step = (2 * SATURATION_MT) / (perBranch - 1);
  const frames: HysteresisFrameInfo[] = [];
  for (let k = 0; k < perBranch; k++) {
    frames.push({ segment: "major-descending", reversalField: null, field: round6(SATURATION_MT - k * step) });
  }
  for (let k = 1; k < perBranch; k++) {
    frames.push({ segment: "major-ascending", reversalField: null, field: round6(-SATURATION_MT + k * step) });
  }
  // Reversal fields on the descending branch's own fields, centred on -H0 (where the branch
  // crosses m = 0), REVERSAL_SPACING_STEPS steps apart, clipped to the branch.
  const centre = Math.round((SATURATION_MT + COERCIVITY_MT) / step);
  const reversalFields: number[] = [];
  for (let c = 0; c < curves; c++) {
    const offset = Math.round(((curves - 1) / 2 - c) * REVERSAL_SPACING_STEPS);
    const k = Math.max(1, Math.min(perBranch - 2, centre - offset));
    const ha = frames[k]!.field;
    if (!reversalFields.includes(ha)) reversalFields.push(ha);
  }
  reversalFields.forEach((ha, c) => {
    const segment = `reversal ${c + 1}` as HysteresisSegment;
    for (let j = 0; ; j++) {
      const hb = round6(ha + j * step);
      if (hb > SATURATION_MT + 1e-9) break;
      frames.push({ segment, reversalField: ha, field: hb });
    }
  });

  // Camera noise: one table of normal numbers, read from a seeded offset per frame (cheaper than
  // fresh normals for every pixel of hundreds of frames; neighbouring frames share no window).
  const noiseTable = new Float32Array(4 * n);
  const normal = normalSource(seed * 104729 + 1);
  for (let i = 0; i < noiseTable.length; i++) noiseTable[i] = normal();

  const state = (k: number): Uint8Array => {
    if (!Number.isInteger(k) || k < 0 || k >= frames.length) {
      throw new Error(`hysteresis demo frame: expected an index in 0..${frames.length - 1}, got ${k}`);
    }
    const f = frames[k]!;
    const out = new Uint8Array(n);
    // After saturating up, going down to Ha and up again to Hb >= Ha, a pixel is up when it never
    // switched down (Ha > beta) or switched back up (Hb >= alpha). The major descending branch is
    // Ha = H; the major ascending branch starts from Ha = -saturationField.
    const ha = f.segment === "major-descending" ? f.field : f.segment === "major-ascending" ? -SATURATION_MT : f.reversalField!;
    const hb = f.field;
    for (let i = 0; i < n; i++) out[i] = ha > beta[i]! || hb >= alpha[i]! ? 1 : 0;
    return out;
  };

  const scenario =
    `Synthetic hysteresis of an invented perpendicular-anisotropy film ("sample DT-H"), ` +
    `${options.grid === "hex" ? `simulated on a hexagonal lattice of ${PIXEL_NM} nm lattice constant (offset rows)` : `imaged at ${PIXEL_NM} nm per pixel`}: a major loop from +${SATURATION_MT} to -${SATURATION_MT} mT and back, and ` +
    `${reversalFields.length} first-order reversal curves. Each ${options.grid === "hex" ? "site" : "pixel"} is a square hysteron with switching ` +
    `fields -s X +- Hk (X a Gaussian random field of period ${PERIOD_PX * PIXEL_NM} nm, s = ${INTERACTION_MT} mT, ` +
    `Hk about ${COERCIVITY_MT} mT); frames are generated with camera noise, not measurements.`;

  return {
    scenario, synthetic: true, pixelSize: PIXEL_NM, unit: "nm", fieldUnit: "mT", width: size, height: size,
    threshold: 127.5, saturationField: SATURATION_MT, fieldStep: step,
    model: {
      interactionScale: INTERACTION_MT, coercivityScale: COERCIVITY_MT,
      coercivityVariation: COERCIVITY_VARIATION, periodPx: PERIOD_PX,
    },
    reversalFields, frames, state,
    frame(k: number) {
      const s = state(k);
      const start = Math.floor(uniformSource(seed * 7919 + k + 1)() * 3 * n);
      const data = new Uint8Array(n);
      for (let i = 0; i < n; i++) {
        const v = (s[i] ? 228 : 28) + 6 * noiseTable[start + i]!;
        data[i] = v < 0 ? 0 : v > 255 ? 255 : Math.round(v);
      }
      return { width: size, height: size, data };
    },
  };
}
