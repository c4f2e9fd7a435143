// Image of the log-scaled, centred power spectrum with the ring q* marked (raw pixels; PNG
// encoding belongs to the io layer).
import type { PowerSpectrum } from "./result";

/** Options of `renderSpectrum`. */
export interface RenderSpectrumOptions {
  /** Ring to mark, cycles per length unit of the spectrum's pixel size (e.g. a result's peakQ). */
  peakQ?: number;
  /** Decades of power shown below the maximum. @default 4 */
  decades?: number;
  /** `grey` (1 byte a pixel, ring white) or `rgba` (4 bytes, ring red). @default 'rgba' */
  format?: "grey" | "rgba";
}

/** Raw pixels of a rendered spectrum. */
export interface SpectrumImage {
  width: number;
  height: number;
  channels: 1 | 4;
  data: Uint8Array;
}

/**
 * Renders log10(S / max S) over `decades` decades to 0..255, zero frequency at the centre; the
 * ring |q| = peakQ is drawn one bin wide.
 */
export function renderSpectrum(spectrum: PowerSpectrum, options: RenderSpectrumOptions = {}): SpectrumImage {
  const { width: w, height: h, power, centerX, centerY } = spectrum;
  const decades = options.decades ?? 4;
  if (!(Number.isFinite(decades) && decades > 0)) {
    throw new RangeError(`domtopo: decades must be a finite number > 0, got ${String(decades)}`);
  }
  const format = options.format ?? "rgba";
  if (format !== "grey" && format !== "rgba") {
    throw new RangeError(`domtopo: format must be 'grey' or 'rgba', got ${String(format)}`);
  }
  let max = 0;
  for (let i = 0; i < power.length; i++) if (power[i]! > max) max = power[i]!;
  const channels = format === "grey" ? 1 : 4;
  const data = new Uint8Array(w * h * channels);
  const lmax = max > 0 ? Math.log10(max) : 0;
  const scale = 255 / decades;
  let ringPx: number | undefined;
  if (options.peakQ !== undefined) {
    if (!(Number.isFinite(options.peakQ) && options.peakQ > 0)) {
      throw new RangeError(`domtopo: peakQ must be a finite number > 0, got ${String(options.peakQ)}`);
    }
    ringPx = options.peakQ * spectrum.pixelSize; // cycles per pixel
  }
  const side = Math.max(w, h);
  for (let y = 0; y < h; y++) {
    const qy = (y - centerY) / h;
    for (let x = 0; x < w; x++) {
      const i = y * w + x;
      const p = power[i]!;
      let v = p > 0 && max > 0 ? 255 + (Math.log10(p) - lmax) * scale : 0;
      v = v < 0 ? 0 : v > 255 ? 255 : v;
      let ring = false;
      if (ringPx !== undefined) {
        const qx = (x - centerX) / w;
        ring = Math.abs(Math.hypot(qx, qy) - ringPx) * side < 0.5;
      }
      if (channels === 1) {
        data[i] = ring ? 255 : v;
      } else {
        const o = 4 * i;
        data[o] = ring ? 255 : v;
        data[o + 1] = ring ? 40 : v;
        data[o + 2] = ring ? 40 : v;
        data[o + 3] = 255;
      }
    }
  }
  return { width: w, height: h, channels, data };
}
