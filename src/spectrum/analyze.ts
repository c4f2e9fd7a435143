// One-shot spectrum analysis of a frame (copy in, plain data out).
import type { Frame } from "../types";
import { checkFrame, resolveSpectrumOptions, type SpectrumOptions } from "./options";
import type { SpectrumResult } from "./result";
import { createSpectrumWorkspace, SPECTRUM_MIN_SIDE } from "./workspace";

/**
 * Power spectrum, radial profile, period, correlation length and orientational order of one
 * frame. For a sequence, create a workspace once with `createSpectrumWorkspace` instead.
 * Frames below 8 px a side give `period: undefined` with a `reason`; malformed frames or options
 * throw.
 */
export function analyzeSpectrum(frame: Frame, options?: SpectrumOptions): SpectrumResult {
  checkFrame(frame);
  if (frame.width < SPECTRUM_MIN_SIDE || frame.height < SPECTRUM_MIN_SIDE) {
    const opts = resolveSpectrumOptions(frame, options);
    return {
      width: frame.width, height: frame.height, unit: opts.lengthUnit, options: opts,
      period: undefined, peakQ: undefined,
      reason: `frame too small for a ring: ${frame.width} x ${frame.height}, need at least ${SPECTRUM_MIN_SIDE} px a side`,
      ringHalfWidthQ: undefined, corrLength: undefined, corrLengthResolved: false,
      order2: undefined, order2AngleDeg: undefined, order6: undefined, order6AngleDeg: undefined,
      variance: undefined, mean: undefined,
      profile: { q: [], annulusMean: [], annulusIntegral: [], points: [], binWidth: 1 / Math.max(frame.width, frame.height) / (opts.pixelSize ?? 1) },
      angular: undefined,
    };
  }
  const ws = createSpectrumWorkspace(frame.width, frame.height);
  try {
    return ws.analyze(frame, options);
  } finally {
    ws.dispose();
  }
}
