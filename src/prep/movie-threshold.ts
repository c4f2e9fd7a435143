// A fixed threshold for a whole movie from two frames recorded at saturation: halfway between
// the saturated up and down levels (common practice), so every frame is cut at the same level.
import type { Frame, FrameData } from "../types";
import { checkFrame } from "../frame";
import { medianInPlace } from "./flatten";

export interface SaturationLevel {
  /** The level halfway between the two saturated levels: (upMedian + downMedian) / 2. */
  level: number;
  /** Median sample of the frame saturated up, and of the frame saturated down. */
  upMedian: number;
  downMedian: number;
  /** upMedian - downMedian: negative when up is dark (analyze with `invert: true`). */
  contrast: number;
}

/** Median of a frame's samples (mean of the middle two for an even count); throws on NaN. */
export function frameMedian(frame: Frame, where = "frame"): number {
  checkFrame(frame, where);
  const data: FrameData = frame.data, n = data.length;
  if (data instanceof Float32Array) {
    let bad = 0;
    for (let i = 0; i < n; i++) if (data[i]! - data[i]! !== 0) bad++;
    if (bad > 0) throw new Error(`${where}: expected finite samples, got ${bad} NaN or infinite sample(s)`);
    return medianInPlace(Float32Array.from(data), n);
  }
  // Integer samples: the median from a histogram, without sorting.
  const hist = new Uint32Array(data instanceof Uint8Array ? 256 : 65536);
  for (let i = 0; i < n; i++) hist[data[i]!]!++;
  const kth = (k: number) => { // value of the k-th smallest sample (0-based)
    let seen = 0;
    for (let v = 0; v < hist.length; v++) { seen += hist[v]!; if (seen > k) return v; }
    return hist.length - 1;
  };
  const m = n >> 1;
  return n % 2 === 1 ? kth(m) : 0.5 * (kth(m - 1) + kth(m));
}

/**
 * The threshold for a whole movie from a frame saturated up and a frame saturated down: the
 * mean of their medians. Preprocess both frames as the movie (same background, flattening) so
 * the level is in the units of the frames it will cut; a high-pass flattening removes the very
 * difference between saturated frames, so take the level before it, or use 'zero' after it.
 */
export function levelFromSaturation(frameUp: Frame, frameDown: Frame): SaturationLevel {
  const upMedian = frameMedian(frameUp, "frameUp");
  const downMedian = frameMedian(frameDown, "frameDown");
  return { level: 0.5 * (upMedian + downMedian), upMedian, downMedian, contrast: upMedian - downMedian };
}
