// Overlay of a frame's domains coloured by kind, the skeleton drawn on top, ends and junctions
// marked. Browser-safe: RGBA pixels out, encoding left to `png.ts`.
// Colours from the Okabe-Ito palette (Okabe & Ito 2008, "Color Universal Design"), assigned
// here as: up phase light / down phase dark tints of one colour per kind.
import { KIND_BUBBLE } from "../topology/classify";
import type { SkeletonAnalysis } from "../topology/skeleton-analysis";

export interface OverlayImage { width: number; height: number; rgba: Uint8Array }

export interface OverlayOptions {
  /** Integer magnification (each pixel becomes scale x scale). @default 3 */
  scale?: number;
}

// Okabe-Ito: sky blue, bluish green, vermillion (kinds); black (skeleton), yellow (ends),
// reddish purple (junctions).
const KIND_RGB: ReadonlyArray<readonly [number, number, number]> = [
  [86, 180, 233], // bubble: sky blue
  [0, 158, 115], // stripe: bluish green
  [213, 94, 0], // labyrinth: vermillion
];
const SKELETON: readonly [number, number, number] = [0, 0, 0];
const END: readonly [number, number, number] = [240, 228, 66];
const JUNCTION: readonly [number, number, number] = [204, 121, 167];

/** Up domains get the full kind colour, down domains the same colour at 45% brightness. */
export function overlayPixels(
  a: SkeletonAnalysis, width: number, height: number, phase: Uint8Array, labels: Int32Array, options: OverlayOptions = {},
): OverlayImage {
  const s = options.scale ?? 3;
  if (!Number.isInteger(s) || s < 1 || s > 32) throw new Error(`options.scale: expected an integer 1..32, got ${String(s)}`);
  const W = width * s, H = height * s;
  const rgba = new Uint8Array(W * H * 4);
  const put = (X: number, Y: number, c: readonly [number, number, number]) => {
    if (X < 0 || Y < 0 || X >= W || Y >= H) return;
    const o = (Y * W + X) * 4;
    rgba[o] = c[0]; rgba[o + 1] = c[1]; rgba[o + 2] = c[2]; rgba[o + 3] = 255;
  };
  for (let y = 0; y < height; y++) for (let x = 0; x < width; x++) {
    const i = y * width + x;
    const k = a.columns.kind[labels[i]! - 1] ?? KIND_BUBBLE;
    const base = KIND_RGB[k]!;
    const f = phase[i] ? 1 : 0.45;
    const c = [Math.round(base[0] * f), Math.round(base[1] * f), Math.round(base[2] * f)] as const;
    const sk = a.pruned[i] === 1;
    for (let dy = 0; dy < s; dy++) for (let dx = 0; dx < s; dx++) {
      // The skeleton as the centre of each magnified pixel, so the domain colour stays visible.
      const centre = s < 3 || (dx > 0 && dx < s - 1 && dy > 0 && dy < s - 1);
      put(x * s + dx, y * s + dy, sk && centre ? (phase[i] ? SKELETON : [255, 255, 255]) : c);
    }
  }
  // Marks: ends as a filled square, junctions as a hollow diamond, centred on the node pixel.
  const g = a.graph;
  const r = Math.max(2, s);
  for (let v = 0; v < g.nodeCount; v++) {
    const d = g.nodeDegree[v]!;
    if (d !== 1 && d < 3) continue;
    const p = g.nodePixel[v]!;
    const cx = (p % width) * s + (s >> 1), cy = Math.floor(p / width) * s + (s >> 1);
    if (d === 1) {
      for (let dy = -r + 1; dy < r; dy++) for (let dx = -r + 1; dx < r; dx++) put(cx + dx, cy + dy, END);
    } else {
      for (let t = -r - 1; t <= r + 1; t++) {
        const u = r + 1 - Math.abs(t);
        put(cx + t, cy + u, JUNCTION); put(cx + t, cy - u, JUNCTION);
        put(cx + t, cy + u - 1, JUNCTION); put(cx + t, cy - u + 1, JUNCTION);
      }
    }
  }
  return { width: W, height: H, rgba };
}
