// Real-input 2-D discrete Fourier transform and the power-spectrum reductions built on it.
//
// Line transforms: Stockham autosort FFT (self-sorting, out-of-place ping-pong; Cooley & Tukey
// 1965, Math. Comp. 19:297; Van Loan 1992, Computational Frameworks for the FFT, sec. 1.7) with
// radices 4, 2, 3, 5 and a generic odd radix up to 13; a length with a prime factor above 13 goes
// through Bluestein's chirp-z convolution (Bluestein 1970, IEEE Trans. Audio Electroacoust.
// 18:451) on a power-of-two length.
//
// Every line transform runs on a block of B adjacent columns at once, B a multiple of 4: a
// "row" of the transform is B f32 lanes, so each butterfly is f32x4 arithmetic over columns with
// the twiddle splatted. Blocks keep re and im in separate planes ("split complex").
//
// 2-D driver (row-column): pass A packs real columns 2c and 2c+1 of the frame as the real and
// imaginary part of one complex column, transforms along y, splits the pair by Hermitian symmetry
//   X_2c(ky) = (Z(ky) + conj Z(-ky)) / 2,   X_2c+1(ky) = (Z(ky) - conj Z(-ky)) / 2i
// and writes rows ky = 0 .. H/2 transposed into T (row x, column ky). Pass B transforms T along x.
// Result: T[kx][ky] = sum_{x,y} f(x,y) exp(-2 pi i (kx x / W + ky y / H)), ky = 0 .. floor(H/2);
// the other half is the complex conjugate at (-kx, -ky).

// ---------------------------------------------------------------------------------------------
// Line plan: i32 header words, then tables. Offsets are bytes from the plan pointer.
//   0 n   1 mode (0 Stockham, 1 Bluestein)   2 stages   3 M (Bluestein length)
//   4 sub-plan offset   5 chirp offset (n f32 pairs)   6 kernel spectrum offset (M f32 pairs)
//   7 scratch rows the transform needs (n or M)
//   8 + 4 s: stage s = radix p, sub-length l, stride s, twiddle offset
// Stage twiddles: for j < l/p, t = 1 .. p-1: (cos, -sin)(2 pi j t / l) as f32 pairs; a generic
// radix adds the p roots (cos, -sin)(2 pi r / p) after them.

const LP_HEAD: usize = 8 * 4 + 32 * 16;
const MAX_RADIX: i32 = 13;

@inline function align16(n: usize): usize {
  return (n + 15) & ~(<usize>15);
}

function nextRadix(n: i32): i32 {
  if (n % 4 == 0) return 4;
  if ((n & 1) == 0) return 2;
  for (let p = 3; p <= MAX_RADIX; p += 2) if (n % p == 0) return p;
  return n;
}

function needsBluestein(n: i32): bool {
  let m = n;
  while (m > 1) {
    const p = nextRadix(m);
    if (p > MAX_RADIX) return true;
    m /= p;
  }
  return false;
}

@inline function lpw(lp: usize, k: i32): i32 {
  return load<i32>(lp + (<usize>k << 2));
}
@inline function setLpw(lp: usize, k: i32, v: i32): void {
  store<i32>(lp + (<usize>k << 2), v);
}

/** In-place iterative radix-2 f64 FFT on interleaved pairs (plan set-up only; n a power of 2). */
function scalarFft64(a: usize, n: i32): void {
  for (let i = 1, j = 0; i < n; i++) {
    let bit = n >> 1;
    for (; (j & bit) != 0; bit >>= 1) j ^= bit;
    j ^= bit;
    if (i < j) {
      const pi = a + (<usize>i << 4), pj = a + (<usize>j << 4);
      const r = load<f64>(pi), m = load<f64>(pi, 8);
      store<f64>(pi, load<f64>(pj)); store<f64>(pi, load<f64>(pj, 8), 8);
      store<f64>(pj, r); store<f64>(pj, m, 8);
    }
  }
  for (let len = 2; len <= n; len <<= 1) {
    const half = len >> 1;
    for (let k = 0; k < half; k++) {
      const ang = -2.0 * Math.PI * <f64>k / <f64>len;
      const wr = Math.cos(ang), wi = Math.sin(ang);
      for (let i = k; i < n; i += len) {
        const p0 = a + (<usize>i << 4), p1 = a + (<usize>(i + half) << 4);
        const xr = load<f64>(p1), xi = load<f64>(p1, 8);
        const tr = xr * wr - xi * wi, ti = xr * wi + xi * wr;
        const ur = load<f64>(p0), ui = load<f64>(p0, 8);
        store<f64>(p0, ur + tr); store<f64>(p0, ui + ti, 8);
        store<f64>(p1, ur - tr); store<f64>(p1, ui - ti, 8);
      }
    }
  }
}

/**
 * Lays out (write = true) or only sizes (write = false) the line plan of length n at `lp`.
 * Bluestein plans use `tmp` (16 M bytes) as f64 scratch while writing.
 */
function linePlanBuild(lp: usize, n: i32, write: bool, tmp: usize): usize {
  let bytes = LP_HEAD;
  if (needsBluestein(n)) {
    let M = 1;
    while (M < 2 * n - 1) M <<= 1;
    const chirpOff = bytes;
    bytes = align16(bytes + (<usize>n << 3));
    const fbOff = bytes;
    bytes = align16(bytes + (<usize>M << 3));
    const subOff = bytes;
    bytes += linePlanBuild(lp + subOff, M, write, 0);
    if (write) {
      setLpw(lp, 0, n); setLpw(lp, 1, 1); setLpw(lp, 2, 0); setLpw(lp, 3, M);
      setLpw(lp, 4, <i32>subOff); setLpw(lp, 5, <i32>chirpOff); setLpw(lp, 6, <i32>fbOff);
      setLpw(lp, 7, M);
      // chirp c_j = exp(-i pi j^2 / n), with j^2 taken mod 2n to keep the angle small
      const n2 = <i64>n * 2;
      memory.fill(tmp, 0, <usize>M << 4);
      for (let j = 0; j < n; j++) {
        const jj = (<i64>j * <i64>j) % n2;
        const ang = Math.PI * <f64>jj / <f64>n;
        const cr = Math.cos(ang), ci = -Math.sin(ang);
        store<f32>(lp + chirpOff + (<usize>j << 3), <f32>cr);
        store<f32>(lp + chirpOff + (<usize>j << 3), <f32>ci, 4);
        // kernel b_m = conj(c_m) at m and M - m
        store<f64>(tmp + (<usize>j << 4), cr);
        store<f64>(tmp + (<usize>j << 4), -ci, 8);
        if (j > 0) {
          store<f64>(tmp + (<usize>(M - j) << 4), cr);
          store<f64>(tmp + (<usize>(M - j) << 4), -ci, 8);
        }
      }
      scalarFft64(tmp, M);
      const inv = 1.0 / <f64>M;
      for (let k = 0; k < M; k++) {
        store<f32>(lp + fbOff + (<usize>k << 3), <f32>(load<f64>(tmp + (<usize>k << 4)) * inv));
        store<f32>(lp + fbOff + (<usize>k << 3), <f32>(load<f64>(tmp + (<usize>k << 4), 8) * inv), 4);
      }
    }
    return align16(bytes);
  }
  let l = n, s = 1, st = 0;
  while (l > 1) {
    const p = nextRadix(l);
    const m = l / p;
    const twOff = bytes;
    bytes += <usize>(m * (p - 1)) << 3;
    if (p > 5) bytes += <usize>p << 3;
    bytes = align16(bytes);
    if (write) {
      const base = 8 + 4 * st;
      setLpw(lp, base, p); setLpw(lp, base + 1, l); setLpw(lp, base + 2, s);
      setLpw(lp, base + 3, <i32>twOff);
      let o = lp + twOff;
      for (let j = 0; j < m; j++) {
        for (let t = 1; t < p; t++) {
          const ang = 2.0 * Math.PI * <f64>(j * t) / <f64>l;
          store<f32>(o, <f32>Math.cos(ang)); store<f32>(o, <f32>(-Math.sin(ang)), 4);
          o += 8;
        }
      }
      if (p > 5) {
        for (let r = 0; r < p; r++) {
          const ang = 2.0 * Math.PI * <f64>r / <f64>p;
          store<f32>(o, <f32>Math.cos(ang)); store<f32>(o, <f32>(-Math.sin(ang)), 4);
          o += 8;
        }
      }
    }
    l = m; s *= p; st++;
  }
  if (write) {
    setLpw(lp, 0, n); setLpw(lp, 1, 0); setLpw(lp, 2, st); setLpw(lp, 3, 0);
    setLpw(lp, 4, 0); setLpw(lp, 5, 0); setLpw(lp, 6, 0); setLpw(lp, 7, n);
  }
  return align16(bytes);
}

// ---------------------------------------------------------------------------------------------
// Stockham stages on blocks. A block buffer is four planes (re, im of A; re, im of B); a row of a
// plane is RB = 16 NV bytes (NV f32x4 vectors). Row r sits at byte ra(r) = (r + r / 64) RB: one
// spare row every 64 rows, so that the p inputs of a butterfly, n / p rows apart, do not land on
// the same cache set when n is a power of two.

let RB: usize = 0;
let NV: i32 = 0;

@inline function ra(r: i32): usize {
  return <usize>(r + (r >> 6)) * RB;
}

/** Bytes of one block plane of `rows` rows, padded so that consecutive planes are offset by 3 lines. */
function planeBytes(rows: i32, rb: usize): usize {
  return <usize>(rows + (rows >> 6) + 1) * rb + 192;
}

@inline function cmulRe(xr: v128, xi: v128, wr: v128, wi: v128): v128 {
  return f32x4.sub(f32x4.mul(xr, wr), f32x4.mul(xi, wi));
}
@inline function cmulIm(xr: v128, xi: v128, wr: v128, wi: v128): v128 {
  return f32x4.add(f32x4.mul(xr, wi), f32x4.mul(xi, wr));
}

// One stage: radix p, sub-length l, stride s, m = l / p. For j < m, q < s it reads rows
// q + s (j + m r), r < p, and writes rows q + s (p j + t), t < p, multiplying output t by
// w^t = exp(-2 pi i j t / l).
function stage2(sr: usize, si: usize, dr: usize, di: usize, l: i32, s: i32, tw: usize): void {
  const m = l >> 1, ms = m * s;
  for (let j = 0; j < m; j++) {
    const wr = f32x4.splat(load<f32>(tw + (<usize>j << 3)));
    const wi = f32x4.splat(load<f32>(tw + (<usize>j << 3), 4));
    for (let q = 0; q < s; q++) {
      const ri = q + s * j, ro = q + 2 * s * j;
      const a0 = ra(ri), a1 = ra(ri + ms);
      const o0 = ra(ro), o1 = ra(ro + s);
      for (let v = 0; v < NV; v++) {
        const off = <usize>v << 4;
        const x0r = v128.load(sr + a0 + off), x0i = v128.load(si + a0 + off);
        const x1r = v128.load(sr + a1 + off), x1i = v128.load(si + a1 + off);
        v128.store(dr + o0 + off, f32x4.add(x0r, x1r));
        v128.store(di + o0 + off, f32x4.add(x0i, x1i));
        const br = f32x4.sub(x0r, x1r), bi = f32x4.sub(x0i, x1i);
        v128.store(dr + o1 + off, cmulRe(br, bi, wr, wi));
        v128.store(di + o1 + off, cmulIm(br, bi, wr, wi));
      }
    }
  }
}

function stage4(sr: usize, si: usize, dr: usize, di: usize, l: i32, s: i32, tw: usize): void {
  const m = l >> 2, ms = m * s;
  for (let j = 0; j < m; j++) {
    const t = tw + <usize>(j * 3) * 8;
    const w1r = f32x4.splat(load<f32>(t)), w1i = f32x4.splat(load<f32>(t, 4));
    const w2r = f32x4.splat(load<f32>(t, 8)), w2i = f32x4.splat(load<f32>(t, 12));
    const w3r = f32x4.splat(load<f32>(t, 16)), w3i = f32x4.splat(load<f32>(t, 20));
    for (let q = 0; q < s; q++) {
      const ri = q + s * j, ro = q + 4 * s * j;
      const a0 = ra(ri), a1 = ra(ri + ms), a2 = ra(ri + 2 * ms), a3 = ra(ri + 3 * ms);
      const o0 = ra(ro), o1 = ra(ro + s), o2 = ra(ro + 2 * s), o3 = ra(ro + 3 * s);
      for (let v = 0; v < NV; v++) {
        const off = <usize>v << 4;
        const x0r = v128.load(sr + a0 + off), x0i = v128.load(si + a0 + off);
        const x1r = v128.load(sr + a1 + off), x1i = v128.load(si + a1 + off);
        const x2r = v128.load(sr + a2 + off), x2i = v128.load(si + a2 + off);
        const x3r = v128.load(sr + a3 + off), x3i = v128.load(si + a3 + off);
        const t0r = f32x4.add(x0r, x2r), t0i = f32x4.add(x0i, x2i);
        const t1r = f32x4.sub(x0r, x2r), t1i = f32x4.sub(x0i, x2i);
        const t2r = f32x4.add(x1r, x3r), t2i = f32x4.add(x1i, x3i);
        const t3r = f32x4.sub(x1r, x3r), t3i = f32x4.sub(x1i, x3i);
        // X0 = t0 + t2, X2 = t0 - t2, X1 = t1 - i t3, X3 = t1 + i t3
        v128.store(dr + o0 + off, f32x4.add(t0r, t2r));
        v128.store(di + o0 + off, f32x4.add(t0i, t2i));
        const y1r = f32x4.add(t1r, t3i), y1i = f32x4.sub(t1i, t3r);
        const y2r = f32x4.sub(t0r, t2r), y2i = f32x4.sub(t0i, t2i);
        const y3r = f32x4.sub(t1r, t3i), y3i = f32x4.add(t1i, t3r);
        v128.store(dr + o1 + off, cmulRe(y1r, y1i, w1r, w1i));
        v128.store(di + o1 + off, cmulIm(y1r, y1i, w1r, w1i));
        v128.store(dr + o2 + off, cmulRe(y2r, y2i, w2r, w2i));
        v128.store(di + o2 + off, cmulIm(y2r, y2i, w2r, w2i));
        v128.store(dr + o3 + off, cmulRe(y3r, y3i, w3r, w3i));
        v128.store(di + o3 + off, cmulIm(y3r, y3i, w3r, w3i));
      }
    }
  }
}

function stage3(sr: usize, si: usize, dr: usize, di: usize, l: i32, s: i32, tw: usize): void {
  const m = l / 3, ms = m * s;
  const h = f32x4.splat(<f32>0.86602540378443864676); // sin(2 pi / 3)
  const half = f32x4.splat(<f32>0.5);
  for (let j = 0; j < m; j++) {
    const t = tw + <usize>(j * 2) * 8;
    const w1r = f32x4.splat(load<f32>(t)), w1i = f32x4.splat(load<f32>(t, 4));
    const w2r = f32x4.splat(load<f32>(t, 8)), w2i = f32x4.splat(load<f32>(t, 12));
    for (let q = 0; q < s; q++) {
      const ri = q + s * j, ro = q + 3 * s * j;
      const a0 = ra(ri), a1 = ra(ri + ms), a2 = ra(ri + 2 * ms);
      const o0 = ra(ro), o1 = ra(ro + s), o2 = ra(ro + 2 * s);
      for (let v = 0; v < NV; v++) {
        const off = <usize>v << 4;
        const x0r = v128.load(sr + a0 + off), x0i = v128.load(si + a0 + off);
        const x1r = v128.load(sr + a1 + off), x1i = v128.load(si + a1 + off);
        const x2r = v128.load(sr + a2 + off), x2i = v128.load(si + a2 + off);
        const t1r = f32x4.add(x1r, x2r), t1i = f32x4.add(x1i, x2i);
        const t2r = f32x4.sub(x1r, x2r), t2i = f32x4.sub(x1i, x2i);
        v128.store(dr + o0 + off, f32x4.add(x0r, t1r));
        v128.store(di + o0 + off, f32x4.add(x0i, t1i));
        const mr = f32x4.sub(x0r, f32x4.mul(half, t1r)), mi = f32x4.sub(x0i, f32x4.mul(half, t1i));
        // X1 = m - i h t2, X2 = m + i h t2
        const y1r = f32x4.add(mr, f32x4.mul(h, t2i)), y1i = f32x4.sub(mi, f32x4.mul(h, t2r));
        const y2r = f32x4.sub(mr, f32x4.mul(h, t2i)), y2i = f32x4.add(mi, f32x4.mul(h, t2r));
        v128.store(dr + o1 + off, cmulRe(y1r, y1i, w1r, w1i));
        v128.store(di + o1 + off, cmulIm(y1r, y1i, w1r, w1i));
        v128.store(dr + o2 + off, cmulRe(y2r, y2i, w2r, w2i));
        v128.store(di + o2 + off, cmulIm(y2r, y2i, w2r, w2i));
      }
    }
  }
}

function stage5(sr: usize, si: usize, dr: usize, di: usize, l: i32, s: i32, tw: usize): void {
  const m = l / 5, ms = m * s;
  const c1 = f32x4.splat(<f32>0.30901699437494742410);  // cos(2 pi / 5)
  const c2 = f32x4.splat(<f32>-0.80901699437494742410); // cos(4 pi / 5)
  const s1 = f32x4.splat(<f32>0.95105651629515357212);  // sin(2 pi / 5)
  const s2 = f32x4.splat(<f32>0.58778525229247312917);  // sin(4 pi / 5)
  for (let j = 0; j < m; j++) {
    const t = tw + <usize>(j * 4) * 8;
    const w1r = f32x4.splat(load<f32>(t)), w1i = f32x4.splat(load<f32>(t, 4));
    const w2r = f32x4.splat(load<f32>(t, 8)), w2i = f32x4.splat(load<f32>(t, 12));
    const w3r = f32x4.splat(load<f32>(t, 16)), w3i = f32x4.splat(load<f32>(t, 20));
    const w4r = f32x4.splat(load<f32>(t, 24)), w4i = f32x4.splat(load<f32>(t, 28));
    for (let q = 0; q < s; q++) {
      const ri = q + s * j, ro = q + 5 * s * j;
      const a0 = ra(ri), a1 = ra(ri + ms), a2 = ra(ri + 2 * ms), a3 = ra(ri + 3 * ms), a4 = ra(ri + 4 * ms);
      const o0 = ra(ro), o1 = ra(ro + s), o2 = ra(ro + 2 * s), o3 = ra(ro + 3 * s), o4 = ra(ro + 4 * s);
      for (let v = 0; v < NV; v++) {
        const off = <usize>v << 4;
        const x0r = v128.load(sr + a0 + off), x0i = v128.load(si + a0 + off);
        const x1r = v128.load(sr + a1 + off), x1i = v128.load(si + a1 + off);
        const x2r = v128.load(sr + a2 + off), x2i = v128.load(si + a2 + off);
        const x3r = v128.load(sr + a3 + off), x3i = v128.load(si + a3 + off);
        const x4r = v128.load(sr + a4 + off), x4i = v128.load(si + a4 + off);
        const a1r = f32x4.add(x1r, x4r), a1i = f32x4.add(x1i, x4i);
        const b1r = f32x4.sub(x1r, x4r), b1i = f32x4.sub(x1i, x4i);
        const a2r = f32x4.add(x2r, x3r), a2i = f32x4.add(x2i, x3i);
        const b2r = f32x4.sub(x2r, x3r), b2i = f32x4.sub(x2i, x3i);
        v128.store(dr + o0 + off, f32x4.add(x0r, f32x4.add(a1r, a2r)));
        v128.store(di + o0 + off, f32x4.add(x0i, f32x4.add(a1i, a2i)));
        // X1,4 = x0 + c1 a1 + c2 a2 -/+ i (s1 b1 + s2 b2); X2,3 = x0 + c2 a1 + c1 a2 -/+ i (s2 b1 - s1 b2)
        const p1r = f32x4.add(x0r, f32x4.add(f32x4.mul(c1, a1r), f32x4.mul(c2, a2r)));
        const p1i = f32x4.add(x0i, f32x4.add(f32x4.mul(c1, a1i), f32x4.mul(c2, a2i)));
        const q1r = f32x4.add(f32x4.mul(s1, b1r), f32x4.mul(s2, b2r));
        const q1i = f32x4.add(f32x4.mul(s1, b1i), f32x4.mul(s2, b2i));
        const p2r = f32x4.add(x0r, f32x4.add(f32x4.mul(c2, a1r), f32x4.mul(c1, a2r)));
        const p2i = f32x4.add(x0i, f32x4.add(f32x4.mul(c2, a1i), f32x4.mul(c1, a2i)));
        const q2r = f32x4.sub(f32x4.mul(s2, b1r), f32x4.mul(s1, b2r));
        const q2i = f32x4.sub(f32x4.mul(s2, b1i), f32x4.mul(s1, b2i));
        // -i (u + i v) = v - i u
        const y1r = f32x4.add(p1r, q1i), y1i = f32x4.sub(p1i, q1r);
        const y4r = f32x4.sub(p1r, q1i), y4i = f32x4.add(p1i, q1r);
        const y2r = f32x4.add(p2r, q2i), y2i = f32x4.sub(p2i, q2r);
        const y3r = f32x4.sub(p2r, q2i), y3i = f32x4.add(p2i, q2r);
        v128.store(dr + o1 + off, cmulRe(y1r, y1i, w1r, w1i));
        v128.store(di + o1 + off, cmulIm(y1r, y1i, w1r, w1i));
        v128.store(dr + o2 + off, cmulRe(y2r, y2i, w2r, w2i));
        v128.store(di + o2 + off, cmulIm(y2r, y2i, w2r, w2i));
        v128.store(dr + o3 + off, cmulRe(y3r, y3i, w3r, w3i));
        v128.store(di + o3 + off, cmulIm(y3r, y3i, w3r, w3i));
        v128.store(dr + o4 + off, cmulRe(y4r, y4i, w4r, w4i));
        v128.store(di + o4 + off, cmulIm(y4r, y4i, w4r, w4i));
      }
    }
  }
}

/** Generic odd radix p (7, 11, 13): direct p-point DFT with the root table after the twiddles. */
function stageP(sr: usize, si: usize, dr: usize, di: usize, p: i32, l: i32, s: i32, tw: usize): void {
  const m = l / p, ms = m * s;
  const roots = tw + <usize>(m * (p - 1)) * 8;
  for (let j = 0; j < m; j++) {
    const t = tw + <usize>(j * (p - 1)) * 8;
    for (let q = 0; q < s; q++) {
      const ri = q + s * j, ro = q + p * s * j;
      for (let v = 0; v < NV; v++) {
        const off = <usize>v << 4;
        for (let k = 0; k < p; k++) {
          const a0 = ra(ri) + off;
          let accr = v128.load(sr + a0), acci = v128.load(si + a0);
          let e = 0;
          for (let r = 1; r < p; r++) {
            e += k;
            if (e >= p) e -= p;
            const a = ra(ri + r * ms) + off;
            const xr = v128.load(sr + a), xi = v128.load(si + a);
            const rr = f32x4.splat(load<f32>(roots + (<usize>e << 3)));
            const rim = f32x4.splat(load<f32>(roots + (<usize>e << 3), 4));
            accr = f32x4.add(accr, cmulRe(xr, xi, rr, rim));
            acci = f32x4.add(acci, cmulIm(xr, xi, rr, rim));
          }
          const o = ra(ro + k * s) + off;
          if (k == 0) {
            v128.store(dr + o, accr); v128.store(di + o, acci);
          } else {
            const wr = f32x4.splat(load<f32>(t + (<usize>(k - 1) << 3)));
            const wi = f32x4.splat(load<f32>(t + (<usize>(k - 1) << 3), 4));
            v128.store(dr + o, cmulRe(accr, acci, wr, wi));
            v128.store(di + o, cmulIm(accr, acci, wr, wi));
          }
        }
      }
    }
  }
}

/** Runs the Stockham stages of plan `lp` on block A; returns 0 if the result is in A, 1 if in B. */
function stockham(lp: usize, ar: usize, ai: usize, br: usize, bi: usize): i32 {
  const stages = lpw(lp, 2);
  let sr = ar, si = ai, dr = br, di = bi, where = 0;
  for (let k = 0; k < stages; k++) {
    const p = lpw(lp, 8 + 4 * k), l = lpw(lp, 9 + 4 * k), s = lpw(lp, 10 + 4 * k);
    const tw = lp + <usize>lpw(lp, 11 + 4 * k);
    if (p == 4) stage4(sr, si, dr, di, l, s, tw);
    else if (p == 2) stage2(sr, si, dr, di, l, s, tw);
    else if (p == 3) stage3(sr, si, dr, di, l, s, tw);
    else if (p == 5) stage5(sr, si, dr, di, l, s, tw);
    else stageP(sr, si, dr, di, p, l, s, tw);
    const tr = sr, ti = si;
    sr = dr; si = di; dr = tr; di = ti;
    where ^= 1;
  }
  return where;
}

/** Multiplies rows 0..rows-1 of (re, im) by the per-row complex table, conjugating after if asked. */
function rowMul(re: usize, im: usize, table: usize, rows: i32, conjAfter: bool): void {
  const sign = f32x4.splat(conjAfter ? <f32>-1 : <f32>1);
  for (let r = 0; r < rows; r++) {
    const wr = f32x4.splat(load<f32>(table + (<usize>r << 3)));
    const wi = f32x4.splat(load<f32>(table + (<usize>r << 3), 4));
    const row = ra(r);
    for (let v = 0; v < NV; v++) {
      const o = row + (<usize>v << 4);
      const xr = v128.load(re + o), xi = v128.load(im + o);
      v128.store(re + o, cmulRe(xr, xi, wr, wi));
      v128.store(im + o, f32x4.mul(sign, cmulIm(xr, xi, wr, wi)));
    }
  }
}

/** Conjugates rows 0..rows-1 of `im` in place. */
function rowConj(im: usize, rows: i32): void {
  const neg = f32x4.splat(<f32>-1);
  for (let r = 0; r < rows; r++) {
    const row = im + ra(r);
    for (let v = 0; v < NV; v++) {
      const o = row + (<usize>v << 4);
      v128.store(o, f32x4.mul(neg, v128.load(o)));
    }
  }
}

/** Forward line transform of rows 0..n-1 of block A; returns which block (0 A, 1 B) holds it. */
function lineForward(lp: usize, ar: usize, ai: usize, br: usize, bi: usize): i32 {
  if (lpw(lp, 1) == 0) return stockham(lp, ar, ai, br, bi);
  const n = lpw(lp, 0), M = lpw(lp, 3);
  const sub = lp + <usize>lpw(lp, 4);
  const chirp = lp + <usize>lpw(lp, 5), fb = lp + <usize>lpw(lp, 6);
  // a_j = x_j c_j, zero-padded to M
  rowMul(ar, ai, chirp, n, false);
  memory.fill(ar + ra(n), 0, ra(M) - ra(n));
  memory.fill(ai + ra(n), 0, ra(M) - ra(n));
  // conv = IFFT(FFT(a) FFT(b)) with IFFT(Y) = conj(FFT(conj Y)) / M (1/M folded into fb)
  let w = stockham(sub, ar, ai, br, bi);
  let xr = w == 0 ? ar : br, xi = w == 0 ? ai : bi;
  let yr = w == 0 ? br : ar, yi = w == 0 ? bi : ai;
  rowMul(xr, xi, fb, M, true);
  const w2 = stockham(sub, xr, xi, yr, yi);
  const zr = w2 == 0 ? xr : yr, zi = w2 == 0 ? xi : yi;
  // X_k = c_k conj(z_k)
  rowConj(zi, n);
  rowMul(zr, zi, chirp, n, false);
  return zr == ar ? 0 : 1;
}

// ---------------------------------------------------------------------------------------------
// 2-D plan: i32 header words (offsets in bytes from the plan pointer), then the line plans,
// the block scratch (4 planes of R rows x B floats) and T (2 planes of W rows x TS floats).
//   0 W   1 H   2 B   3 HH = H/2 + 1   4 TS (T row stride, floats, multiple of B)
//   5 CW = ceil(W / 2) complex columns of pass A   6 plan(H) offset   7 plan(W) offset
//   8 scratch offset   9 scratch rows R   10 T re offset   11 T im offset   12 temp bytes

const P2_HEAD: usize = 64;
const BLOCK: i32 = 16;

@inline function p2w(p: usize, k: i32): i32 {
  return load<i32>(p + (<usize>k << 2));
}

function fft2Layout(p: usize, w: i32, h: i32, write: bool): usize {
  const B = BLOCK;
  const hh = (h >> 1) + 1;
  const ts = ((hh + B - 1) / B) * B;
  let bytes = P2_HEAD;
  const lpH = bytes;
  bytes += linePlanBuild(0, h, false, 0);
  const lpW = bytes;
  bytes += linePlanBuild(0, w, false, 0);
  const rowsH = needsBluestein(h) ? lineRows(h) : h;
  const rowsW = needsBluestein(w) ? lineRows(w) : w;
  const R = rowsH > rowsW ? rowsH : rowsW;
  const scr = bytes;
  bytes += 4 * planeBytes(R, <usize>B << 2);
  const tre = bytes;
  bytes += <usize>w * <usize>ts * 4;
  const tim = bytes;
  bytes += <usize>w * <usize>ts * 4;
  if (write) {
    store<i32>(p, w, 0); store<i32>(p, h, 4); store<i32>(p, B, 8); store<i32>(p, hh, 12);
    store<i32>(p, ts, 16); store<i32>(p, (w + 1) >> 1, 20); store<i32>(p, <i32>lpH, 24);
    store<i32>(p, <i32>lpW, 28); store<i32>(p, <i32>scr, 32); store<i32>(p, R, 36);
    store<i32>(p, <i32>tre, 40); store<i32>(p, <i32>tim, 44);
  }
  return bytes;
}

function lineRows(n: i32): i32 {
  let M = 1;
  while (M < 2 * n - 1) M <<= 1;
  return M;
}

/** Bytes of the 2-D plan and workspace for a w x h real frame; 0 for sizes out of range. */
export function fft2Bytes(w: i32, h: i32): f64 {
  if (w < 1 || h < 1 || w > (1 << 20) || h > (1 << 20)) return 0;
  return <f64>fft2Layout(0, w, h, false);
}

/** Bytes of f64 scratch `fft2Init` needs (Bluestein kernels); pass 0 when this is 0. */
export function fft2InitScratchBytes(w: i32, h: i32): f64 {
  const a = needsBluestein(w) ? lineRows(w) : 0;
  const b = needsBluestein(h) ? lineRows(h) : 0;
  return <f64>((a > b ? a : b) * 16);
}

/** Lays out the plan at p (16-aligned, fft2Bytes(w, h) bytes). Returns 1, or 0 on bad sizes. */
export function fft2Init(p: usize, w: i32, h: i32, tmp: usize): i32 {
  if (fft2Bytes(w, h) == 0 || (p & 15) != 0) return 0;
  fft2Layout(p, w, h, true);
  linePlanBuild(p + <usize>p2w(p, 6), h, true, tmp);
  linePlanBuild(p + <usize>p2w(p, 7), w, true, tmp);
  const ts = p2w(p, 4);
  memory.fill(p + <usize>p2w(p, 10), 0, <usize>w * <usize>ts * 4);
  memory.fill(p + <usize>p2w(p, 11), 0, <usize>w * <usize>ts * 4);
  return 1;
}

export function fft2TRe(p: usize): usize { return p + <usize>p2w(p, 10); }
export function fft2TIm(p: usize): usize { return p + <usize>p2w(p, 11); }
export function fft2TStride(p: usize): i32 { return p2w(p, 4); }

// Pass A's split, four columns of one row a vector: (a + b) / 2 and (a - b) / 2.
@inline function halfSum(a: v128, b: v128): v128 { return f32x4.mul(f32x4.splat(0.5), f32x4.add(a, b)); }
@inline function halfDiff(a: v128, b: v128): v128 { return f32x4.mul(f32x4.splat(0.5), f32x4.sub(a, b)); }

/** Rows r0..r3 (lane j = column j) stored as columns: lane j's four values at dst + j stride. */
@inline function storeTransposed(dst: usize, stride: usize, r0: v128, r1: v128, r2: v128, r3: v128): void {
  const t0 = v128.shuffle<f32>(r0, r1, 0, 4, 1, 5), t1 = v128.shuffle<f32>(r0, r1, 2, 6, 3, 7);
  const t2 = v128.shuffle<f32>(r2, r3, 0, 4, 1, 5), t3 = v128.shuffle<f32>(r2, r3, 2, 6, 3, 7);
  v128.store(dst, v128.shuffle<f32>(t0, t2, 0, 1, 4, 5));
  v128.store(dst + stride, v128.shuffle<f32>(t0, t2, 2, 3, 6, 7));
  v128.store(dst + 2 * stride, v128.shuffle<f32>(t1, t3, 0, 1, 4, 5));
  v128.store(dst + 3 * stride, v128.shuffle<f32>(t1, t3, 2, 3, 6, 7));
}

/** Forward transform of the w x h f32 frame at `src` into T. Returns 1. */
export function fft2Forward(p: usize, src: usize): i32 {
  const w = p2w(p, 0), h = p2w(p, 1), B = p2w(p, 2), hh = p2w(p, 3), ts = p2w(p, 4);
  const cw = p2w(p, 5), R = p2w(p, 9);
  const lpH = p + <usize>p2w(p, 6), lpW = p + <usize>p2w(p, 7);
  const tre = p + <usize>p2w(p, 10), tim = p + <usize>p2w(p, 11);
  NV = B >> 2;
  RB = <usize>B << 2;
  const plane = planeBytes(R, RB);
  const ar = p + <usize>p2w(p, 8), ai = ar + plane, br = ai + plane, bi = br + plane;
  const rowBytes = <usize>w << 2, tsBytes = <usize>ts << 2;

  // Pass A: blocks of B complex columns c0 .. c0 + B - 1 = real columns 2 c0 .. 2 c0 + 2B - 1.
  for (let c0 = 0; c0 < cw; c0 += B) {
    const x0 = 2 * c0;
    if (x0 + 2 * B <= w) {
      for (let y = 0; y < h; y++) {
        const s = src + <usize>y * rowBytes + (<usize>x0 << 2);
        const d = ra(y);
        for (let v = 0; v < NV; v++) {
          const a = v128.load(s + (<usize>v << 5)), b = v128.load(s + (<usize>v << 5), 16);
          v128.store(ar + d + (<usize>v << 4), v128.shuffle<f32>(a, b, 0, 2, 4, 6));
          v128.store(ai + d + (<usize>v << 4), v128.shuffle<f32>(a, b, 1, 3, 5, 7));
        }
      }
    } else {
      for (let y = 0; y < h; y++) {
        const s = src + <usize>y * rowBytes;
        const d = ra(y);
        for (let i = 0; i < B; i++) {
          const x = x0 + 2 * i;
          store<f32>(ar + d + (<usize>i << 2), x < w ? load<f32>(s + (<usize>x << 2)) : 0);
          store<f32>(ai + d + (<usize>i << 2), x + 1 < w ? load<f32>(s + (<usize>(x + 1) << 2)) : 0);
        }
      }
    }
    const where = lineForward(lpH, ar, ai, br, bi);
    const zr = where == 0 ? ar : br, zi = where == 0 ? ai : bi;
    const iend = cw - c0 < B ? cw - c0 : B;
    // A whole block of column pairs: rows ky = 1 .. 4 at a time, four columns a vector,
    // transposed 4 x 4 into T (ky = 0 and the rows left over one by one below).
    let kv = 1;
    if (iend == B && x0 + 2 * B <= w) {
      for (; kv + 3 < hh; kv += 4) {
        const o0 = ra(kv), o1 = ra(kv + 1), o2 = ra(kv + 2), o3 = ra(kv + 3);
        const m0 = ra(h - kv), m1 = ra(h - kv - 1), m2 = ra(h - kv - 2), m3 = ra(h - kv - 3);
        const kb = <usize>kv << 2;
        for (let g = 0; g < NV; g++) {
          const lane = <usize>g << 4;
          const x = x0 + 8 * g;
          const er = tre + <usize>x * tsBytes + kb, ei = tim + <usize>x * tsBytes + kb;
          const pr0 = v128.load(zr + o0 + lane), pi0 = v128.load(zi + o0 + lane);
          const mr0 = v128.load(zr + m0 + lane), mi0 = v128.load(zi + m0 + lane);
          const pr1 = v128.load(zr + o1 + lane), pi1 = v128.load(zi + o1 + lane);
          const mr1 = v128.load(zr + m1 + lane), mi1 = v128.load(zi + m1 + lane);
          const pr2 = v128.load(zr + o2 + lane), pi2 = v128.load(zi + o2 + lane);
          const mr2 = v128.load(zr + m2 + lane), mi2 = v128.load(zi + m2 + lane);
          const pr3 = v128.load(zr + o3 + lane), pi3 = v128.load(zi + o3 + lane);
          const mr3 = v128.load(zr + m3 + lane), mi3 = v128.load(zi + m3 + lane);
          // Column x + 2 j (j = lane) takes (Z(ky) + conj Z(-ky)) / 2, column x + 2 j + 1 the rest.
          storeTransposed(er, 2 * tsBytes, halfSum(pr0, mr0), halfSum(pr1, mr1), halfSum(pr2, mr2), halfSum(pr3, mr3));
          storeTransposed(ei, 2 * tsBytes, halfDiff(pi0, mi0), halfDiff(pi1, mi1), halfDiff(pi2, mi2), halfDiff(pi3, mi3));
          storeTransposed(er + tsBytes, 2 * tsBytes, halfSum(pi0, mi0), halfSum(pi1, mi1), halfSum(pi2, mi2), halfSum(pi3, mi3));
          storeTransposed(ei + tsBytes, 2 * tsBytes, halfDiff(mr0, pr0), halfDiff(mr1, pr1), halfDiff(mr2, pr2), halfDiff(mr3, pr3));
        }
      }
    }
    for (let i = 0; i < iend; i++) {
      const x = x0 + 2 * i;
      const lane = <usize>i << 2;
      const er = tre + <usize>x * tsBytes, ei = tim + <usize>x * tsBytes;
      const hasOdd = x + 1 < w;
      // (row 0, then the rows from kv on: 1 .. kv - 1 went four at a time above)
      for (let ky = 0; ky < hh; ky = ky == 0 ? kv : ky + 1) {
        const km = ky == 0 ? 0 : h - ky;
        const o = ra(ky) + lane, om = ra(km) + lane;
        const pr = load<f32>(zr + o), pi = load<f32>(zi + o);
        const mr = load<f32>(zr + om), mi = load<f32>(zi + om);
        store<f32>(er + (<usize>ky << 2), <f32>0.5 * (pr + mr));
        store<f32>(ei + (<usize>ky << 2), <f32>0.5 * (pi - mi));
        if (hasOdd) {
          store<f32>(er + tsBytes + (<usize>ky << 2), <f32>0.5 * (pi + mi));
          store<f32>(ei + tsBytes + (<usize>ky << 2), <f32>0.5 * (mr - pr));
        }
      }
    }
  }

  // Pass B: blocks of B columns of T, transformed along x (W rows).
  for (let k0 = 0; k0 < hh; k0 += B) {
    const col = <usize>k0 << 2;
    for (let x = 0; x < w; x++) {
      const s = <usize>x * tsBytes + col, d = ra(x);
      for (let v = 0; v < NV; v++) {
        const o = <usize>v << 4;
        v128.store(ar + d + o, v128.load(tre + s + o));
        v128.store(ai + d + o, v128.load(tim + s + o));
      }
    }
    const where = lineForward(lpW, ar, ai, br, bi);
    const zr = where == 0 ? ar : br, zi = where == 0 ? ai : bi;
    for (let x = 0; x < w; x++) {
      const d = <usize>x * tsBytes + col, s = ra(x);
      for (let v = 0; v < NV; v++) {
        const o = <usize>v << 4;
        v128.store(tre + d + o, v128.load(zr + s + o));
        v128.store(tim + d + o, v128.load(zi + s + o));
      }
    }
  }
  return 1;
}

// ---------------------------------------------------------------------------------------------
// Spectrum reductions over the half spectrum in T. A point (kx, ky) with 0 < ky < H/2 stands for
// itself and its mirror (-kx, -ky), weight 2; rows ky = 0 and ky = H/2 (H even) hold both
// halves already, weight 1. Signed kx' = kx for kx <= W/2, else kx - W.

/**
 * Removes the window-weighted mean of the w x h f32 frame at `src` and multiplies by the
 * separable window winX (w f32) x winY (h f32), in place. stats (f64): [0] weighted mean,
 * [1] variance of the samples, [2] sum of squares after windowing. Returns 1, or 0 when a sample
 * is NaN or infinite (the frame is left unchanged then).
 */
export function spectrumPrepare(src: usize, w: i32, h: i32, winX: usize, winY: usize, stats: usize): i32 {
  let swx = 0.0, sw = 0.0, sx = 0.0, sxx = 0.0;
  let sumWx = 0.0;
  for (let x = 0; x < w; x++) sumWx += <f64>load<f32>(winX + (<usize>x << 2));
  const rowBytes = <usize>w << 2;
  for (let y = 0; y < h; y++) {
    const row = src + <usize>y * rowBytes;
    let a = f32x4.splat(0), b = f32x4.splat(0), c = f32x4.splat(0);
    let x = 0;
    for (; x + 4 <= w; x += 4) {
      const v = v128.load(row + (<usize>x << 2));
      const wx = v128.load(winX + (<usize>x << 2));
      a = f32x4.add(a, f32x4.mul(v, wx));
      b = f32x4.add(b, v);
      c = f32x4.add(c, f32x4.mul(v, v));
    }
    let ra = <f64>(f32x4.extract_lane(a, 0) + f32x4.extract_lane(a, 1)) +
      <f64>(f32x4.extract_lane(a, 2) + f32x4.extract_lane(a, 3));
    let rb = <f64>(f32x4.extract_lane(b, 0) + f32x4.extract_lane(b, 1)) +
      <f64>(f32x4.extract_lane(b, 2) + f32x4.extract_lane(b, 3));
    let rc = <f64>(f32x4.extract_lane(c, 0) + f32x4.extract_lane(c, 1)) +
      <f64>(f32x4.extract_lane(c, 2) + f32x4.extract_lane(c, 3));
    for (; x < w; x++) {
      const v = <f64>load<f32>(row + (<usize>x << 2));
      ra += v * <f64>load<f32>(winX + (<usize>x << 2));
      rb += v; rc += v * v;
    }
    const wy = <f64>load<f32>(winY + (<usize>y << 2));
    swx += wy * ra; sw += wy * sumWx; sx += rb; sxx += rc;
  }
  if (!isFinite(swx) || !isFinite(sxx)) return 0;
  const n = <f64>w * <f64>h;
  const mean = sw > 0 ? swx / sw : sx / n;
  const plain = sx / n;
  let variance = sxx / n - plain * plain;
  if (variance < 0) variance = 0;
  const mv = f32x4.splat(<f32>mean);
  let e = 0.0;
  for (let y = 0; y < h; y++) {
    const row = src + <usize>y * rowBytes;
    const wy = load<f32>(winY + (<usize>y << 2));
    const wyv = f32x4.splat(wy);
    let acc = f32x4.splat(0);
    let x = 0;
    for (; x + 4 <= w; x += 4) {
      const o = row + (<usize>x << 2);
      const v = f32x4.mul(f32x4.mul(f32x4.sub(v128.load(o), mv), v128.load(winX + (<usize>x << 2))), wyv);
      v128.store(o, v);
      acc = f32x4.add(acc, f32x4.mul(v, v));
    }
    let re = <f64>(f32x4.extract_lane(acc, 0) + f32x4.extract_lane(acc, 1)) +
      <f64>(f32x4.extract_lane(acc, 2) + f32x4.extract_lane(acc, 3));
    for (; x < w; x++) {
      const o = row + (<usize>x << 2);
      const v = (load<f32>(o) - <f32>mean) * load<f32>(winX + (<usize>x << 2)) * wy;
      store<f32>(o, v);
      re += <f64>v * <f64>v;
    }
    e += re;
  }
  store<f64>(stats, mean); store<f64>(stats, variance, 8); store<f64>(stats, e, 16);
  return 1;
}

/**
 * Radial profile of |T|^2: a point at radius r = sqrt((kx' sx)^2 + (ky sy)^2) (in bins) goes to
 * bin floor(r + 0.5) when below `bins`. sums, counts: f64[bins] (cleared here). Returns the
 * number of points (weighted) that fell beyond the last bin.
 */
export function spectrumRadial(p: usize, bins: i32, sx: f64, sy: f64, sums: usize, counts: usize): f64 {
  const w = p2w(p, 0), h = p2w(p, 1), hh = p2w(p, 3), ts = p2w(p, 4);
  const tre = p + <usize>p2w(p, 10), tim = p + <usize>p2w(p, 11);
  memory.fill(sums, 0, <usize>bins << 3);
  memory.fill(counts, 0, <usize>bins << 3);
  const hEven = (h & 1) == 0;
  const sy2 = sy * sy;
  let outside = 0.0;
  const tsBytes = <usize>ts << 2;
  for (let kx = 0; kx < w; kx++) {
    const kxs = kx <= (w >> 1) ? kx : kx - w;
    const dx2 = <f64>kxs * <f64>kxs * sx * sx;
    const rr = tre + <usize>kx * tsBytes, ri = tim + <usize>kx * tsBytes;
    for (let ky = 0; ky < hh; ky++) {
      const a = load<f32>(rr + (<usize>ky << 2)), b = load<f32>(ri + (<usize>ky << 2));
      const pw = <f64>(a * a + b * b);
      const wt = ky == 0 || (hEven && 2 * ky == h) ? 1.0 : 2.0;
      const r = Math.sqrt(dx2 + <f64>(ky * ky) * sy2);
      const bin = <i32>(r + 0.5);
      if (bin < bins) {
        const o = <usize>bin << 3;
        store<f64>(sums + o, load<f64>(sums + o) + wt * pw);
        store<f64>(counts + o, load<f64>(counts + o) + wt);
      } else {
        outside += wt;
      }
    }
  }
  return outside;
}

/**
 * Angular statistics of |T|^2 over the ring rLo <= r <= rHi (r in bins as in spectrumRadial).
 * moments (f64[6]): sum P, sum P cos 2t, sum P sin 2t, sum P cos 6t, sum P sin 6t, points;
 * t = atan2(qy, qx) with qy along rows. hist (f64[angleBins]) over t in [0, pi). Returns points.
 */
export function spectrumRing(
  p: usize, rLo: f64, rHi: f64, sx: f64, sy: f64, angleBins: i32, hist: usize, moments: usize,
): f64 {
  const w = p2w(p, 0), h = p2w(p, 1), hh = p2w(p, 3), ts = p2w(p, 4);
  const tre = p + <usize>p2w(p, 10), tim = p + <usize>p2w(p, 11);
  memory.fill(hist, 0, <usize>angleBins << 3);
  memory.fill(moments, 0, 48);
  const hEven = (h & 1) == 0;
  const tsBytes = <usize>ts << 2;
  let kyMax = <i32>Math.floor(rHi / sy);
  if (kyMax > hh - 1) kyMax = hh - 1;
  let kxMax = <i32>Math.floor(rHi / sx);
  if (kxMax > (w >> 1)) kxMax = w >> 1;
  let kxMin = -kxMax;
  if (kxMin < (w >> 1) - w + 1) kxMin = (w >> 1) - w + 1;
  let m0 = 0.0, m1 = 0.0, m2 = 0.0, m3 = 0.0, m4 = 0.0, m5 = 0.0;
  const lo2 = rLo * rLo, hi2 = rHi * rHi;
  const scale = <f64>angleBins / Math.PI;
  for (let kxs = kxMin; kxs <= kxMax; kxs++) {
    const kx = kxs < 0 ? kxs + w : kxs;
    const qx = <f64>kxs * sx;
    const rr = tre + <usize>kx * tsBytes, ri = tim + <usize>kx * tsBytes;
    for (let ky = 0; ky <= kyMax; ky++) {
      const qy = <f64>ky * sy;
      const r2 = qx * qx + qy * qy;
      if (r2 < lo2 || r2 > hi2 || r2 == 0) continue;
      const a = load<f32>(rr + (<usize>ky << 2)), b = load<f32>(ri + (<usize>ky << 2));
      const wt = ky == 0 || (hEven && 2 * ky == h) ? 1.0 : 2.0;
      const pw = wt * <f64>(a * a + b * b);
      const c2 = (qx * qx - qy * qy) / r2, s2 = 2 * qx * qy / r2;
      const c6 = c2 * c2 * c2 - 3 * c2 * s2 * s2, s6 = 3 * c2 * c2 * s2 - s2 * s2 * s2;
      m0 += pw; m1 += pw * c2; m2 += pw * s2; m3 += pw * c6; m4 += pw * s6; m5 += wt;
      let t = Math.atan2(qy, qx);
      let bin = <i32>(t * scale);
      if (bin >= angleBins) bin -= angleBins;
      if (bin < 0) bin = 0;
      const o = hist + (<usize>bin << 3);
      store<f64>(o, load<f64>(o) + pw);
    }
  }
  store<f64>(moments, m0); store<f64>(moments, m1, 8); store<f64>(moments, m2, 16);
  store<f64>(moments, m3, 24); store<f64>(moments, m4, 32); store<f64>(moments, m5, 40);
  return m5;
}

/**
 * Centred full power spectrum |T|^2 * scale as f32 (w x h, zero frequency at (w/2, h/2) rounded
 * down), filling the lower half from the conjugate symmetry. Returns 1.
 */
export function spectrumPowerCentred(p: usize, scale: f32, out: usize): i32 {
  const w = p2w(p, 0), h = p2w(p, 1), hh = p2w(p, 3), ts = p2w(p, 4);
  const tre = p + <usize>p2w(p, 10), tim = p + <usize>p2w(p, 11);
  const cx = w >> 1, cy = h >> 1;
  const tsBytes = <usize>ts << 2;
  for (let kx = 0; kx < w; kx++) {
    const rr = tre + <usize>kx * tsBytes, ri = tim + <usize>kx * tsBytes;
    const kxs = kx <= (w >> 1) ? kx : kx - w;
    // output column of (kx', ky) and of the mirror (-kx', -ky), modulo w
    let ox = cx + kxs; if (ox >= w) ox -= w; if (ox < 0) ox += w;
    let mx = cx - kxs; if (mx >= w) mx -= w; if (mx < 0) mx += w;
    for (let ky = 0; ky < hh; ky++) {
      const a = load<f32>(rr + (<usize>ky << 2)), b = load<f32>(ri + (<usize>ky << 2));
      const pw = (a * a + b * b) * scale;
      let oy = cy + ky; if (oy >= h) oy -= h;
      let my = cy - ky; if (my < 0) my += h;
      store<f32>(out + ((<usize>oy * <usize>w + <usize>ox) << 2), pw);
      store<f32>(out + ((<usize>my * <usize>w + <usize>mx) << 2), pw);
    }
  }
  return 1;
}

/** Phase map (u8, nonzero = up) to +1 / -1 f32 samples, 16 pixels a step. Returns n. */
export function spectrumLoadBinary(src: usize, n: i32, dst: usize): i32 {
  const zero = i8x16.splat(0);
  const one = f32x4.splat(1), two = f32x4.splat(2);
  let i = 0;
  for (; i + 16 <= n; i += 16) {
    // up lanes -> 0xff, down -> 0x00; widen to i32 masks, select +1 / -1
    const up = v128.not(i8x16.eq(v128.load(src + <usize>i), zero));
    const lo = i16x8.extend_low_i8x16_s(up), hi = i16x8.extend_high_i8x16_s(up);
    const m0 = i32x4.extend_low_i16x8_s(lo), m1 = i32x4.extend_high_i16x8_s(lo);
    const m2 = i32x4.extend_low_i16x8_s(hi), m3 = i32x4.extend_high_i16x8_s(hi);
    const o = dst + (<usize>i << 2);
    v128.store(o, f32x4.sub(v128.and(m0, two), one));
    v128.store(o, f32x4.sub(v128.and(m1, two), one), 16);
    v128.store(o, f32x4.sub(v128.and(m2, two), one), 32);
    v128.store(o, f32x4.sub(v128.and(m3, two), one), 48);
  }
  for (; i < n; i++) store<f32>(dst + (<usize>i << 2), load<u8>(src + <usize>i) != 0 ? <f32>1 : <f32>-1);
  return n;
}
