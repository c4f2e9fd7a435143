// The spectra `domtopo demo` keeps for the report: the radial profile S(q) of a few frames of the
// field sweep (the maze nearest zero field and a bubble frame) as DIR/spectra.csv, and the
// centre of each frame's log-scaled power spectrum with the ring q* marked as
// DIR/spectra/frame-NNNN.png.
import { join } from "node:path";
import { createSpectrumWorkspace, renderSpectrum, type SpectrumResult, type SpectrumWorkspace } from "../spectrum";
import { encodeRgbaPng } from "../io/png";
import { csvLine } from "../topology/rows";
import { resampleHexToSquare } from "../spectrum/hex";

/** Frames whose spectra are kept: the one nearest zero field, and one at 2/3 of the lowest field. */
export function spectrumFrames(fields: readonly number[]): number[] {
  const nearest = (h: number) => fields.reduce((best, f, k) => (Math.abs(f - h) < Math.abs(fields[best]! - h) ? k : best), 0);
  const lowest = Math.min(...fields);
  return [...new Set([nearest((2 / 3) * lowest), nearest(0)])].sort((a, b) => a - b);
}

/** Spectra of the kept frames, gathered while the sweep is analyzed. */
export class DemoSpectra {
  private ws: SpectrumWorkspace | undefined;
  private csv: string;
  private images: Array<[string, Uint8Array]> = [];
  readonly frames: number[];

  constructor(
    private width: number, private height: number, fields: readonly number[], fieldColumn: string, unit: string,
    private grid: "square" | "hex" = "square",
  ) {
    this.frames = spectrumFrames(fields);
    this.csv = csvLine(["frame", fieldColumn, `q_per_${unit.replace(/[^A-Za-z0-9µ]+/g, "")}`, "S"]);
  }

  /**
   * Keeps frame `k` when it is one of {@link frames}: its profile as analyzed (`result`) and the
   * image of the power spectrum of `phase` (the phase map that result was computed from).
   */
  keep(k: number, field: number, phase: Uint8Array, result: SpectrumResult | undefined): void {
    if (!this.frames.includes(k) || !result) return;
    const p = result.profile;
    for (let b = 0; b < p.q.length; b++) this.csv += csvLine([k, field, p.q[b]!, p.annulusMean[b]!]);
    // A hexagonal frame's spectrum is that of its square resampling (what `result` was computed from).
    const periodic = result.options.boundary === "periodic";
    const frame = this.grid === "hex"
      ? resampleHexToSquare(phase, this.width, this.height, periodic, periodic).frame
      : { width: this.width, height: this.height, data: phase };
    if (!this.ws || this.ws.width !== frame.width || this.ws.height !== frame.height) {
      this.ws?.dispose();
      this.ws = createSpectrumWorkspace(frame.width, frame.height);
    }
    this.ws.analyze(frame, result.options);
    const spectrum = this.ws.powerSpectrum();
    const img = renderSpectrum(spectrum, result.peakQ !== undefined ? { peakQ: result.peakQ } : {});
    // The centre: out to 4 ring radii (at least 16 px, at most the whole spectrum), magnified
    // by whole pixels to at least 128 px a side.
    const side = Math.min(frame.width, frame.height);
    const ringPx = result.peakQ !== undefined ? result.peakQ * spectrum.pixelSize * Math.max(frame.width, frame.height) : side / 8;
    const half = Math.min(Math.floor(side / 2), Math.max(16, Math.ceil(4 * ringPx)));
    const scale = Math.max(1, Math.ceil(128 / (2 * half)));
    const out = 2 * half * scale;
    const rgba = new Uint8Array(out * out * 4);
    for (let y = 0; y < out; y++) {
      const sy = spectrum.centerY - half + Math.floor(y / scale);
      for (let x = 0; x < out; x++) {
        const sx = spectrum.centerX - half + Math.floor(x / scale);
        const inside = sx >= 0 && sy >= 0 && sx < img.width && sy < img.height;
        const o = 4 * (y * out + x);
        if (!inside) { rgba[o + 3] = 255; continue; }
        rgba.set(img.data.subarray(4 * (sy * img.width + sx), 4 * (sy * img.width + sx) + 4), o);
      }
    }
    this.images.push([`frame-${String(k).padStart(4, "0")}.png`, encodeRgbaPng(out, out, rgba)]);
  }

  /** The files to write under `out`: spectra.csv and spectra/*.png. */
  files(out: string): Array<[string, string | Uint8Array]> {
    return [[join(out, "spectra.csv"), this.csv], ...this.images.map(([name, png]) => [join(out, "spectra", name), png] as [string, Uint8Array])];
  }

  dispose(): void {
    this.ws?.dispose();
    this.ws = undefined;
  }
}
