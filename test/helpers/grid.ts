// Frames drawn as grids of '#' (up) and '.' (down), and the symmetries of the square lattice.
import type { Frame } from "../../src/types";
import { uniformSource } from "../../src/demo/random";

export function grid(...rows: string[]): Frame & { data: Uint8Array } {
  const lines = rows.flatMap((r) => r.split("\n")).map((r) => r.trim()).filter((r) => r.length > 0);
  const height = lines.length, width = lines[0]!.length;
  const data = new Uint8Array(width * height);
  lines.forEach((line, y) => {
    if (line.length !== width) throw new Error(`grid row ${y} has ${line.length} cells, expected ${width}`);
    for (let x = 0; x < width; x++) data[y * width + x] = line[x] === "#" ? 1 : 0;
  });
  return { width, height, data };
}

export function complement(f: Frame & { data: Uint8Array }): Frame & { data: Uint8Array } {
  return { width: f.width, height: f.height, data: f.data.map((v) => 1 - v) };
}

/** Cyclic shift by (dx, dy). */
export function shift(f: Frame & { data: Uint8Array }, dx: number, dy: number) {
  const { width: w, height: h } = f;
  const out = new Uint8Array(w * h);
  for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) {
    out[((y + dy) % h + h) % h * w + ((x + dx) % w + w) % w] = f.data[y * w + x]!;
  }
  return { width: w, height: h, data: out };
}

/** Rotation by 90 degrees (x, y) -> (h - 1 - y, x). */
export function rotate90(f: Frame & { data: Uint8Array }) {
  const { width: w, height: h } = f;
  const out = new Uint8Array(w * h);
  for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) out[x * h + (h - 1 - y)] = f.data[y * w + x]!;
  return { width: h, height: w, data: out };
}

export function flipX(f: Frame & { data: Uint8Array }) {
  const { width: w, height: h } = f;
  const out = new Uint8Array(w * h);
  for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) out[y * w + (w - 1 - x)] = f.data[y * w + x]!;
  return { width: w, height: h, data: out };
}

export function transpose(f: Frame & { data: Uint8Array }) {
  const { width: w, height: h } = f;
  const out = new Uint8Array(w * h);
  for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) out[x * h + y] = f.data[y * w + x]!;
  return { width: h, height: w, data: out };
}

/** Seeded random 0/1 frame with up-probability p, optionally smoothed by a box of radius r. */
export function randomFrame(seed: number, w: number, h: number, p: number, r = 0) {
  const u = uniformSource(seed);
  const noise = new Float64Array(w * h).map(() => u());
  const data = new Uint8Array(w * h);
  if (r === 0) {
    for (let i = 0; i < w * h; i++) data[i] = noise[i]! < p ? 1 : 0;
    return { width: w, height: h, data };
  }
  const sm = new Float64Array(w * h);
  for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) {
    let s = 0;
    for (let j = -r; j <= r; j++) for (let i = -r; i <= r; i++) {
      s += noise[((y + j + h) % h) * w + ((x + i + w) % w)]!;
    }
    sm[y * w + x] = s;
  }
  const sorted = Float64Array.from(sm).sort();
  const cut = sorted[Math.min(w * h - 1, Math.floor((1 - p) * w * h))]!;
  for (let i = 0; i < w * h; i++) data[i] = sm[i]! >= cut ? 1 : 0;
  return { width: w, height: h, data };
}
