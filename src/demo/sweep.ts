// The built-in demo: an invented field sweep of a perpendicular-anisotropy film, made by
// thresholding one Gaussian random field at levels that follow the applied field. It runs from
// isolated bubbles of one phase through a maze to bubbles of the other phase.
import type { Frame } from "../types";
import { gaussianRandomField, hexGaussianRandomField } from "./grf";
import { normalSource } from "./random";
import { checkSize } from "../frame";

export interface DemoSweepOptions {
  /** Frame side in pixels (a power of two). @default 256 */
  size?: number;
  /** Number of frames, evenly spaced in field. @default 41 */
  frames?: number;
  /** `'maze'`: isotropic labyrinth; `'stripes'`: stripes aligned by an in-plane history. @default 'maze' */
  pattern?: "maze" | "stripes";
  /** Seed of the pattern and of the camera noise. @default 3 */
  seed?: number;
  /**
   * `'hex'`: sample the pattern at the sites of a hexagonal lattice in offset rows (odd rows
   * shifted right by half a site, row spacing sqrt(3)/2; the pixel size is the lattice constant),
   * as lattice simulations write them; analyze such frames with `grid: 'hex'`. @default 'square'
   */
  grid?: "square" | "hex";
}

export interface DemoSweep {
  /** What the data pretend to be; they are generated, not measured. */
  scenario: string;
  pixelSize: number;
  unit: string;
  fieldUnit: string;
  /** Applied field of each frame. */
  fields: number[];
  /** Grey level halfway between the saturated levels (the fixed threshold to use). */
  threshold: number;
  width: number;
  height: number;
  /** Lattice of the samples (see DemoSweepOptions.grid). */
  grid: "square" | "hex";
  /** Frame k as 8-bit grey samples (bright = up). */
  frame(k: number): Frame & { data: Uint8Array };
}

const PIXEL_NM = 10;
const PERIOD_PX = 24;
const FIELD_MT = 30;
/** Field that shifts the level by one standard deviation of the random field. */
const FIELD_PER_SIGMA = 12;

export function demoSweep(options: DemoSweepOptions = {}): DemoSweep {
  const size = checkSize("demo size", options.size ?? 256);
  const count = checkSize("demo frames", options.frames ?? 41);
  const pattern = options.pattern ?? "maze";
  if (pattern !== "maze" && pattern !== "stripes") {
    throw new Error(`demo pattern: expected "maze" or "stripes", got ${JSON.stringify(pattern)}`);
  }
  const seed = options.seed ?? 3;
  const grid = options.grid ?? "square";
  if (grid !== "square" && grid !== "hex") throw new Error(`demo grid: expected "square" or "hex", got ${JSON.stringify(grid)}`);
  const field = (grid === "hex" ? hexGaussianRandomField : gaussianRandomField)({
    width: size, height: size, period: PERIOD_PX, bandwidth: 0.12, seed,
    alignment: pattern === "stripes" ? 12 : 0, direction: 30,
  });
  const fields = Array.from({ length: count }, (_, k) =>
    count === 1 ? 0 : Number((-FIELD_MT + (2 * FIELD_MT * k) / (count - 1)).toFixed(6)));
  const scenario =
    `Synthetic field sweep of an invented perpendicular-anisotropy multilayer ("sample DT-3"), ` +
    `${pattern === "maze" ? "demagnetized into a maze" : "with stripes aligned by an in-plane field history"}, ` +
    `${grid === "hex" ? `simulated on a hexagonal lattice of ${PIXEL_NM} nm lattice constant (offset rows)` : `imaged at ${PIXEL_NM} nm per pixel`} while the out-of-plane field steps from -${FIELD_MT} to ` +
    `+${FIELD_MT} mT. Frames are thresholded Gaussian random fields (period ${PERIOD_PX * PIXEL_NM} nm) ` +
    `with camera noise, not measurements.`;
  return {
    scenario, pixelSize: PIXEL_NM, unit: "nm", fieldUnit: "mT", fields, threshold: 127.5,
    width: size, height: size, grid,
    frame(k: number) {
      if (!Number.isInteger(k) || k < 0 || k >= count) {
        throw new Error(`demo frame: expected an index in 0..${count - 1}, got ${k}`);
      }
      // A positive field favours up: the level falls as the field rises.
      const level = -fields[k]! / FIELD_PER_SIGMA;
      const noise = normalSource(seed * 7919 + k + 1);
      const data = new Uint8Array(size * size);
      const src = field.data;
      for (let i = 0; i < data.length; i++) {
        const v = 128 + 100 * Math.tanh((src[i]! - level) / 0.12) + 6 * noise();
        data[i] = v < 0 ? 0 : v > 255 ? 255 : Math.round(v);
      }
      return { width: size, height: size, data };
    },
  };
}
