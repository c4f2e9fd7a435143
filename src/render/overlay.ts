// Overlay of a frame's domains coloured by kind, the skeleton drawn on top, ends and junctions
// marked. Browser-safe: RGBA pixels out, encoding left to `png.ts`.
// Colours from the Okabe-Ito palette (Okabe & Ito 2008, "Color Universal Design"), assigned
// here as: up phase light / down phase dark tints of one colour per kind.
import { KIND_BUBBLE } from "../topology/classify";
import type { SkeletonAnalysis } from "../topology/skeleton-analysis";

export interface OverlayImage { width: number; height: number; rgba: Uint8Array }

export interface OverlayOptions {
  /**
   * Integer magnification: each pixel becomes scale x scale, or on a hexagonal frame the image
   * has scale pixels per lattice constant. @default 3 (6 on a hexagonal frame)
   */
  scale?: number;
  /**
   * Lattice of the frame. `'hex'` draws each site as its hexagonal cell (the Voronoi cell of the
   * triangular lattice, pointy side up) at (x + (y & 1) / 2, y sqrt(3)/2), so the picture is not
   * sheared; the skeleton is a smaller hexagon at the site. @default 'square'
   */
  grid?: "square" | "hex";
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
  if (options.grid !== undefined && options.grid !== "square" && options.grid !== "hex") {
    throw new Error(`options.grid: expected "square" or "hex", got ${String(options.grid)}`);
  }
  const s = options.scale ?? (options.grid === "hex" ? 6 : 3);
  if (!Number.isInteger(s) || s < 1 || s > 32) throw new Error(`options.scale: expected an integer 1..32, got ${String(s)}`);
  if (options.grid === "hex") return overlayHex(a, width, height, phase, labels, s);
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

const ROW = Math.sqrt(3) / 2;
/** Image offset of site (0, 0): half a cell from the left and top edges. */
const OX = 0.5, OY = 1 / Math.sqrt(3);

function domainColour(a: SkeletonAnalysis, labels: Int32Array, phase: Uint8Array, i: number): readonly [number, number, number] {
  const base = KIND_RGB[a.columns.kind[labels[i]! - 1] ?? KIND_BUBBLE]!;
  const f = phase[i] ? 1 : 0.45;
  return [Math.round(base[0] * f), Math.round(base[1] * f), Math.round(base[2] * f)];
}

/**
 * Draws a hexagonal frame (offset rows, odd rows shifted right by half a site) at `scale` image
 * pixels per lattice constant: every image pixel takes `colour(site, d2)` of its nearest site
 * (d2 = squared distance to it in lattice constants), so each site is its hexagonal cell.
 * Pixels outside every cell stay transparent.
 */
export function hexRaster(
  width: number, height: number, scale: number,
  colour: (site: number, d2: number) => readonly [number, number, number],
): OverlayImage {
  const s = scale;
  const W = Math.ceil((width + 0.5) * s), H = Math.ceil(((height - 1) * ROW + 2 * OY) * s);
  const rgba = new Uint8Array(W * H * 4);
  for (let Y = 0; Y < H; Y++) {
    const py = (Y + 0.5) / s - OY;
    const r0 = Math.round(py / ROW);
    for (let X = 0; X < W; X++) {
      const px = (X + 0.5) / s - OX;
      let best = -1, bd = Infinity;
      for (let r = r0 - 1; r <= r0 + 1; r++) {
        if (r < 0 || r >= height) continue;
        const c0 = Math.round(px - (r & 1) / 2);
        for (let c = c0 - 1; c <= c0 + 1; c++) {
          if (c < 0 || c >= width) continue;
          const d = (px - c - (r & 1) / 2) ** 2 + (py - r * ROW) ** 2;
          if (d < bd) { bd = d; best = r * width + c; }
        }
      }
      if (best < 0 || bd > 1 / 3 + 1e-9) continue; // outside every cell (circumradius 1/sqrt 3)
      const c = colour(best, bd);
      const o = (Y * W + X) * 4;
      rgba[o] = c[0]; rgba[o + 1] = c[1]; rgba[o + 2] = c[2]; rgba[o + 3] = 255;
    }
  }
  return { width: W, height: H, rgba };
}

/** The hexagonal overlay: every image pixel takes the colour of its nearest site. */
function overlayHex(
  a: SkeletonAnalysis, width: number, height: number, phase: Uint8Array, labels: Int32Array, s: number,
): OverlayImage {
  const img = hexRaster(width, height, s, (site, d2) => (a.pruned[site] === 1 && d2 < 0.04
    ? (phase[site] ? SKELETON : [255, 255, 255] as const) : domainColour(a, labels, phase, site)));
  const { width: W, height: H, rgba } = img;
  const put = (X: number, Y: number, c: readonly [number, number, number]) => {
    if (X < 0 || Y < 0 || X >= W || Y >= H) return;
    const o = (Y * W + X) * 4;
    rgba[o] = c[0]; rgba[o + 1] = c[1]; rgba[o + 2] = c[2]; rgba[o + 3] = 255;
  };
  // The skeleton's edges: a line between the centres of neighbouring pruned skeleton sites of
  // one phase (forward neighbours E, SW, SE inside the frame, so each edge once).
  const centre = (x: number, y: number): [number, number] => [(x + (y & 1) / 2 + OX) * s, (y * ROW + OY) * s];
  for (let y = 0; y < height; y++) for (let x = 0; x < width; x++) {
    const i = y * width + x;
    if (a.pruned[i] !== 1) continue;
    const o = y & 1;
    for (const [nx, ny] of [[x + 1, y], [x - 1 + o, y + 1], [x + o, y + 1]] as const) {
      if (nx < 0 || nx >= width || ny >= height) continue;
      const j = ny * width + nx;
      if (a.pruned[j] !== 1 || phase[j] !== phase[i]) continue;
      const [x0, y0] = centre(x, y), [x1, y1] = centre(nx, ny);
      const steps = Math.ceil(Math.hypot(x1 - x0, y1 - y0) * 2);
      const c = phase[i] ? SKELETON : [255, 255, 255] as const;
      for (let t = 0; t <= steps; t++) put(Math.floor(x0 + ((x1 - x0) * t) / steps), Math.floor(y0 + ((y1 - y0) * t) / steps), c);
    }
  }
  const g = a.graph;
  const rad = Math.max(2, Math.round(s / 2));
  for (let v = 0; v < g.nodeCount; v++) {
    const d = g.nodeDegree[v]!;
    if (d !== 1 && d < 3) continue;
    const p = g.nodePixel[v]!;
    const x = p % width, y = Math.floor(p / width);
    const cx = Math.round((x + (y & 1) / 2 + OX) * s), cy = Math.round((y * ROW + OY) * s);
    if (d === 1) {
      for (let dy = -rad + 1; dy < rad; dy++) for (let dx = -rad + 1; dx < rad; dx++) put(cx + dx, cy + dy, END);
    } else {
      for (let t = -rad - 1; t <= rad + 1; t++) {
        const u = rad + 1 - Math.abs(t);
        put(cx + t, cy + u, JUNCTION); put(cx + t, cy - u, JUNCTION);
        put(cx + t, cy + u - 1, JUNCTION); put(cx + t, cy - u + 1, JUNCTION);
      }
    }
  }
  return { width: W, height: H, rgba };
}
