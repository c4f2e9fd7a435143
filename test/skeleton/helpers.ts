// Plain-TS helpers for the skeleton tests: seeded frames, a flood-fill labeling with the same
// connectivity rules as the kernels, per-domain Euler numbers by bit-quads, grid drawings.
import { uniformSource } from "../../src/demo/random";

export interface Labeled {
  width: number;
  height: number;
  phase: Uint8Array;
  labels: Int32Array;
  count: number;
  /** index 1..count */
  domainPhase: Uint8Array;
  /** bit0 wraps x, bit1 wraps y, bit2 touches an open side */
  flags: Uint8Array;
}

/** Seeded uniform numbers in [0, 1): the project's mulberry32 (src/demo/random.ts). */
export const rng = uniformSource;

/** Smoothed white noise (box blur `passes` times with radius r, wrapping), thresholded at fraction `up`. */
export function noiseFrame(w: number, h: number, seed: number, r: number, passes: number, up: number): Uint8Array {
  const rand = rng(seed);
  let a = new Float64Array(w * h);
  for (let i = 0; i < a.length; i++) a[i] = rand();
  let b = new Float64Array(w * h);
  for (let p = 0; p < passes; p++) {
    for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) {
      let s = 0;
      for (let d = -r; d <= r; d++) s += a[y * w + (((x + d) % w) + w) % w]!;
      b[y * w + x] = s;
    }
    for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) {
      let s = 0;
      for (let d = -r; d <= r; d++) s += b[((((y + d) % h) + h) % h) * w + x]!;
      a[y * w + x] = s;
    }
  }
  const sorted = Float64Array.from(a).sort();
  const cut = sorted[Math.min(sorted.length - 1, Math.floor((1 - up) * sorted.length))]!;
  const out = new Uint8Array(w * h);
  for (let i = 0; i < out.length; i++) out[i] = a[i]! >= cut ? 1 : 0;
  return out;
}

/** Phase map from a drawing: '#' up, anything else down; rows separated by newlines. */
export function grid(text: string): { width: number; height: number; phase: Uint8Array } {
  const rows = text.trim().split("\n").map((r) => r.trim());
  const width = rows[0]!.length, height = rows.length;
  const phase = new Uint8Array(width * height);
  rows.forEach((r, y) => { for (let x = 0; x < width; x++) phase[y * width + x] = r[x] === "#" ? 1 : 0; });
  return { width, height, phase };
}

/** Whether phase v joins the diagonal pair of quad q (rule 0: up 8, 1: down 8, 2: quads). */
export function joins(rule: number, v: number, q: number, quads?: Uint8Array): boolean {
  if (rule === 0) return v === 1;
  if (rule === 1) return v === 0;
  const d = quads![q]!;
  return d === 2 || d === v;
}

/** Flood-fill labeling of both phases (domains 1..K in raster order of first pixel). */
export function label(phase: Uint8Array, w: number, h: number, px: boolean, py: boolean, rule = 0, quads?: Uint8Array): Labeled {
  const n = w * h;
  const labels = new Int32Array(n);
  const ux = new Int32Array(n), uy = new Int32Array(n);
  const stack: number[] = [];
  const dp: number[] = [0], fl: number[] = [0];
  let k = 0;
  for (let s = 0; s < n; s++) {
    if (labels[s] !== 0) continue;
    k++;
    const v = phase[s]!;
    let flags = 0;
    labels[s] = k; ux[s] = s % w; uy[s] = Math.floor(s / w);
    stack.push(s);
    while (stack.length) {
      const i = stack.pop()!;
      const x = ux[i]!, y = uy[i]!;
      const xi = i % w, yi = Math.floor(i / w);
      if (!px && (xi === 0 || xi === w - 1)) flags |= 4;
      if (!py && (yi === 0 || yi === h - 1)) flags |= 4;
      for (let dy = -1; dy <= 1; dy++) for (let dx = -1; dx <= 1; dx++) {
        if (dx === 0 && dy === 0) continue;
        let nx = xi + dx, ny = yi + dy;
        if (nx < 0 || nx >= w) { if (!px) continue; nx = (nx + w) % w; }
        if (ny < 0 || ny >= h) { if (!py) continue; ny = (ny + h) % h; }
        const j = ny * w + nx;
        if (phase[j] !== v) continue;
        if (dx !== 0 && dy !== 0) {
          const qx = ((dx > 0 ? xi : xi - 1) + w) % w, qy = ((dy > 0 ? yi : yi - 1) + h) % h;
          if (!joins(rule, v, qy * w + qx, quads)) continue;
        }
        if (labels[j] === 0) {
          labels[j] = k; ux[j] = x + dx; uy[j] = y + dy; stack.push(j);
        } else {
          if (ux[j] !== x + dx) flags |= 1;
          if (uy[j] !== y + dy) flags |= 2;
        }
      }
    }
    dp.push(v); fl.push(flags);
  }
  return { width: w, height: h, phase, labels, count: k, domainPhase: Uint8Array.from(dp), flags: Uint8Array.from(fl) };
}

/**
 * Euler number of every domain restricted to `mask` (1 = keep), by bit-quads per domain:
 * E = (Q1 - Q3 -+ 2 QD) / 4 with -2 where the diagonal pair joins (Gray 1971, IEEE Trans.
 * Comput. C-20:551; CHECKS.md). Zero-padded on open sides, wrapped on periodic ones.
 */
export function eulerPerDomain(L: Labeled, mask: Uint8Array | null, px: boolean, py: boolean, rule = 0, quads?: Uint8Array): Float64Array {
  const { width: w, height: h, labels } = L;
  const e4 = new Float64Array(L.count + 1);
  const lab = (x: number, y: number): number => {
    if (x < 0 || x >= w) { if (!px) return 0; x = (x + w) % w; }
    if (y < 0 || y >= h) { if (!py) return 0; y = (y + h) % h; }
    const i = y * w + x;
    return mask && !mask[i] ? 0 : labels[i]!;
  };
  const x0 = px ? 0 : -1, y0 = py ? 0 : -1;
  for (let y = y0; y < h; y++) for (let x = x0; x < w; x++) {
    const c = [lab(x, y), lab(x + 1, y), lab(x, y + 1), lab(x + 1, y + 1)];
    const seen = new Set(c.filter((l) => l !== 0));
    for (const l of seen) {
      const m = (c[0] === l ? 1 : 0) | (c[1] === l ? 2 : 0) | (c[2] === l ? 4 : 0) | (c[3] === l ? 8 : 0);
      const bits = (m & 1) + ((m >> 1) & 1) + ((m >> 2) & 1) + ((m >> 3) & 1);
      if (bits === 1) e4[l]! += 1;
      else if (bits === 3) e4[l]! -= 1;
      else if (m === 9 || m === 6) {
        const q = (((y + h) % h) * w + ((x + w) % w));
        e4[l]! += joins(rule, L.domainPhase[l]!, q, quads) ? -2 : 2;
      }
    }
  }
  for (let l = 0; l < e4.length; l++) e4[l] = e4[l]! / 4;
  return e4;
}

/** Number of 2x2 blocks of skeleton pixels of one phase (wrapping where periodic). */
export function countBlocks(mask: Uint8Array, w: number, h: number, px: boolean, py: boolean, phase: Uint8Array): number {
  let c = 0;
  for (let y = 0; y < (py ? h : h - 1); y++) for (let x = 0; x < (px ? w : w - 1); x++) {
    const x1 = (x + 1) % w, y1 = (y + 1) % h;
    const a = y * w + x, b = y * w + x1, d = y1 * w + x, e = y1 * w + x1;
    const v = phase[a];
    if (mask[a] && mask[b] && mask[d] && mask[e] && phase[b] === v && phase[d] === v && phase[e] === v) c++;
  }
  return c;
}
