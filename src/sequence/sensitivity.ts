// Threshold sensitivity: the per-phase numbers of one frame at t - delta, t and t + delta, to see
// how much a result depends on where the level between the phases was put.
import type { Frame } from "../types";
import { checkFrame, checkPositive } from "../frame";
import { analyzeFrame, type PhaseSummary } from "../topology/analyze";
import type { FrameOptions } from "../topology/options";
import type { ResolvedLevel } from "../prep/threshold";

export interface SensitivityPoint {
  /** The level analyzed, and how analyzeFrame applied it (integer samples: up when >= cut). */
  threshold: ResolvedLevel;
  magnetization: number;
  wallLengthDensity: number;
  up: PhaseSummary;
  down: PhaseSummary;
}

export interface ThresholdSensitivity {
  /** The central level t: options.threshold, or the level that 'otsu' / 'zero' resolved to. */
  level: number;
  delta: number;
  /** Results at t - delta, t, t + delta. */
  points: [SensitivityPoint, SensitivityPoint, SensitivityPoint];
  /** Largest minus smallest value over the three points. */
  spread: { magnetization: number; upDomains: number; downDomains: number; upEuler: number; downEuler: number; wallLengthDensity: number };
  /** Set when the three levels do not all cut integer samples differently (delta below 1 sample step). */
  note?: string;
}

function point(frame: Frame, options: FrameOptions, level: number): SensitivityPoint {
  const r = analyzeFrame(frame, { ...options, threshold: level, keepLabels: false });
  return { threshold: r.threshold, magnetization: r.magnetization, wallLengthDensity: r.wallLengthDensity, up: r.up, down: r.down };
}

/**
 * Runs analyzeFrame at t - delta, t and t + delta (delta in sample units) with the other options
 * unchanged, and returns each point's per-phase numbers and their spread.
 */
export function thresholdSensitivity(frame: Frame, options: FrameOptions = {}, delta: number): ThresholdSensitivity {
  checkFrame(frame);
  checkPositive("delta", delta);
  let level: number;
  if (typeof options.threshold === "number") level = options.threshold;
  else level = analyzeFrame(frame, { ...options, keepLabels: false }).threshold.level;
  const points = [point(frame, options, level - delta), point(frame, options, level), point(frame, options, level + delta)] as
    [SensitivityPoint, SensitivityPoint, SensitivityPoint];
  const range = (f: (p: SensitivityPoint) => number) => {
    const v = points.map(f);
    return Math.max(...v) - Math.min(...v);
  };
  const result: ThresholdSensitivity = {
    level, delta, points,
    spread: {
      magnetization: range((p) => p.magnetization),
      upDomains: range((p) => p.up.domains),
      downDomains: range((p) => p.down.domains),
      upEuler: range((p) => p.up.euler),
      downEuler: range((p) => p.down.euler),
      wallLengthDensity: range((p) => p.wallLengthDensity),
    },
  };
  const cuts = new Set(points.map((p) => p.threshold.cut));
  if (cuts.size < 3) {
    result.note = `delta ${delta} is below the sample step here: the three levels cut the samples in only ${cuts.size} distinct way(s)`;
  }
  return result;
}
