// Seeded random 0/1 phase maps for the agreement tests: white noise, or noise smoothed by a box
// filter (wrapping, so periodic frames have no seam) and cut at its quantile, which gives blobs,
// stripes and mazes of a chosen up fraction.
import { uniformSource } from "../../src/demo/random";

/** Seeded uniform numbers in [0, 1): the project's mulberry32 (src/demo/random.ts). */
export const mulberry32 = uniformSource;

export interface RandomPhaseMap {
  width: number;
  height: number;
  /** Up fraction asked for. */
  density: number;
  /** Box-filter radius in pixels (0: white noise). */
  smoothing: number;
  /** 1 up, 0 down. */
  phase: Uint8Array;
}

/** Frame shapes worth covering: degenerate strips and squares, odd and non-square sizes. */
export const SHAPES: ReadonlyArray<readonly [number, number]> = [
  [1, 1], [1, 2], [2, 1], [2, 2], [3, 3], [1, 17], [1, 64], [23, 1], [64, 1], [2, 9], [9, 2],
  [3, 40], [5, 5], [7, 13], [16, 16], [31, 17], [17, 31], [32, 48], [45, 45], [64, 64],
  [97, 61], [61, 97], [80, 33],
];

/** A 0/1 map with about `density` up pixels; noise box-smoothed with radius `smoothing`. */
export function randomPhaseMap(
  random: () => number, width: number, height: number, density: number, smoothing: number,
): RandomPhaseMap {
  const n = width * height;
  let field = Float64Array.from({ length: n }, () => random());
  for (let pass = 0; pass < 2 && smoothing > 0; pass++) {
    const next = new Float64Array(n);
    for (let y = 0; y < height; y++) {
      for (let x = 0; x < width; x++) {
        let s = 0;
        for (let d = -smoothing; d <= smoothing; d++) {
          s += pass === 0
            ? field[y * width + (((x + d) % width) + width) % width]!
            : field[((((y + d) % height) + height) % height) * width + x]!;
        }
        next[y * width + x] = s;
      }
    }
    field = next;
  }
  // Up where the field is above its (1 - density) quantile.
  const sorted = Float64Array.from(field).sort();
  const cut = sorted[Math.min(n - 1, Math.floor((1 - density) * n))]!;
  const phase = new Uint8Array(n);
  for (let i = 0; i < n; i++) phase[i] = field[i]! >= cut && density > 0 ? 1 : 0;
  return { width, height, density, smoothing, phase };
}

/** `count` maps cycling through SHAPES, densities in [0.2, 0.8] and smoothing 0..3. */
export function randomPhaseMaps(seed: number, count: number): RandomPhaseMap[] {
  const random = mulberry32(seed);
  const maps: RandomPhaseMap[] = [];
  for (let k = 0; k < count; k++) {
    const [width, height] = SHAPES[k % SHAPES.length]!;
    const density = 0.2 + 0.6 * random();
    const smoothing = k % 4 === 0 ? 0 : Math.floor(random() * 4);
    maps.push(randomPhaseMap(random, width, height, density, smoothing));
  }
  return maps;
}
