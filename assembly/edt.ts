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
// The column pass runs across whole rows with SIMD (16 pixels of phase, four i32x4 lanes of
// vertical distance per step). Column distances are i32 (capped at ceil(cap) + 1); the row pass
// keeps the envelope's key A_q = g_q^2 + q^2 as i64 in run-local positions, compares
// intersections by cross-multiplication (no division), holds the two top parabolas in locals and
// drops a candidate whose vertical distance is at least the largest distance its run's bounds
// allow anywhere in the run (it can never be strictly lower than a bound there). Runs of one or
// two pixels between two bounds are 1 directly.
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
// (or of a periodic row of one phase, three times).
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

// Runs between two bounds of at most WIN pixels are answered by a window search instead: every
// pixel x is within b(x) = min(x + 1, n - x) of a bound, so only candidates q with
// (x - q)^2 < min(b(x)^2, g_x^2) can be lower, and the search over offsets dq = 1, 2, ... stops
// for the whole run once dq^2 reaches the largest distance found so far. The squared vertical
// distances (clamped at WIN, beyond any such distance) are copied into WB between pads that hold
// nothing negative: a read beyond the run is at least the nearer bound's distance, so harmless.
// A search at offset dq reads pixels -dq .. n + 15 + dq of the run, dq <= (n + 1) / 2.
const WIN = 64;
let WLIM = 0; // min(WIN, W): the longest run searched so
let WPAD = 0; // WLIM / 2 + 1 slots before and after
let WB: usize = 0; // i32: WPAD + WLIM + 16 + WPAD slots, squared vertical distances of a run at WPAD

@inline function hmax(v: v128): i32 {
  const a = i32x4.max_s(v, v128.shuffle<i32>(v, v, 2, 3, 0, 1));
  const b = i32x4.max_s(a, v128.shuffle<i32>(a, a, 1, 0, 3, 2));
  return i32x4.extract_lane(b, 0);
}

@inline function initBest(xv: v128, nv: v128, wb: usize): v128 {
  const b = i32x4.min_s(i32x4.add(xv, i32x4.splat(1)), i32x4.sub(nv, xv));
  const best = i32x4.min_s(i32x4.mul(b, b), v128.load(wb));
  return v128.and(best, i32x4.lt_s(xv, nv)); // lanes beyond the run: 0
}

@inline function relaxBest(best: v128, p: usize, off: usize, dd: v128): v128 {
  return i32x4.min_s(best, i32x4.add(i32x4.min_s(v128.load(p - off), v128.load(p + off)), dd));
}

@inline function storeDistances(op: usize, x: i32, n: i32, best: v128, capv: v128, cap: f32): void {
  if (x >= n) return;
  const d = f32x4.min(f32x4.sqrt(f32x4.convert_i32x4_s(best)), capv);
  const p = op + (<usize>x << 2);
  if (x + 4 <= n) { v128.store(p, d); return; }
  store<f32>(p, f32x4.extract_lane(d, 0));
  if (x + 1 < n) store<f32>(p, f32x4.extract_lane(d, 1), 4);
  if (x + 2 < n) store<f32>(p, f32x4.extract_lane(d, 2), 8);
  void cap;
}

/**
 * Window search over the n (up to WLIM) squared vertical distances at WB + WPAD, bounds at -1
 * and n, in blocks of 16 pixels, each searched only as far as its own largest distance.
 */
function windowRun(n: i32, op: usize, cap: f32): void {
  const wb = WB + (<usize>WPAD << 2);
  const iota = i32x4(0, 1, 2, 3), nv = i32x4.splat(n);
  const capv = f32x4.splat(cap);
  for (let x = 0; x < n; x += 16) {
    const p = wb + (<usize>x << 2);
    const xv = i32x4.add(iota, i32x4.splat(x));
    let b0 = initBest(xv, nv, p);
    let b1 = initBest(i32x4.add(xv, i32x4.splat(4)), nv, p + 16);
    let b2 = initBest(i32x4.add(xv, i32x4.splat(8)), nv, p + 32);
    let b3 = initBest(i32x4.add(xv, i32x4.splat(12)), nv, p + 48);
    let top = hmax(i32x4.max_s(i32x4.max_s(b0, b1), i32x4.max_s(b2, b3)));
    for (let dq = 1; dq * dq < top; dq++) {
      const dd = i32x4.splat(dq * dq);
      const off = <usize>dq << 2;
      b0 = relaxBest(b0, p, off, dd);
      b1 = relaxBest(b1, p + 16, off, dd);
      b2 = relaxBest(b2, p + 32, off, dd);
      b3 = relaxBest(b3, p + 48, off, dd);
      top = hmax(i32x4.max_s(i32x4.max_s(b0, b1), i32x4.max_s(b2, b3)));
    }
    storeDistances(op, x, n, b0, capv, cap);
    storeDistances(op, x + 4, n, b1, capv, cap);
    storeDistances(op, x + 8, n, b2, capv, cap);
    storeDistances(op, x + 12, n, b3, capv, cap);
  }
}

/** Squares of the n vertical distances at gp (clamped at WIN) into WB + WPAD. */
@inline function fillWindow(gp: usize, n: i32, at: i32): void {
  const wb = WB + (<usize>(WPAD + at) << 2);
  const lim = i32x4.splat(WIN);
  let x = 0;
  for (; x + 4 <= n; x += 4) {
    const v = i32x4.min_s(v128.load(gp + (<usize>x << 2)), lim);
    v128.store(wb + (<usize>x << 2), i32x4.mul(v, v));
  }
  for (; x < n; x++) {
    const v = min(load<i32>(gp + (<usize>x << 2)), WIN);
    store<i32>(wb + (<usize>x << 2), v * v);
  }
}

/** Run s..e (inside the row at r) between bounds as given: distances into `out`. */
@inline function runDistances(g: usize, out: usize, r: i32, s: i32, e: i32, lb: bool, rb: bool, cap: f32): void {
  const n = e - s + 1;
  const op = out + (<usize>(r + s) << 2);
  const gp = g + (<usize>(r + s) << 2);
  if (lb && rb) {
    if (n <= 2) {
      const d: f32 = cap < 1 ? cap : 1;
      store<f32>(op, d);
      if (n == 2) store<f32>(op, d, 4);
      return;
    }
    if (n <= WLIM) {
      fillWindow(gp, n, 0);
      windowRun(n, op, cap);
      return;
    }
  }
  envelope(gp, n, lb, rb, 0, n - 1, op, cap);
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
  WLIM = min(WIN, w); WPAD = (WLIM >> 1) + 1;
  const wslots = 2 * WPAD + WLIM + 16;
  WB = OB + (<usize>slots << 2);
  memory.fill(WB, 0, <usize>wslots << 2);
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
    const rp = PH + <usize>r;
    const first = ph(r);
    // t: the first run start after x = 0 (PH[t] != PH[t - 1]), or w.
    let t = runEnd(rp, 1, w, i8x16.splat(<i8>first));
    if (t == w && !(PX && w > 1 && ph(r + w - 1) != first)) {
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
      continue;
    }
    if (PX) {
      // Every run has other-phase bounds on both sides; the run holding x = 0 may wrap.
      let s = 0;
      if (ph(r + w - 1) == first) {
        // The run ending at x = t - 1 starts in the row's tail: whole runs from t, then that one.
        s = t;
      }
      let x = s;
      while (x < w) {
        const v = ph(r + x);
        const e = runEnd(rp, x + 1, w, i8x16.splat(<i8>v)) - 1;
        if (e == w - 1 && s > 0) {
          // The wrapping run x .. w - 1, 0 .. s - 1: through the row copy.
          const n1 = w - x, m = n1 + s;
          if (m <= WLIM) {
            fillWindow(g + (<usize>(r + x) << 2), n1, 0);
            fillWindow(g + (<usize>r << 2), s, n1);
            windowRun(m, OB, cap);
          } else {
            memory.copy(GB, g + (<usize>(r + x) << 2), <usize>n1 << 2);
            memory.copy(GB + (<usize>n1 << 2), g + (<usize>r << 2), <usize>s << 2);
            envelope(GB, m, true, true, 0, m - 1, OB, cap);
          }
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
        const v = ph(r + x);
        const e = runEnd(rp, x + 1, w, i8x16.splat(<i8>v)) - 1;
        runDistances(g, out, r, x, e, x > 0, e < w - 1, cap);
        x = e + 1;
      }
    }
  }
}
