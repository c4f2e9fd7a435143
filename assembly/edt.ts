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
// Integer arithmetic throughout: column distances are i32 (capped at ceil(cap)), squared
// distances and the envelope's key A_q = g_q^2 + q^2 are i64, and the envelope compares
// intersections by cross-multiplication, so the inner loops hold no division and no modulo.
import { W, H, PX, PY, PH } from "./common";

@inline function ph(i: i32): i32 {
  return <i32>load<u8>(PH + <usize>i);
}
@inline function ldg(p: usize, i: i32): i32 {
  return load<i32>(p + (<usize>i << 2));
}
@inline function stg(p: usize, i: i32, v: i32): void {
  store<i32>(p + (<usize>i << 2), v);
}

// Row scratch (carved from one block of 32 * (3W + 4) bytes): candidate positions (i32), their
// keys A = g^2 + p^2 (i64) and the envelope's candidate indices (i32).
let CP: usize = 0;
let CA: usize = 0;
let CV: usize = 0;

@inline function ldp(k: i32): i64 { return <i64>load<i32>(CP + (<usize>k << 2)); }
@inline function lda(k: i32): i64 { return load<i64>(CA + (<usize>k << 3)); }
@inline function ldv(k: i32): i32 { return load<i32>(CV + (<usize>k << 2)); }

/**
 * Lower envelope of candidates 0..n-1 (positions increasing), evaluated at the unwrapped
 * positions x0..x1 of row `row` (x - w for x >= w). Distances above `cap` become `cap`.
 */
function envelope(n: i32, x0: i32, x1: i32, out: usize, row: i32, cap: f32): void {
  // Parabola q: A_q - 2 q x + x^2. Intersection of r < q at s(r, q) = (A_q - A_r) / (2 (q - r));
  // the top r is hidden when s(r, q) <= s(p, r) for the vertex p below it.
  let k = 0;
  store<i32>(CV, 0);
  for (let q = 1; q < n; q++) {
    const pq = ldp(q), aq = lda(q);
    while (k > 0) {
      const r = ldv(k), p = ldv(k - 1);
      const pr = ldp(r), ar = lda(r), pp = ldp(p), ap = lda(p);
      if ((aq - ar) * (pr - pp) <= (ar - ap) * (pq - pr)) k--;
      else break;
    }
    k++;
    store<i32>(CV + (<usize>k << 2), q);
  }
  const top = k;
  k = 0;
  let r = ldv(0);
  let pr = ldp(r), ar = lda(r);
  const w = W;
  for (let x = x0; x <= x1; x++) {
    const fx = <i64>x;
    // Advance while the next envelope parabola is at least as low at x (their difference falls in x).
    while (k < top) {
      const r1 = ldv(k + 1);
      const p1 = ldp(r1), a1 = lda(r1);
      if (a1 - 2 * p1 * fx > ar - 2 * pr * fx) break;
      k++; r = r1; pr = p1; ar = a1;
    }
    const d2 = ar - 2 * pr * fx + fx * fx;
    let d = <f32>Math.sqrt(<f64>d2);
    if (d > cap) d = cap;
    const xi = x >= w ? x - w : x;
    store<f32>(out + (<usize>(row + xi) << 2), d);
  }
}

@inline function addCandidate(n: i32, pos: i32, g: i32): i32 {
  store<i32>(CP + (<usize>n << 2), pos);
  const p = <i64>pos, gg = <i64>g;
  store<i64>(CA + (<usize>n << 3), gg * gg + p * p);
  return n + 1;
}

/**
 * Distance (f32) from each pixel to the nearest pixel of the other phase into `out`; `g` is
 * 4-byte scratch of W * H (vertical distances, i32), `scratch` holds 32 * (3W + 4) bytes.
 * Distances above `cap` become `cap`.
 */
export function distancePhases(out: usize, g: usize, scratch: usize, cap: f32): void {
  const w = W, h = H, n = w * h;
  const slots = 3 * w + 4;
  CP = scratch; CV = CP + (<usize>slots << 2); CA = CV + (<usize>slots << 2);
  // Vertical distances are capped at ceil(cap) + 1: a capped candidate is never below cap.
  let far = <i32>Math.ceil(<f64>cap) + 1;
  if (far < 1) far = 1;
  // Column pass, row by row (contiguous): down, across the wrap, up, across the wrap.
  for (let x = 0; x < w; x++) stg(g, x, far);
  for (let i = w; i < n; i++) {
    let c = ph(i) != ph(i - w) ? 1 : ldg(g, i - w) + 1;
    if (c > far) c = far;
    stg(g, i, c);
  }
  if (PY && h > 1) {
    const last = (h - 1) * w;
    for (let x = 0; x < w; x++) {
      const c = ph(x) != ph(last + x) ? 1 : ldg(g, last + x) + 1;
      if (c < ldg(g, x)) stg(g, x, c);
    }
    // A row where nothing improved ends the carry across the wrap (it only continues an improvement).
    for (let y = 1; y < h; y++) {
      let better = false;
      for (let i = y * w, e = i + w; i < e; i++) {
        const c = ph(i) != ph(i - w) ? 1 : ldg(g, i - w) + 1;
        if (c < ldg(g, i)) { stg(g, i, c); better = true; }
      }
      if (!better) break;
    }
  }
  for (let i = n - w - 1; i >= 0; i--) {
    const j = i + w;
    const c = ph(i) != ph(j) ? 1 : ldg(g, j) + 1;
    if (c < ldg(g, i)) stg(g, i, c);
  }
  if (PY && h > 1) {
    const last = (h - 1) * w;
    for (let x = 0; x < w; x++) {
      const i = last + x;
      const c = ph(i) != ph(x) ? 1 : ldg(g, x) + 1;
      if (c < ldg(g, i)) stg(g, i, c);
    }
    for (let y = h - 2; y >= 0; y--) {
      let better = false;
      for (let i = y * w, e = i + w; i < e; i++) {
        const j = i + w;
        const c = ph(i) != ph(j) ? 1 : ldg(g, j) + 1;
        if (c < ldg(g, i)) { stg(g, i, c); better = true; }
      }
      if (!better) break;
    }
  }
  // Row pass.
  for (let y = 0; y < h; y++) {
    const r = y * w;
    let t = -1; // a run start: PH[t] != PH[t - 1]
    for (let x = 1; x < w; x++) if (ph(r + x) != ph(r + x - 1)) { t = x; break; }
    if (t < 0 && PX && w > 1 && ph(r) != ph(r + w - 1)) t = 0;
    if (t < 0) {
      // One phase along the whole row.
      let m = 0;
      if (PX) {
        for (let x = 0; x < w; x++) m = addCandidate(m, x - w, ldg(g, r + x));
        for (let x = 0; x < w; x++) m = addCandidate(m, x, ldg(g, r + x));
        for (let x = 0; x < w; x++) m = addCandidate(m, x + w, ldg(g, r + x));
      } else {
        for (let x = 0; x < w; x++) m = addCandidate(m, x, ldg(g, r + x));
      }
      envelope(m, 0, w - 1, out, r, cap);
      continue;
    }
    if (PX) {
      // Walk unwrapped positions t .. t + w - 1; every run has other-phase bounds on both sides.
      let s = t;
      const end = t + w;
      while (s < end) {
        const si = s >= w ? s - w : s;
        const v = ph(r + si);
        let e = s;
        while (e + 1 < end && ph(r + (e + 1 >= w ? e + 1 - w : e + 1)) == v) e++;
        let m = addCandidate(0, s - 1, 0);
        for (let x = s; x <= e; x++) m = addCandidate(m, x, ldg(g, r + (x >= w ? x - w : x)));
        m = addCandidate(m, e + 1, 0);
        envelope(m, s, e, out, r, cap);
        s = e + 1;
      }
    } else {
      let s = 0;
      while (s < w) {
        const v = ph(r + s);
        let e = s;
        while (e + 1 < w && ph(r + e + 1) == v) e++;
        let m = 0;
        if (s > 0) m = addCandidate(m, s - 1, 0);
        for (let x = s; x <= e; x++) m = addCandidate(m, x, ldg(g, r + x));
        if (e + 1 < w) m = addCandidate(m, e + 1, 0);
        envelope(m, s, e, out, r, cap);
        s = e + 1;
      }
    }
  }
}
