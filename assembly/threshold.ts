// Samples to phase map (1 = up, 0 = down), histograms for Otsu's level and saddle decisions.
// A sample is up when it is above the level (XOR invert). (Specks below the minimum area are
// absorbed by the labeling, label.ts.)
import { W, H, PH, ldi, sti } from "./common";

/** u8 samples: up when v >= cut (cut = floor(level) + 1, in 0..256). SIMD, 16 pixels a step. */
export function thresholdU8(src: usize, n: i32, cut: i32, invert: bool): void {
  const one = i8x16.splat(1);
  const flip = invert ? one : i8x16.splat(0);
  if (cut <= 0 || cut > 255) {
    const all: u8 = <u8>((cut <= 0) != invert ? 1 : 0);
    memory.fill(PH, all, <usize>n);
    return;
  }
  const c = i8x16.splat(<i8>cut);
  let i = 0;
  for (; i + 16 <= n; i += 16) {
    const v = v128.load(src + <usize>i);
    const up = v128.xor(v128.and(i8x16.ge_u(v, c), one), flip);
    v128.store(PH + <usize>i, up);
  }
  for (; i < n; i++) {
    const up = <i32>(<i32>load<u8>(src + <usize>i) >= cut) ^ <i32>invert;
    store<u8>(PH + <usize>i, <u8>up);
  }
}

/** u16 samples: up when v >= cut (0..65536). */
export function thresholdU16(src: usize, n: i32, cut: i32, invert: bool): void {
  const inv = <i32>invert;
  for (let i = 0; i < n; i++) {
    const up = <i32>(<i32>load<u16>(src + (<usize>i << 1)) >= cut) ^ inv;
    store<u8>(PH + <usize>i, <u8>up);
  }
}

/** f32 samples: up when v > level. Returns the number of NaN samples (their phase is down). */
export function thresholdF32(src: usize, n: i32, level: f32, invert: bool): i32 {
  const inv = <i32>invert;
  let nan = 0;
  for (let i = 0; i < n; i++) {
    const v = load<f32>(src + (<usize>i << 2));
    if (v != v) nan++;
    const up = <i32>(v > level) ^ inv;
    store<u8>(PH + <usize>i, <u8>up);
  }
  return nan;
}

/** Histogram of u8 (256 bins) or u16 (65536 bins) samples into i32 `hist` (cleared first). */
export function histogramInt(src: usize, n: i32, bytesPerSample: i32, hist: usize): void {
  const bins = bytesPerSample == 1 ? 256 : 65536;
  memory.fill(hist, 0, <usize>bins << 2);
  if (bytesPerSample == 1) {
    for (let i = 0; i < n; i++) {
      const b = <i32>load<u8>(src + <usize>i);
      sti(hist, b, ldi(hist, b) + 1);
    }
  } else {
    for (let i = 0; i < n; i++) {
      const b = <i32>load<u16>(src + (<usize>i << 1));
      sti(hist, b, ldi(hist, b) + 1);
    }
  }
}

/** Minimum and maximum of f32 samples into out[0], out[1] (f64); returns the NaN count. */
export function rangeF32(src: usize, n: i32, out: usize): i32 {
  let lo = Infinity, hi = -Infinity;
  let nan = 0;
  for (let i = 0; i < n; i++) {
    const v = <f64>load<f32>(src + (<usize>i << 2));
    if (v != v) { nan++; continue; }
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  store<f64>(out, lo);
  store<f64>(out, hi, 8);
  return nan;
}

/** Histogram of f32 samples over [lo, hi] into `bins` i32 bins (cleared first). */
export function histogramF32(src: usize, n: i32, lo: f64, hi: f64, bins: i32, hist: usize): void {
  memory.fill(hist, 0, <usize>bins << 2);
  const scale = hi > lo ? <f64>bins / (hi - lo) : 0;
  for (let i = 0; i < n; i++) {
    const v = <f64>load<f32>(src + (<usize>i << 2));
    if (v != v) continue;
    let b = <i32>((v - lo) * scale);
    if (b >= bins) b = bins - 1;
    if (b < 0) b = 0;
    sti(hist, b, ldi(hist, b) + 1);
  }
}

@inline function sampleAt(src: usize, kind: i32, i: i32): f64 {
  if (kind == 0) return <f64>load<u8>(src + <usize>i);
  if (kind == 1) return <f64>load<u16>(src + (<usize>i << 1));
  return <f64>load<f32>(src + (<usize>i << 2));
}

/**
 * Saddle decisions (asymptotic decider of marching squares, Nielson & Hamann 1991): at a quad
 * whose corners alternate in phase, the up diagonal joins when the mean of the four samples is
 * above the level (1), else the down diagonal (0); every other quad gets 2. kind: 0 u8, 1 u16,
 * 2 f32. Quads wrap on every axis (the last row and column are only read on periodic sides).
 */
export function saddleQuads(src: usize, kind: i32, level: f64, invert: bool, qm: usize): void {
  const w = W, h = H;
  for (let y = 0; y < h; y++) {
    const r0 = y * w, r1 = (y + 1 == h ? 0 : y + 1) * w;
    for (let x = 0; x < w; x++) {
      const x1 = x + 1 == w ? 0 : x + 1;
      const a = <i32>load<u8>(PH + <usize>(r0 + x)), d = <i32>load<u8>(PH + <usize>(r1 + x1));
      const b = <i32>load<u8>(PH + <usize>(r0 + x1)), c = <i32>load<u8>(PH + <usize>(r1 + x));
      let out = 2;
      if (a == d && b == c && a != b) {
        const mean = (sampleAt(src, kind, r0 + x) + sampleAt(src, kind, r0 + x1) +
          sampleAt(src, kind, r1 + x) + sampleAt(src, kind, r1 + x1)) * 0.25;
        const upSide = mean > level;
        out = <i32>(upSide != invert);
      }
      store<u8>(qm + <usize>(r0 + x), <u8>out);
    }
  }
}
