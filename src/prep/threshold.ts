// Threshold levels: fixed, zero (signed simulation data) or Otsu's, resolved per frame.
import type { LabelingWorkspace } from "../wasm/labeling";
import { otsuBin } from "./otsu";

/** A level in sample units, `'otsu'` (Otsu 1979, per frame) or `'zero'` (signed data). */
export type ThresholdOption = number | "otsu" | "zero";

/** Bins of the histogram for Otsu's level on float samples (over their range). */
export const FLOAT_OTSU_BINS = 1024;

export interface ResolvedLevel {
  /** A sample is up when it is above this level (before `invert`). */
  level: number;
  /** Integer samples: up when the sample is >= cut. Float samples: equal to level. */
  cut: number;
  method: "fixed" | "zero" | "otsu";
  /** Set when the level could not be chosen as asked (e.g. Otsu on a uniform frame). */
  note?: string;
}

const UNIFORM = "the frame is uniform, so Otsu's method has no split: every pixel is taken as down";

/** Resolves the level for the samples loaded in `ws` (kind 0 u8, 1 u16, 2 f32). */
export function resolveLevel(
  ws: LabelingWorkspace, kind: 0 | 1 | 2, option: ThresholdOption, where: string,
): ResolvedLevel {
  if (kind === 2) {
    const range = ws.floatRange();
    if (range.nan > 0) {
      throw new Error(`${where}: expected finite samples, got ${range.nan} NaN sample(s)`);
    }
    if (typeof option === "number") return { level: option, cut: option, method: "fixed" };
    if (option === "zero") return { level: 0, cut: 0, method: "zero" };
    const hist = ws.floatHistogram(range.lo, range.hi, FLOAT_OTSU_BINS);
    const t = otsuBin(hist);
    if (t < 0) return { level: range.hi, cut: range.hi, method: "otsu", note: UNIFORM };
    const level = range.lo + ((t + 1) * (range.hi - range.lo)) / FLOAT_OTSU_BINS;
    return { level, cut: level, method: "otsu" };
  }
  const top = kind === 0 ? 256 : 65536;
  const cutOf = (level: number) => Math.min(top, Math.max(0, Math.floor(level) + 1));
  if (typeof option === "number") return { level: option, cut: cutOf(option), method: "fixed" };
  if (option === "zero") return { level: 0, cut: 1, method: "zero" };
  const t = otsuBin(ws.integerHistogram(kind));
  if (t < 0) return { level: top - 1, cut: top, method: "otsu", note: UNIFORM };
  return { level: t + 0.5, cut: t + 1, method: "otsu" };
}
