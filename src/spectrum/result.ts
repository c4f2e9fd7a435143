// Plain-data results of the spectrum analysis.
import type { ResolvedSpectrumOptions } from "./options";

/**
 * Radial profile of the power spectrum S(k) = |F(k)|^2 / sum(window^2) of the mean-removed,
 * windowed signal (normalised so that the mean of S over all k is the windowed variance).
 * Bin b collects the k with |q| in [(b - 1/2) dq, (b + 1/2) dq), dq = 1 / max(width, height)
 * cycles per pixel (divided by pixelSize with physical units).
 */
export interface RadialProfile {
  /** Bin centres, cycles per length unit (per pixel without a pixel size). */
  q: number[];
  /** Mean of S over the annulus (the structure factor S(q)); 0 for an empty annulus. */
  annulusMean: number[];
  /**
   * Integral of S over the annulus per unit q, sum_annulus S / (width * height * dq), so that
   * sum(annulusIntegral) * dq is the windowed variance; about 2 pi q annulusMean.
   */
  annulusIntegral: number[];
  /** Spectrum points in each annulus. */
  points: number[];
  /** Bin width dq, cycles per length unit. */
  binWidth: number;
}

/** Power over the ring band per angle bin. */
export interface AngularDistribution {
  /** Bin centres, degrees in [0, 180), wavevector angle from +x toward +y (down the rows). */
  angleDeg: number[];
  /** Fraction of the band's power in each bin (sums to 1). */
  powerFraction: number[];
  /** Ring band, cycles per length unit. */
  bandQ: [number, number];
}

/** Structure-tensor summary (see `structureTensor`). */
export interface StructureSummary {
  order2: number | undefined;
  angleDeg: number | undefined;
  meanCoherence?: number;
  sigmaPx: number;
}

/** Result of `analyzeSpectrum`: plain data, lengths in `unit`, q in cycles per `unit`. */
export interface SpectrumResult {
  width: number;
  height: number;
  /** Length unit of every length and inverse length below ('px' without a pixel size). */
  unit: string;
  options: ResolvedSpectrumOptions;
  /** Domain period 1 / q*, or undefined with `reason`. */
  period: number | undefined;
  /** Peak of the chosen radial profile, cycles per unit (sub-bin interpolated). */
  peakQ: number | undefined;
  /** Why `period` is undefined. */
  reason?: string;
  /** Half width at half maximum of the ring in annulusMean, cycles per unit. */
  ringHalfWidthQ: number | undefined;
  /**
   * Correlation length from the ring width: for S = A / (1 + xi^2 (k - k0)^2), k = 2 pi q, the
   * HWHM in k is 1 / xi, so xi = 1 / (2 pi HWHM_q).
   */
  corrLength: number | undefined;
  /**
   * False when the ring is no wider than the frame's own resolution (HWHM below 2 bins, or
   * xi above a tenth of the shorter side): then `corrLength` is a lower bound set by the frame.
   */
  corrLengthResolved: boolean;
  order2: number | undefined;
  order2AngleDeg: number | undefined;
  order6: number | undefined;
  order6AngleDeg: number | undefined;
  /** Structure-tensor estimate of the orientation (unless structureTensor is 'off'). */
  structure?: StructureSummary;
  /** Variance of the signal (binary: 1 - m^2); undefined for non-finite samples. */
  variance: number | undefined;
  /** Window-weighted mean of the signal (binary, no window: the magnetization m). */
  mean: number | undefined;
  profile: RadialProfile;
  angular: AngularDistribution | undefined;
}

/** A full, centred power spectrum: zero frequency at (floor(width/2), floor(height/2)). */
export interface PowerSpectrum {
  width: number;
  height: number;
  /** S(k) row-major; column cx + kx, row cy + ky holds q = (kx / width, ky / height) per pixel. */
  power: Float32Array;
  centerX: number;
  centerY: number;
  /** Pixel size the q axes are scaled by (1 without one). */
  pixelSize: number;
}
