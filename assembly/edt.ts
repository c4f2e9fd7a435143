// Exact Euclidean distance from every pixel to the nearest pixel of the other phase: the local
// half-width of the domain it belongs to. Separable lower envelope of parabolas (Felzenszwalb &
// Huttenlocher 2012, Theory of Computing 8:415): a column pass gives the vertical distance to the
// other phase (two linear sweeps each way, a second sweep across the wrap on a periodic y axis),
// then a row pass takes the lower envelope over each run of one phase plus the two other-phase
// pixels bounding it (a parabola beyond a bound can never win, the bound is at distance 0).
// A periodic row is walked from a run start, so runs that wrap are whole; a row of one phase
// takes the envelope over three copies. The image outside an open side is not the other phase.
// Distances are centre to centre: a bar w pixels wide has 1 at its border pixels and
// (w + 1) / 2 at its middle (odd w). A frame with no other-phase pixel in reach gives `cap`.
//
// Speed (one core, no branch per pixel where it can be helped):
// - The column pass runs across whole rows with SIMD (16 pixels of phase, four i32x4 lanes of
//   vertical distance per step); column distances are i32, capped at ceil(cap) + 1.
// - The row pass first tries a window search along the whole row in i16x8 lanes (rowByWindow):
//   a pixel starts from the nearer of its vertical distance and its run's bounds and looks at
//   offsets dq = 1, 2, ... until dq^2 reaches the largest distance found in its block of 32
//   pixels. That is exact (the minimum over every candidate that could be lower) and costs about
//   the local distance per pixel, which is small in stripes, bubbles and labyrinths.
// - A row where some block would search past 127 pixels (wide domains, rows of one phase)
//   takes the lower envelope run by run (envelope): keys A_q = g_q^2 + q^2 as i64 in run-local
//   positions, intersections compared by cross-multiplication (no division), the two top
//   parabolas held in locals, a candidate dropped when its vertical distance is at least the
//   largest distance its run's bounds allow; runs of one or two pixels between bounds are 1.
// Both give the exact squared distance d^2, so the result, f32(sqrt(d^2)) capped, is the same bit
// for bit whichever path a row takes (an f32 square root of an integer below 2^24 rounds as
// the f64 one rounded to f32 does).
import { W, H, PX, PY, PH, runEnd } from "./common";

@inline function ph(i: i32): i32 {
  return <i32>load<u8>(PH + <usize>i);
}
@inline function ldg(p: usize, i: i32): i32 {
  return load<i32>(p + (<usize>i << 2));
}
@inline function stg(p: usize, i: i32, v: i32): void {
  store<i32>(p + (<usize>i << 2), v);
}

/**
 * One row of the column pass: with c = 1 where PH[i] != PH[j] and G[j] + 1 elsewhere (j the
 * pixel below or above i), G[i] = min(base, c) where base is `far` (`first`) or G[i] itself.
 * Returns whether some G[i] decreased (only meaningful without `first`). Steps of 16 and 4
 * pixels; a last step overlaps the one before (applying the update twice changes nothing).
 */
@inline function relaxRow(g: usize, i0: i32, j0: i32, w: i32, far: i32, first: bool): bool {
  const one = i32x4.splat(1), farv = i32x4.splat(far);
  let any = i32x4.splat(0);
  let x = 0;
  for (; x + 16 <= w; x += 16) {
    const i = i0 + x, j = j0 + x;
    const ne = v128.not(i8x16.eq(v128.load(PH + <usize>i), v128.load(PH + <usize>j)));
    const lo = i16x8.extend_low_i8x16_s(ne), hi = i16x8.extend_high_i8x16_s(ne);
    const pi = g + (<usize>i << 2), pj = g + (<usize>j << 2);
    const c0 = v128.bitselect(one, i32x4.add(v128.load(pj), one), i32x4.extend_low_i16x8_s(lo));
    const c1 = v128.bitselect(one, i32x4.add(v128.load(pj, 16), one), i32x4.extend_high_i16x8_s(lo));
    const c2 = v128.bitselect(one, i32x4.add(v128.load(pj, 32), one), i32x4.extend_low_i16x8_s(hi));
    const c3 = v128.bitselect(one, i32x4.add(v128.load(pj, 48), one), i32x4.extend_high_i16x8_s(hi));
    if (first) {
      v128.store(pi, i32x4.min_s(c0, farv));
      v128.store(pi, i32x4.min_s(c1, farv), 16);
      v128.store(pi, i32x4.min_s(c2, farv), 32);
      v128.store(pi, i32x4.min_s(c3, farv), 48);
    } else {
      const g0 = v128.load(pi), g1 = v128.load(pi, 16), g2 = v128.load(pi, 32), g3 = v128.load(pi, 48);
      any = v128.or(any, v128.or(v128.or(i32x4.lt_s(c0, g0), i32x4.lt_s(c1, g1)), v128.or(i32x4.lt_s(c2, g2), i32x4.lt_s(c3, g3))));
      v128.store(pi, i32x4.min_s(c0, g0));
      v128.store(pi, i32x4.min_s(c1, g1), 16);
      v128.store(pi, i32x4.min_s(c2, g2), 32);
      v128.store(pi, i32x4.min_s(c3, g3), 48);
    }
  }
  if (w >= 4) {
    while (x < w) {
      if (x + 4 > w) x = w - 4;
      const i = i0 + x, j = j0 + x;
      const ne = v128.not(i8x16.eq(v128.load32_zero(PH + <usize>i), v128.load32_zero(PH + <usize>j)));
      const m = i32x4.extend_low_i16x8_s(i16x8.extend_low_i8x16_s(ne));
      const pi = g + (<usize>i << 2), pj = g + (<usize>j << 2);
      const c = v128.bitselect(one, i32x4.add(v128.load(pj), one), m);
      if (first) v128.store(pi, i32x4.min_s(c, farv));
      else {
        const gi = v128.load(pi);
        any = v128.or(any, i32x4.lt_s(c, gi));
        v128.store(pi, i32x4.min_s(c, gi));
      }
      x += 4;
    }
  } else {
    let better = false;
    for (; x < w; x++) {
      const i = i0 + x, j = j0 + x;
      const c = ph(i) != ph(j) ? 1 : ldg(g, j) + 1;
      if (first) stg(g, i, min(c, far));
      else if (c < ldg(g, i)) { stg(g, i, c); better = true; }
    }
    return better;
  }
  return v128.any_true(any);
}

// Row scratch (carved from one block of 32 * (3W + 4) bytes): the envelope's positions (i32) and
// keys (i64), and a contiguous copy of the vertical distances and distances of a run that wraps
// (or of a periodic row of one phase, three times); then the window search's rows (EV, IB).
let SP: usize = 0;
let SA: usize = 0;
let GB: usize = 0;
let OB: usize = 0;

@inline function ldp(k: i32): i64 { return <i64>load<i32>(SP + (<usize>k << 2)); }
@inline function lda(k: i32): i64 { return load<i64>(SA + (<usize>k << 3)); }

/**
 * Distances at local positions x0..x1 (into op[x - x0]) from the lower envelope of candidates
 * 0..n-1 with vertical distances gp[0..n-1], plus other-phase bounds at -1 (`lb`) and n (`rb`).
 * Distances above `cap` become `cap`.
 */
function envelope(gp: usize, n: i32, lb: bool, rb: bool, x0: i32, x1: i32, op: usize, cap: f32): void {
  // Parabola q: A_q - 2 q x + x^2. Intersection of r < q at s(r, q) = (A_q - A_r) / (2 (q - r));
  // the top r is hidden when s(r, q) <= s(p, r) for the vertex p below it.
  // A candidate with g >= gmax is nowhere below the nearer bound: it is skipped.
  const gmax = lb && rb ? (n + 1) >> 1 : lb || rb ? n : 0x7fffffff;
  let t = -1;
  let pr: i64 = 0, ar: i64 = 0, pp: i64 = 0, ap: i64 = 0;
  const q0 = lb ? -1 : 0, q1 = rb ? n : n - 1;
  for (let q = q0; q <= q1; q++) {
    let gq = 0;
    if (<u32>q < <u32>n) {
      gq = ldg(gp, q);
      if (gq >= gmax) continue;
    }
    const fq = <i64>q, g64 = <i64>gq;
    const aq = g64 * g64 + fq * fq;
    while (t > 0) {
      if ((aq - ar) * (pr - pp) <= (ar - ap) * (fq - pr)) {
        t--;
        pr = pp; ar = ap;
        if (t > 0) { pp = ldp(t - 1); ap = lda(t - 1); }
      } else break;
    }
    t++;
    store<i32>(SP + (<usize>t << 2), q);
    store<i64>(SA + (<usize>t << 3), aq);
    pp = pr; ap = ar; pr = fq; ar = aq;
  }
  let k = 0;
  let cr = ldp(0), ca = lda(0);
  let nr: i64 = 0, na: i64 = 0;
  if (t > 0) { nr = ldp(1); na = lda(1); }
  for (let x = x0; x <= x1; x++) {
    const fx = <i64>x;
    // Advance while the next envelope parabola is at least as low at x (their difference falls in x).
    while (k < t) {
      if (na - 2 * nr * fx > ca - 2 * cr * fx) break;
      k++; cr = nr; ca = na;
      if (k < t) { nr = ldp(k + 1); na = lda(k + 1); }
    }
    const d2 = ca - 2 * cr * fx + fx * fx;
    let d = <f32>Math.sqrt(<f64>d2);
    if (d > cap) d = cap;
    store<f32>(op + (<usize>(x - x0) << 2), d);
  }
}

/** Run s..e (inside the row at r) between bounds as given: distances into `out`. */
@inline function runDistances(g: usize, out: usize, r: i32, s: i32, e: i32, lb: bool, rb: bool, cap: f32): void {
  const n = e - s + 1;
  const op = out + (<usize>(r + s) << 2);
  if (n <= 2 && lb && rb) {
    const d: f32 = cap < 1 ? cap : 1;
    store<f32>(op, d);
    if (n == 2) store<f32>(op, d, 4);
    return;
  }
  envelope(g + (<usize>(r + s) << 2), n, lb, rb, 0, n - 1, op, cap);
}

/** A row by the envelope, run by run (rows whose window search gives up). */
function rowByEnvelope(g: usize, out: usize, r: i32, cap: f32): void {
  const w = W;
  const rp = PH + <usize>r;
  const first = ph(r);
  // t: the first run start after x = 0 (PH[t] != PH[t - 1]), or w.
  const t = runEnd(rp, 1, w, i8x16.splat(<i8>first));
  if (t == w) {
    // One phase along the whole row.
    if (PX) {
      const gr = g + (<usize>r << 2);
      memory.copy(GB, gr, <usize>w << 2);
      memory.copy(GB + (<usize>w << 2), gr, <usize>w << 2);
      memory.copy(GB + (<usize>w << 3), gr, <usize>w << 2);
      envelope(GB, 3 * w, false, false, w, 2 * w - 1, out + (<usize>r << 2), cap);
    } else {
      envelope(g + (<usize>r << 2), w, false, false, 0, w - 1, out + (<usize>r << 2), cap);
    }
    return;
  }
  if (PX) {
    // Every run has other-phase bounds on both sides; when the row's ends have one phase, the
    // run ending at x = t - 1 starts in the row's tail: whole runs from t, then that one.
    const s = ph(r + w - 1) == first ? t : 0;
    let x = s;
    while (x < w) {
      const e = runEnd(rp, x + 1, w, i8x16.splat(<i8>ph(r + x))) - 1;
      if (e == w - 1 && s > 0) {
        const n1 = w - x, m = n1 + s;
        memory.copy(GB, g + (<usize>(r + x) << 2), <usize>n1 << 2);
        memory.copy(GB + (<usize>n1 << 2), g + (<usize>r << 2), <usize>s << 2);
        envelope(GB, m, true, true, 0, m - 1, OB, cap);
        memory.copy(out + (<usize>(r + x) << 2), OB, <usize>n1 << 2);
        memory.copy(out + (<usize>r << 2), OB + (<usize>n1 << 2), <usize>s << 2);
        break;
      }
      runDistances(g, out, r, x, e, true, true, cap);
      x = e + 1;
    }
  } else {
    let x = 0;
    while (x < w) {
      const e = runEnd(rp, x + 1, w, i8x16.splat(<i8>ph(r + x))) - 1;
      runDistances(g, out, r, x, e, x > 0, e < w - 1, cap);
      x = e + 1;
    }
  }
}

// Window search along a whole row, 32 pixels (four i16x8) at a time. Pixel x, at distance b(x)
// from the nearest other-phase pixel of its row (the bounds of its run), starts from
// min(b(x)^2, g_x^2) and takes min over offsets dq < b(x) of E[x - dq] + dq^2 and E[x + dq] + dq^2
// with E[y] = g_y^2: those pixels lie in its own run. A read at dq >= b(x) gives at least
// dq^2 >= b(x)^2, never lower, so the search need not know where the run ends. A block stops at
// the first dq with dq^2 >= its largest distance so far: every candidate further away is at least
// that far. E holds the row between pads: copies across the wrap on a periodic row, BIG (no
// candidate) on an open one. Vertical distances and b are clamped at DQM + 1 before squaring, so
// a search that stops by DQM with distances below DQM + 1 is exact; a row where a block would go
// further is left to the envelope. The squares fit i16 (at most 128^2 + 127^2).
const BIG: i16 = 16384;
let DQM = 0;   // the largest offset searched (pad P - 1)
let WP = 0;    // pad P: slots before the row; P + 32 after it
let EV: usize = 0; // i16 E with pads, the row at EV + 2 P
let IB: usize = 0; // i16 starting distances min(b^2, g^2), w + 32 slots

@inline function hmax16(v: v128): i32 {
  const a = i16x8.max_s(v, v128.shuffle<i64>(v, v, 1, 0));
  const b = i16x8.max_s(a, v128.shuffle<i32>(a, a, 1, 0, 3, 2));
  const c = i16x8.max_s(b, i8x16.shuffle(b, b, 2, 3, 0, 1, 6, 7, 4, 5, 10, 11, 8, 9, 14, 15, 12, 13));
  return <i32>i16x8.extract_lane_s(c, 0);
}

@inline function relax16(best: v128, p: usize, off: usize, dd: v128): v128 {
  return i16x8.min_s(best, i16x8.add_sat_s(i16x8.min_s(v128.load(p - off), v128.load(p + off)), dd));
}

@inline function store8(out: usize, r: i32, x: i32, w: i32, best: v128, capv: v128): void {
  if (x >= w) return;
  // pmin is one minps; f32x4.min also orders NaN and -0, which a square root of a count never is.
  const lo = f32x4.pmin(f32x4.sqrt(f32x4.convert_i32x4_s(i32x4.extend_low_i16x8_s(best))), capv);
  const hi = f32x4.pmin(f32x4.sqrt(f32x4.convert_i32x4_s(i32x4.extend_high_i16x8_s(best))), capv);
  const p = out + (<usize>(r + x) << 2);
  if (x + 8 <= w) { v128.store(p, lo); v128.store(p, hi, 16); return; }
  store<f32>(p, f32x4.extract_lane(lo, 0));
  if (x + 1 < w) store<f32>(p, f32x4.extract_lane(lo, 1), 4);
  if (x + 2 < w) store<f32>(p, f32x4.extract_lane(lo, 2), 8);
  if (x + 3 < w) store<f32>(p, f32x4.extract_lane(lo, 3), 12);
  if (x + 4 < w) store<f32>(p, f32x4.extract_lane(hi, 0), 16);
  if (x + 5 < w) store<f32>(p, f32x4.extract_lane(hi, 1), 20);
  if (x + 6 < w) store<f32>(p, f32x4.extract_lane(hi, 2), 24);
}

/**
 * Starting distances of a run of n pixels (or its part from local position k0, len pixels, at
 * row index x0): min(E, b^2), b the distance to the nearer bound present, clamped. Vector stores
 * may run up to 7 slots past the part (into pixels written later, or the slots after the row).
 */
@inline function startRun(x0: i32, k0: i32, len: i32, n: i32, lb: bool, rb: bool): void {
  const e = EV + (<usize>WP << 1), ib = IB;
  const iota = i16x8(1, 2, 3, 4, 5, 6, 7, 8);
  const limv = i16x8.splat(<i16>(DQM + 1));
  for (let k = 0; k < len; k += 8) {
    const kv = i16x8.add(iota, i16x8.splat(<i16>(k0 + k))); // local position + 1
    let b = limv;
    if (lb) b = i16x8.min_s(b, kv);
    if (rb) b = i16x8.min_s(b, i16x8.sub(i16x8.splat(<i16>(n + 1)), kv));
    const at = <usize>(x0 + k) << 1;
    v128.store(ib + at, i16x8.min_s(i16x8.mul(b, b), v128.load(e + at)));
  }
}

/** Squared clamped vertical distances of row r into E, its pads, and the starting distances. */
function fillRow(g: usize, r: i32): void {
  const w = W, lim = DQM + 1;
  const e = EV + (<usize>WP << 1);
  const limv = i32x4.splat(lim);
  let x = 0;
  for (; x + 8 <= w; x += 8) {
    const p = g + (<usize>(r + x) << 2);
    const v = i16x8.narrow_i32x4_s(i32x4.min_s(v128.load(p), limv), i32x4.min_s(v128.load(p, 16), limv));
    v128.store(e + (<usize>x << 1), i16x8.mul(v, v));
  }
  for (; x < w; x++) {
    const v = min(ldg(g, r + x), lim);
    store<i16>(e + (<usize>x << 1), <i16>(v * v));
  }
  const rp = PH + <usize>r;
  const first = ph(r);
  const t = runEnd(rp, 1, w, i8x16.splat(<i8>first));
  if (PX) {
    const P = WP;
    if (w >= P + 32) {
      memory.copy(e - (<usize>P << 1), e + (<usize>(w - P) << 1), <usize>P << 1);
      memory.copy(e + (<usize>w << 1), e, <usize>(P + 32) << 1);
    } else {
      for (let k = 1; k <= P; k++) {
        let y = w - k % w; if (y == w) y = 0;
        store<i16>(e - (<usize>k << 1), load<i16>(e + (<usize>y << 1)));
      }
      for (let k = 0; k < P + 32; k++) store<i16>(e + (<usize>(w + k) << 1), load<i16>(e + (<usize>(k % w) << 1)));
    }
    if (t == w) { startRun(0, 0, w, w, false, false); return; } // one phase along the row
    let x = 0;
    if (ph(r + w - 1) == first) {
      // The run holding x = 0 wraps: it starts at the last run start s and ends at t - 1.
      let s = w - 1;
      while (s > 0 && ph(r + s - 1) == first) s--;
      const n = w - s + t;
      startRun(0, w - s, t, n, true, true);
      x = t;
      while (x < s) {
        const e1 = runEnd(rp, x + 1, w, i8x16.splat(<i8>ph(r + x)));
        startRun(x, 0, e1 - x, e1 - x, true, true);
        x = e1;
      }
      startRun(s, 0, w - s, n, true, true); // last: the stores before it may run into its slots
      return;
    }
    while (x < w) {
      const e1 = runEnd(rp, x + 1, w, i8x16.splat(<i8>ph(r + x)));
      startRun(x, 0, e1 - x, e1 - x, true, true);
      x = e1;
    }
  } else {
    // Open pads: BIG, written once per frame.
    let x = 0;
    while (x < w) {
      const e1 = runEnd(rp, x + 1, w, i8x16.splat(<i8>ph(r + x)));
      startRun(x, 0, e1 - x, e1 - x, x > 0, e1 < w);
      x = e1;
    }
  }
}

/** Window search of row r (E and IB filled); false (nothing reliable written) if it gives up. */
function rowByWindow(out: usize, r: i32, cap: f32): bool {
  const w = W;
  const e = EV + (<usize>WP << 1);
  const capv = f32x4.splat(cap);
  const iota = i16x8(0, 1, 2, 3, 4, 5, 6, 7);
  const lim2 = (DQM + 1) * (DQM + 1);
  for (let x = 0; x < w; x += 32) {
    const p = e + (<usize>x << 1), q = IB + (<usize>x << 1);
    // Lanes beyond the row: 0.
    const xv = i16x8.add(iota, i16x8.splat(<i16>(x - w)));
    let b0 = v128.and(v128.load(q), i16x8.lt_s(xv, i16x8.splat(0)));
    let b1 = v128.and(v128.load(q, 16), i16x8.lt_s(xv, i16x8.splat(-8)));
    let b2 = v128.and(v128.load(q, 32), i16x8.lt_s(xv, i16x8.splat(-16)));
    let b3 = v128.and(v128.load(q, 48), i16x8.lt_s(xv, i16x8.splat(-24)));
    let top = hmax16(i16x8.max_s(i16x8.max_s(b0, b1), i16x8.max_s(b2, b3)));
    for (let dq = 1; dq * dq < top; dq++) {
      if (dq > DQM) return false;
      const dd = i16x8.splat(<i16>(dq * dq));
      const off = <usize>dq << 1;
      b0 = relax16(b0, p, off, dd);
      b1 = relax16(b1, p + 16, off, dd);
      b2 = relax16(b2, p + 32, off, dd);
      b3 = relax16(b3, p + 48, off, dd);
      top = hmax16(i16x8.max_s(i16x8.max_s(b0, b1), i16x8.max_s(b2, b3)));
    }
    // A distance of DQM + 1 may come from a clamped vertical distance or bound.
    if (top >= lim2) return false;
    store8(out, r, x, w, b0, capv);
    store8(out, r, x + 8, w, b1, capv);
    store8(out, r, x + 16, w, b2, capv);
    store8(out, r, x + 24, w, b3, capv);
  }
  return true;
}

/**
 * Distance (f32) from each pixel to the nearest pixel of the other phase into `out`; `g` is
 * 4-byte scratch of W * H (vertical distances, i32), `scratch` holds 32 * (3W + 4) bytes.
 * Distances above `cap` become `cap`.
 */
export function distancePhases(out: usize, g: usize, scratch: usize, cap: f32): void {
  const w = W, h = H, n = w * h;
  const slots = 3 * w + 4;
  SP = scratch; SA = SP + (<usize>slots << 2); GB = SA + (<usize>slots << 3); OB = GB + (<usize>slots << 2);
  // Window rows: 2 x (P + w + P + 32) i16 in what is left of the scratch (36 w + 48 bytes).
  // (Lane positions are i16: rows wider than 32000 take the envelope.)
  WP = w > 32000 ? 0 : max(0, min(128, 4 * w - 10));
  DQM = WP - 1;
  const eslots = 2 * WP + w + 32;
  EV = OB + (<usize>slots << 2); IB = EV + (<usize>eslots << 1);
  if (DQM >= 1 && !PX) for (let k = 0; k < eslots; k++) store<i16>(EV + (<usize>k << 1), BIG);
  // Vertical distances are capped at ceil(cap) + 1: a capped candidate is never below cap.
  let far = <i32>Math.ceil(<f64>cap) + 1;
  if (far < 1) far = 1;
  // Column pass, row by row (contiguous): down, across the wrap, up, across the wrap.
  for (let x = 0; x < w; x++) stg(g, x, far);
  for (let i = w; i < n; i += w) relaxRow(g, i, i - w, w, far, true);
  if (PY && h > 1) {
    const last = (h - 1) * w;
    relaxRow(g, 0, last, w, far, false);
    // A row where nothing improved ends the carry across the wrap (it only continues an improvement).
    for (let y = 1; y < h; y++) if (!relaxRow(g, y * w, (y - 1) * w, w, far, false)) break;
  }
  for (let y = h - 2; y >= 0; y--) relaxRow(g, y * w, (y + 1) * w, w, far, false);
  if (PY && h > 1) {
    const last = (h - 1) * w;
    relaxRow(g, last, 0, w, far, false);
    for (let y = h - 2; y >= 0; y--) if (!relaxRow(g, y * w, (y + 1) * w, w, far, false)) break;
  }
  // Row pass.
  for (let y = 0; y < h; y++) {
    const r = y * w;
    if (DQM >= 1) {
      fillRow(g, r);
      if (rowByWindow(out, r, cap)) continue;
    }
    rowByEnvelope(g, out, r, cap);
  }
}
