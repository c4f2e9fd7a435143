// Table-driven spectrum reductions and the frame-summed structure tensor.
//
// Radial profile by a precomputed bin table (a histogram with a lookup index, common practice):
// the radius of a half-spectrum point (kx, ky) depends only on the frame shape, so its annulus
// and its weight are computed once per workspace into a u16 "slot" per point, laid out like the
// transposed half spectrum T of assembly/fft.ts (row kx, column ky, row stride TS floats):
//   slot = b            weight-2 point (0 < ky < H/2: stands for itself and its mirror)
//   slot = NB + b       weight-1 point (ky = 0, or ky = H/2 for even H)
//   b = floor(r + 0.5) when below `bins`, else `bins` (a discard slot); NB = bins + 1.
// Padding columns ky >= HH go to the discard slot. Annulus weights (counts) and the number of
// points beyond the last bin are fixed by the shape and come out of the table build.
// A frame is then one linear sweep: P = re^2 + im^2 four points at a time (f32x4, the same f32
// rounding as the direct kernel) and an f64 add per point into one of four accumulator copies
// (lane j of every 4-point group goes to copy j), so that runs of points in the same annulus do
// not chain through one memory cell. sums[b] = 2 sum_j A_j[b] + sum_j A_j[NB + b].
//
// Structure tensor sums with Scharr's 3 x 3 derivative ([3 10 3] / 32 smoothing x central
// difference; Scharr 2000, PhD thesis, Heidelberg), the same stencil as
// src/spectrum/structure-tensor.ts, four pixels a step.

/** Largest `bins` a u16 slot table can hold (2 (bins + 1) slots). */
const MAX_TABLE_BINS: i32 = 32767;

/** Bytes of the slot table of a w x ts half spectrum (0 when bins is too large for u16 slots). */
export function spectrumTableBytes(w: i32, ts: i32, bins: i32): f64 {
  if (bins < 1 || bins > MAX_TABLE_BINS || w < 1 || ts < 4 || (ts & 3) != 0) return 0;
  return <f64>(<usize>w * <usize>ts * 2);
}

/** Bytes of the four accumulator copies of spectrumProfile for `bins`. */
export function spectrumAccumulatorBytes(bins: i32): f64 {
  return <f64>(<usize>(bins + 1) * 2 * 4 * 8);
}

/**
 * Writes the slot table (u16, w rows of ts) of a w x h frame whose half spectrum keeps
 * hh = h / 2 + 1 rows, with the radius in bins r = sqrt((kx' sx)^2 + (ky sy)^2) of
 * spectrumRadial. counts: f64[bins] annulus weights (cleared here). Returns the weighted number
 * of points beyond the last bin, or -1 on bad sizes.
 * With tre != 0 it also does spectrumProfile's work for the spectrum in (tre, tim) on the way,
 * adding in the same order into the same accumulator copies, so that the first frame of a
 * workspace costs one pass and gets the very numbers the sweep gives later frames.
 */
export function spectrumBinTable(
  table: usize, w: i32, h: i32, ts: i32, bins: i32, sx: f64, sy: f64, counts: usize,
  tre: usize, tim: usize, acc: usize, sums: usize,
): f64 {
  const hh = (h >> 1) + 1;
  if (spectrumTableBytes(w, ts, bins) == 0 || ts < hh || h < 1) return -1;
  memory.fill(counts, 0, <usize>bins << 3);
  const nb = bins + 1;
  const copy = <usize>nb * 16;
  const sweep = tre != 0;
  if (sweep) memory.fill(acc, 0, copy * 4);
  const hEven = (h & 1) == 0;
  const sy2 = sy * sy;
  let outside = 0.0;
  for (let kx = 0; kx < w; kx++) {
    const kxs = kx <= (w >> 1) ? kx : kx - w;
    // the same expressions as spectrumRadial, so that every point lands in the same annulus
    const dx2 = <f64>kxs * <f64>kxs * sx * sx;
    const row = table + <usize>kx * <usize>ts * 2;
    for (let ky = 0; ky < hh; ky++) {
      const one = ky == 0 || (hEven && 2 * ky == h);
      const wt = one ? 1.0 : 2.0;
      const r = Math.sqrt(dx2 + <f64>(ky * ky) * sy2);
      let bin = <i32>(r + 0.5);
      if (bin < bins) {
        const o = counts + (<usize>bin << 3);
        store<f64>(o, load<f64>(o) + wt);
      } else {
        outside += wt;
        bin = bins;
      }
      const slot = one ? nb + bin : bin;
      store<u16>(row + (<usize>ky << 1), <u16>slot);
      if (sweep) {
        // point i = kx ts + ky of the sweep: lane (copy) i & 3 = ky & 3, as ts is a multiple of 4
        const i = (<usize>kx * <usize>ts + <usize>ky) << 2;
        const a = load<f32>(tre + i), b = load<f32>(tim + i);
        const o = acc + <usize>(ky & 3) * copy + (<usize>slot << 3);
        store<f64>(o, load<f64>(o) + <f64>(a * a + b * b));
      }
    }
    for (let ky = hh; ky < ts; ky++) store<u16>(row + (<usize>ky << 1), <u16>bins);
  }
  if (sweep) reduceCopies(acc, bins, sums);
  return outside;
}

/** sums[b] = 2 sum_j A_j[b] + sum_j A_j[NB + b] over the four accumulator copies. */
function reduceCopies(acc: usize, bins: i32, sums: usize): void {
  const nb = bins + 1;
  const copy = <usize>nb * 16;
  const a0 = acc, a1 = acc + copy, a2 = acc + 2 * copy, a3 = acc + 3 * copy;
  const half = <usize>nb << 3;
  for (let b = 0; b < bins; b++) {
    const o = <usize>b << 3;
    const two = (load<f64>(a0 + o) + load<f64>(a1 + o)) + (load<f64>(a2 + o) + load<f64>(a3 + o));
    const one = (load<f64>(a0 + half + o) + load<f64>(a1 + half + o)) +
      (load<f64>(a2 + half + o) + load<f64>(a3 + half + o));
    store<f64>(sums + o, 2 * two + one);
  }
}

/**
 * Annulus sums of |T|^2 (T: re, im planes of w rows x ts f32) by the slot table. acc: scratch of
 * spectrumAccumulatorBytes(bins); sums: f64[bins] (written). Returns 1.
 */
export function spectrumProfile(
  tre: usize, tim: usize, table: usize, w: i32, ts: i32, bins: i32, acc: usize, sums: usize,
): i32 {
  const nb = bins + 1;
  const copy = <usize>nb * 16; // bytes of one accumulator copy (2 nb f64)
  memory.fill(acc, 0, copy * 4);
  const a0 = acc, a1 = acc + copy, a2 = acc + 2 * copy, a3 = acc + 3 * copy;
  const n = <usize>w * <usize>ts;
  for (let i: usize = 0; i < n; i += 4) {
    const re = v128.load(tre + (i << 2)), im = v128.load(tim + (i << 2));
    const p = f32x4.add(f32x4.mul(re, re), f32x4.mul(im, im));
    const lo = f64x2.promote_low_f32x4(p);
    const hi = f64x2.promote_low_f32x4(v128.shuffle<f32>(p, p, 2, 3, 2, 3));
    const s = v128.load16x4_u(table + (i << 1));
    const o0 = a0 + (<usize>i32x4.extract_lane(s, 0) << 3);
    const o1 = a1 + (<usize>i32x4.extract_lane(s, 1) << 3);
    const o2 = a2 + (<usize>i32x4.extract_lane(s, 2) << 3);
    const o3 = a3 + (<usize>i32x4.extract_lane(s, 3) << 3);
    store<f64>(o0, load<f64>(o0) + f64x2.extract_lane(lo, 0));
    store<f64>(o1, load<f64>(o1) + f64x2.extract_lane(lo, 1));
    store<f64>(o2, load<f64>(o2) + f64x2.extract_lane(hi, 0));
    store<f64>(o3, load<f64>(o3) + f64x2.extract_lane(hi, 1));
  }
  reduceCopies(acc, bins, sums);
  return 1;
}

// ---------------------------------------------------------------------------------------------
// Structure tensor sums. With rows m = y - 1, c = y, p = y + 1 and columns x - 1, x + 1:
//   32 gx = 3 (f[m][x+1] - f[m][x-1]) + 10 (f[c][x+1] - f[c][x-1]) + 3 (f[p][x+1] - f[p][x-1])
//   32 gy = 3 (f[p][x-1] - f[m][x-1]) + 10 (f[p][x]   - f[m][x])   + 3 (f[p][x+1] - f[m][x+1])
// The sums are of (32 g)^2 per row in f32 lanes (exact for +-1 samples on rows below 16k px),
// then in f64 over rows, scaled by 1/1024 at the end.

@inline function ldf(p: usize, i: i32): f32 {
  return load<f32>(p + (<usize>i << 2));
}

/**
 * Frame sums of gx^2, gy^2, gx gy of the w x h f32 frame at `src` into out (f64[3]). Open
 * frames (periodic = 0) skip the one-pixel border; periodic frames wrap. Returns 1, or 0 when the
 * frame is narrower than 3 px on an open axis (no interior: the sums are 0).
 */
export function structureTensorSums(src: usize, w: i32, h: i32, periodic: i32, out: usize): i32 {
  const wrap = periodic != 0;
  store<f64>(out, 0); store<f64>(out, 0, 8); store<f64>(out, 0, 16);
  const y0 = wrap ? 0 : 1, y1 = wrap ? h : h - 1;
  const x0 = wrap ? 0 : 1, x1 = wrap ? w : w - 1;
  if (y1 <= y0 || x1 <= x0) return 0;
  const three = f32x4.splat(3), ten = f32x4.splat(10);
  let sxx = 0.0, syy = 0.0, sxy = 0.0;
  const rowBytes = <usize>w << 2;
  for (let y = y0; y < y1; y++) {
    const m = src + <usize>(y == 0 ? h - 1 : y - 1) * rowBytes;
    const c = src + <usize>y * rowBytes;
    const p = src + <usize>(y == h - 1 ? 0 : y + 1) * rowBytes;
    let vxx = f32x4.splat(0), vyy = f32x4.splat(0), vxy = f32x4.splat(0);
    // vector part: columns 1 .. w - 2 need no wrap
    let x = 1;
    for (; x + 4 <= w - 1; x += 4) {
      const o = <usize>x << 2;
      const ml = v128.load(m + o - 4), mc = v128.load(m + o), mr = v128.load(m + o + 4);
      const cl = v128.load(c + o - 4), cr = v128.load(c + o + 4);
      const pl = v128.load(p + o - 4), pc = v128.load(p + o), pr = v128.load(p + o + 4);
      const gx = f32x4.add(
        f32x4.mul(three, f32x4.add(f32x4.sub(mr, ml), f32x4.sub(pr, pl))),
        f32x4.mul(ten, f32x4.sub(cr, cl)),
      );
      const gy = f32x4.add(
        f32x4.mul(three, f32x4.add(f32x4.sub(pl, ml), f32x4.sub(pr, mr))),
        f32x4.mul(ten, f32x4.sub(pc, mc)),
      );
      vxx = f32x4.add(vxx, f32x4.mul(gx, gx));
      vyy = f32x4.add(vyy, f32x4.mul(gy, gy));
      vxy = f32x4.add(vxy, f32x4.mul(gx, gy));
    }
    let rxx = (f32x4.extract_lane(vxx, 0) + f32x4.extract_lane(vxx, 1)) +
      (f32x4.extract_lane(vxx, 2) + f32x4.extract_lane(vxx, 3));
    let ryy = (f32x4.extract_lane(vyy, 0) + f32x4.extract_lane(vyy, 1)) +
      (f32x4.extract_lane(vyy, 2) + f32x4.extract_lane(vyy, 3));
    let rxy = (f32x4.extract_lane(vxy, 0) + f32x4.extract_lane(vxy, 1)) +
      (f32x4.extract_lane(vxy, 2) + f32x4.extract_lane(vxy, 3));
    // scalar rest: the columns the vector part left, and the wrapped columns 0 and w - 1
    // (periodic: j = x - 1 stands for column 0, which the vector part never covers)
    for (let j = wrap ? x - 1 : x; j < x1; j++) {
      const xs = j == x - 1 ? 0 : j;
      const xm = xs == 0 ? w - 1 : xs - 1, xp = xs == w - 1 ? 0 : xs + 1;
      const gx = <f32>3 * ((ldf(m, xp) - ldf(m, xm)) + (ldf(p, xp) - ldf(p, xm))) +
        <f32>10 * (ldf(c, xp) - ldf(c, xm));
      const gy = <f32>3 * ((ldf(p, xm) - ldf(m, xm)) + (ldf(p, xp) - ldf(m, xp))) +
        <f32>10 * (ldf(p, xs) - ldf(m, xs));
      rxx += gx * gx; ryy += gy * gy; rxy += gx * gy;
    }
    sxx += <f64>rxx; syy += <f64>ryy; sxy += <f64>rxy;
  }
  const s = 1.0 / 1024;
  store<f64>(out, sxx * s); store<f64>(out, syy * s, 8); store<f64>(out, sxy * s, 16);
  return 1;
}
