// The ring's peak q* in a radial profile, with sub-bin interpolation.

/** A peak found in a profile: bin of the maximum and the interpolated position (bins). */
export interface ProfilePeak {
  /** Bin holding the largest value in the search range. */
  bin: number;
  /** Interpolated peak position in bins (bin + offset, |offset| <= 1/2). */
  position: number;
  /** Value at the maximum bin (the fitted height after `refinePeak`). */
  value: number;
  /** Interpolation actually used (a Gaussian fit falls back to a parabola on line spectra). */
  interpolation: "gaussian" | "parabolic" | "none";
}

/**
 * Largest value of `values` over bins lo..hi (inclusive), interpolated through the three bins
 * around it: a parabola through the values, or through their logarithms (`gaussian`, exact for a
 * Gaussian peak). Returns undefined when the range is empty or holds no positive value, or when
 * the maximum sits on the edge of the range (no ring inside it).
 */
export function findPeak(
  values: ArrayLike<number>, lo: number, hi: number, interpolation: "gaussian" | "parabolic",
): ProfilePeak | "edge" | undefined {
  lo = Math.max(0, lo);
  hi = Math.min(values.length - 1, hi);
  if (hi < lo) return undefined;
  let bin = -1, best = 0;
  for (let i = lo; i <= hi; i++) {
    const v = values[i]!;
    if (v > best) { best = v; bin = i; }
  }
  if (bin < 0) return undefined;
  if ((bin === lo && lo > 0) || bin === hi) {
    // a maximum on the range edge that keeps rising beyond it is not a ring
    const outside = bin === lo ? values[lo - 1] : values[hi + 1];
    if (outside === undefined || outside >= best) return "edge";
  }
  const a = bin > 0 ? values[bin - 1]! : 0;
  const c = bin + 1 < values.length ? values[bin + 1]! : 0;
  const b = best;
  let offset = 0;
  let used: ProfilePeak["interpolation"] = "none";
  if (interpolation === "gaussian" && a > 0.01 * b && c > 0.01 * b) {
    // parabola through (−1, ln a), (0, ln b), (1, ln c) (Gaussian peak interpolation, common practice)
    const la = Math.log(a), lb = Math.log(b), lc = Math.log(c);
    const den = la - 2 * lb + lc;
    if (den < 0) { offset = (0.5 * (la - lc)) / den; used = "gaussian"; }
  } else {
    const den = a - 2 * b + c;
    if (den < 0) { offset = (0.5 * (a - c)) / den; used = "parabolic"; }
  }
  offset = Math.max(-0.5, Math.min(0.5, offset));
  return { bin, position: bin + offset, value: b, interpolation: used };
}

/**
 * Half width at half maximum of the peak at `position` (bins), from linear interpolation of the
 * crossings of value/2 on both sides; the mean of the sides found (the inner side is searched
 * down to bin 1 only). Undefined when neither side falls below half.
 */
export function peakHalfWidth(values: ArrayLike<number>, peak: ProfilePeak): number | undefined {
  const half = peak.value / 2;
  const sides: number[] = [];
  for (let i = peak.bin + 1; i < values.length; i++) {
    if (values[i]! < half) {
      const v0 = values[i - 1]!, v1 = values[i]!;
      const x = i - 1 + (v0 - half) / (v0 - v1);
      sides.push(Math.max(0, x - peak.position));
      break;
    }
  }
  for (let i = peak.bin - 1; i >= 1; i--) {
    if (values[i]! < half) {
      const v0 = values[i + 1]!, v1 = values[i]!;
      const x = i + 1 - (v0 - half) / (v0 - v1);
      sides.push(Math.max(0, peak.position - x));
      break;
    }
  }
  if (sides.length === 0) return undefined;
  return sides.reduce((s, v) => s + v, 0) / sides.length;
}

/**
 * Refines a broad peak (HWHM of at least 1.5 bins) by a least-squares parabola through the
 * logarithms of every bin within one HWHM of it (a Gaussian fit to the top of the peak, common
 * practice); three-bin interpolation is at the mercy of the noise of single annuli there.
 * Returns the peak unchanged when it is narrow or the fit is not a maximum inside that span.
 */
export function refinePeak(values: ArrayLike<number>, peak: ProfilePeak, halfWidthBins: number | undefined): ProfilePeak {
  if (halfWidthBins === undefined || !(halfWidthBins >= 1.5)) return peak;
  const lo = Math.max(1, Math.ceil(peak.position - halfWidthBins));
  const hi = Math.min(values.length - 1, Math.floor(peak.position + halfWidthBins));
  // normal equations of ln v = a + b x + c x^2, x = i - bin
  let s0 = 0, s1 = 0, s2 = 0, s3 = 0, s4 = 0, t0 = 0, t1 = 0, t2 = 0;
  for (let i = lo; i <= hi; i++) {
    const v = values[i]!;
    if (!(v > 0)) continue;
    const x = i - peak.bin, l = Math.log(v), x2 = x * x;
    s0 += 1; s1 += x; s2 += x2; s3 += x2 * x; s4 += x2 * x2;
    t0 += l; t1 += l * x; t2 += l * x2;
  }
  if (s0 < 4) return peak;
  // solve [[s0 s1 s2] [s1 s2 s3] [s2 s3 s4]] [a b c] = [t0 t1 t2] by Cramer's rule
  const det = s0 * (s2 * s4 - s3 * s3) - s1 * (s1 * s4 - s3 * s2) + s2 * (s1 * s3 - s2 * s2);
  if (!(Math.abs(det) > 1e-12)) return peak;
  const db = s0 * (t1 * s4 - s3 * t2) - t0 * (s1 * s4 - s3 * s2) + s2 * (s1 * t2 - t1 * s2);
  const dc = s0 * (s2 * t2 - t1 * s3) - s1 * (s1 * t2 - t1 * s2) + t0 * (s1 * s3 - s2 * s2);
  const da = t0 * (s2 * s4 - s3 * s3) - s1 * (t1 * s4 - s3 * t2) + s2 * (t1 * s3 - s2 * t2);
  const a = da / det, b = db / det, c = dc / det;
  if (!(c < 0)) return peak;
  const x = -b / (2 * c);
  if (!(Math.abs(peak.bin + x - peak.position) <= halfWidthBins)) return peak;
  // the fitted height: less biased by the noise of one annulus than the largest bin
  const value = Math.exp(a + b * x + c * x * x);
  return { ...peak, position: peak.bin + x, value, interpolation: "gaussian" };
}
