// Generated shapes (up = 1 on a down background) for the skeleton tests, the default
// measurements and the overlays. Pixel (x, y) is inside when its centre is.
import { rng } from "./helpers";

export interface Shape { width: number; height: number; phase: Uint8Array }

function paint(w: number, h: number, inside: (x: number, y: number) => boolean): Shape {
  const phase = new Uint8Array(w * h);
  for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) phase[y * w + x] = inside(x, y) ? 1 : 0;
  return { width: w, height: h, phase };
}

/** Distance from point p to segment a-b. */
function segDist(x: number, y: number, ax: number, ay: number, bx: number, by: number): number {
  const dx = bx - ax, dy = by - ay;
  const t = Math.max(0, Math.min(1, ((x - ax) * dx + (y - ay) * dy) / (dx * dx + dy * dy || 1)));
  return Math.hypot(x - ax - t * dx, y - ay - t * dy);
}

export function ellipse(a: number, b: number, angleDeg = 0): Shape {
  const s = Math.ceil(2 * Math.max(a, b) + 8), c = (s - 1) / 2, t = (angleDeg * Math.PI) / 180;
  return paint(s, s, (x, y) => {
    const u = (x - c) * Math.cos(t) + (y - c) * Math.sin(t), v = -(x - c) * Math.sin(t) + (y - c) * Math.cos(t);
    return (u / a) ** 2 + (v / b) ** 2 <= 1;
  });
}

export const disc = (r: number) => ellipse(r, r);

/** A bar (rectangle) of `length` x `width` px at an angle. */
export function bar(length: number, width: number, angleDeg = 0): Shape {
  const s = Math.ceil(length + width + 8), c = (s - 1) / 2, t = (angleDeg * Math.PI) / 180;
  return paint(s, s, (x, y) => {
    const u = (x - c) * Math.cos(t) + (y - c) * Math.sin(t), v = -(x - c) * Math.sin(t) + (y - c) * Math.cos(t);
    return Math.abs(u) <= length / 2 && Math.abs(v) <= width / 2;
  });
}

/** Union of thick segments (capsules) of half-width r from the centre along the given angles. */
export function star(armLength: number, r: number, anglesDeg: number[]): Shape {
  const s = Math.ceil(2 * armLength + 2 * r + 8), c = (s - 1) / 2;
  return paint(s, s, (x, y) => anglesDeg.some((a) => {
    const t = (a * Math.PI) / 180;
    return segDist(x, y, c, c, c + armLength * Math.cos(t), c + armLength * Math.sin(t)) <= r;
  }));
}

export function ring(radius: number, halfWidth: number): Shape {
  const s = Math.ceil(2 * (radius + halfWidth) + 8), c = (s - 1) / 2;
  return paint(s, s, (x, y) => Math.abs(Math.hypot(x - c, y - c) - radius) <= halfWidth);
}

/** Flips boundary pixels at random (probability p each), keeping the shape's outline rough. */
export function roughen(sh: Shape, p: number, seed: number): Shape {
  const { width: w, height: h } = sh;
  const rand = rng(seed);
  const out = sh.phase.slice();
  for (let y = 1; y < h - 1; y++) for (let x = 1; x < w - 1; x++) {
    const i = y * w + x, v = sh.phase[i]!;
    const border = sh.phase[i - 1] !== v || sh.phase[i + 1] !== v || sh.phase[i - w] !== v || sh.phase[i + w] !== v;
    if (border && v === 0 && rand() < p) out[i] = 1; // bumps only: the domain stays one piece
  }
  return { width: w, height: h, phase: out };
}
