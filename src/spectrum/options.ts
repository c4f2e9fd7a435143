// Options of the spectrum analysis, their defaults and validation.
import type { Frame } from "../types";

/** Options of `analyzeSpectrum` and of a spectrum workspace's `analyze`. */
export interface SpectrumOptions {
  /**
   * What is transformed: `binary` maps a phase map (1 = up, 0 = down; any nonzero is up) to +1/-1,
   * `grey` takes the samples as they are. The mean is removed in both cases.
   * @default 'binary' for Uint8Array data, 'grey' otherwise
   */
  signal?: "binary" | "grey";
  /** `open` frames are cut from a larger pattern; `periodic` frames wrap (simulations). @default 'open' */
  boundary?: "open" | "periodic";
  /** Window applied before the transform. @default 'hann' for open frames, 'none' for periodic ones */
  window?: "hann" | "none";
  /** Side of one pixel in `lengthUnit`; q is then in cycles per unit and lengths in units. */
  pixelSize?: number;
  /** Name of the length unit of `pixelSize`. @default 'px' without a pixel size, else 'unit' */
  lengthUnit?: string;
  /** Which radial profile the peak q* is taken from. @default 'annulusMean' */
  peakOf?: "annulusMean" | "annulusIntegral";
  /**
   * Sub-bin interpolation of the peak: `gaussian` fits a parabola to the log of the three bins
   * around the maximum (it falls back to `parabolic` when a neighbour is below 1% of the
   * maximum, as for a line spectrum), `parabolic` fits the values themselves.
   * @default 'gaussian'
   */
  peakInterpolation?: "gaussian" | "parabolic";
  /** Shortest period searched, in pixels. @default 2 (Nyquist) */
  minPeriodPx?: number;
  /** Longest period searched, in pixels. @default half the shorter side */
  maxPeriodPx?: number;
  /**
   * Half-width of the ring band for the angular statistics, in cycles per pixel.
   * @default max(2 bins, 2 x the ring's HWHM), at most q* / 2
   */
  ringHalfWidthPx?: number;
  /** Number of angle bins over [0, 180) degrees for the angular distribution. @default 90 */
  angleBins?: number;
  /**
   * Structure-tensor estimate of the orientation: `global` gives the frame's nematic order from
   * the summed tensor, `local` adds the mean local coherence (Gaussian integration scale
   * `structureSigmaPx`), `off` skips it. @default 'global'
   */
  structureTensor?: "off" | "global" | "local";
  /** Integration scale of the local structure tensor, pixels. @default period / 2 (or 2 without a period) */
  structureSigmaPx?: number;
}

/** Options with every default filled in, as carried by results. */
export interface ResolvedSpectrumOptions {
  signal: "binary" | "grey";
  boundary: "open" | "periodic";
  window: "hann" | "none";
  pixelSize: number | undefined;
  lengthUnit: string;
  peakOf: "annulusMean" | "annulusIntegral";
  peakInterpolation: "gaussian" | "parabolic";
  minPeriodPx: number;
  maxPeriodPx: number;
  ringHalfWidthPx: number | undefined;
  angleBins: number;
  structureTensor: "off" | "global" | "local";
  structureSigmaPx: number | undefined;
}

function oneOf<T extends string>(name: string, v: unknown, allowed: readonly T[], fallback: T): T {
  if (v === undefined) return fallback;
  if (typeof v !== "string" || !(allowed as readonly string[]).includes(v)) {
    throw new RangeError(
      `domtopo: spectrum option ${name} must be one of ${allowed.map((a) => `'${a}'`).join(", ")}, got ${String(v)}`,
    );
  }
  return v as T;
}

function positive(name: string, v: unknown): number | undefined {
  if (v === undefined) return undefined;
  if (typeof v !== "number" || !Number.isFinite(v) || v <= 0) {
    throw new RangeError(`domtopo: spectrum option ${name} must be a finite number > 0, got ${String(v)}`);
  }
  return v;
}

/** Checks a frame's shape and data; throws a RangeError saying what was expected. */
export function checkFrame(frame: Frame): void {
  if (frame === null || typeof frame !== "object") {
    throw new TypeError("domtopo: expected a frame {width, height, data}");
  }
  const { width, height, data } = frame;
  if (!Number.isInteger(width) || !Number.isInteger(height) || width < 1 || height < 1) {
    throw new RangeError(`domtopo: frame width and height must be integers >= 1, got ${width} x ${height}`);
  }
  if (!data || typeof (data as { length?: unknown }).length !== "number") {
    throw new TypeError("domtopo: frame data must be a typed array");
  }
  if (data.length !== width * height) {
    throw new RangeError(
      `domtopo: frame data holds ${data.length} samples, expected width * height = ${width * height}`,
    );
  }
}

/** Fills in the defaults and validates; throws on bad values. */
export function resolveSpectrumOptions(frame: Frame, options: SpectrumOptions = {}): ResolvedSpectrumOptions {
  const o = options ?? {};
  const signal = oneOf("signal", o.signal, ["binary", "grey"] as const,
    frame.data instanceof Uint8Array ? "binary" : "grey");
  const boundary = oneOf("boundary", o.boundary, ["open", "periodic"] as const, "open");
  const window = oneOf("window", o.window, ["hann", "none"] as const, boundary === "open" ? "hann" : "none");
  if (o.pixelSize !== undefined && !(typeof o.pixelSize === "number" && Number.isFinite(o.pixelSize) && o.pixelSize > 0)) {
    throw new RangeError(`domtopo: pixelSize must be a finite number > 0, got ${String(o.pixelSize)}`);
  }
  const pixelSize = o.pixelSize;
  const lengthUnit = o.lengthUnit ?? (pixelSize === undefined ? "px" : "unit");
  if (typeof lengthUnit !== "string" || lengthUnit.length === 0) {
    throw new RangeError("domtopo: lengthUnit must be a non-empty string");
  }
  const peakOf = oneOf("peakOf", o.peakOf, ["annulusMean", "annulusIntegral"] as const, "annulusMean");
  const peakInterpolation = oneOf("peakInterpolation", o.peakInterpolation, ["gaussian", "parabolic"] as const, "gaussian");
  const minPeriodPx = positive("minPeriodPx", o.minPeriodPx) ?? 2;
  const maxPeriodPx = positive("maxPeriodPx", o.maxPeriodPx) ?? Math.max(2 * minPeriodPx, Math.min(frame.width, frame.height) / 2);
  if (maxPeriodPx <= minPeriodPx) {
    throw new RangeError(`domtopo: maxPeriodPx (${maxPeriodPx}) must exceed minPeriodPx (${minPeriodPx})`);
  }
  const ringHalfWidthPx = positive("ringHalfWidthPx", o.ringHalfWidthPx);
  const angleBins = o.angleBins ?? 90;
  if (!Number.isInteger(angleBins) || angleBins < 1 || angleBins > 3600) {
    throw new RangeError(`domtopo: angleBins must be an integer from 1 to 3600, got ${String(angleBins)}`);
  }
  const structureTensor = oneOf("structureTensor", o.structureTensor, ["off", "global", "local"] as const, "global");
  const structureSigmaPx = positive("structureSigmaPx", o.structureSigmaPx);
  return {
    signal, boundary, window, pixelSize, lengthUnit, peakOf, peakInterpolation,
    minPeriodPx, maxPeriodPx, ringHalfWidthPx, angleBins, structureTensor, structureSigmaPx,
  };
}
