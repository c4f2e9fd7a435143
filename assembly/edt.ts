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
import { W, H, PX, PY, PH } from "./common";

const FAR: f32 = 1e30;

@inline function ph(i: i32): i32 {
  return <i32>load<u8>(PH + <usize>i);
}
@inline function ldg(p: usize, i: i32): f32 {
  return load<f32>(p + (<usize>i << 2));
}
@inline function stg(p: usize, i: i32, v: f32): void {
  store<f32>(p + (<usize>i << 2), v);
}

// Row scratch (carved from one block of 32 * (3W + 4) bytes): candidate positions and values
// (f64), envelope vertex indices (i32, stored as f64 slots for alignment) and boundaries (f64).
let CP: usize = 0;
let CF: usize = 0;
let CV: usize = 0;
let CZ: usize = 0;

@inline function ld8(p: usize, k: i32): f64 { return load<f64>(p + (<usize>k << 3)); }
@inline function st8(p: usize, k: i32, v: f64): void { store<f64>(p + (<usize>k << 3), v); }

/** Lower envelope of candidates 0..n-1 (positions increasing), evaluated at positions x0..x1. */
function envelope(n: i32, x0: i32, x1: i32, out: usize, row: i32, cap: f32): void {
  let k = 0;
  st8(CV, 0, 0);
  st8(CZ, 0, -Infinity);
  st8(CZ, 1, Infinity);
  for (let q = 1; q < n; q++) {
    const pq = ld8(CP, q), fq = ld8(CF, q) + pq * pq;
    let s: f64 = 0;
    while (true) {
      const r = <i32>ld8(CV, k);
      const pr = ld8(CP, r);
      s = (fq - (ld8(CF, r) + pr * pr)) / (2 * pq - 2 * pr);
      if (s <= ld8(CZ, k) && k > 0) { k--; continue; }
      break;
    }
    k++;
    st8(CV, k, <f64>q);
    st8(CZ, k, s);
    st8(CZ, k + 1, Infinity);
  }
  k = 0;
  const w = W;
  for (let x = x0; x <= x1; x++) {
    const fx = <f64>x;
    while (ld8(CZ, k + 1) < fx) k++;
    const r = <i32>ld8(CV, k);
    const dp = fx - ld8(CP, r);
    let d = <f32>Math.sqrt(dp * dp + ld8(CF, r));
    if (d > cap) d = cap;
    let xi = x % w;
    if (xi < 0) xi += w;
    stg(out, row + xi, d);
  }
}

@inline function addCandidate(n: i32, pos: i32, g: f32): i32 {
  st8(CP, n, <f64>pos);
  st8(CF, n, <f64>g * <f64>g);
  return n + 1;
}

/**
 * Distance (f32) from each pixel to the nearest pixel of the other phase into `out`; `g` is f32
 * scratch of W * H, `scratch` holds 32 * (3W + 4) bytes. Distances above `cap` become `cap`.
 */
export function distancePhases(out: usize, g: usize, scratch: usize, cap: f32): void {
  const w = W, h = H;
  const slots = 3 * w + 4;
  CP = scratch; CF = CP + (<usize>slots << 3); CV = CF + (<usize>slots << 3); CZ = CV + (<usize>slots << 3);
  // Column pass: vertical distance to the other phase in the same column.
  for (let x = 0; x < w; x++) stg(g, x, FAR);
  for (let y = 1; y < h; y++) {
    const r = y * w;
    for (let x = 0; x < w; x++) {
      const i = r + x;
      stg(g, i, ph(i) != ph(i - w) ? 1 : ldg(g, i - w) + 1);
    }
  }
  if (PY && h > 1) {
    for (let y = 0; y < h; y++) {
      const r = y * w, rp = (y == 0 ? h - 1 : y - 1) * w;
      for (let x = 0; x < w; x++) {
        const i = r + x, j = rp + x;
        const c: f32 = ph(i) != ph(j) ? 1 : ldg(g, j) + 1;
        if (c < ldg(g, i)) stg(g, i, c);
      }
    }
  }
  for (let y = h - 2; y >= 0; y--) {
    const r = y * w;
    for (let x = 0; x < w; x++) {
      const i = r + x, j = i + w;
      const c: f32 = ph(i) != ph(j) ? 1 : ldg(g, j) + 1;
      if (c < ldg(g, i)) stg(g, i, c);
    }
  }
  if (PY && h > 1) {
    for (let y = h - 1; y >= 0; y--) {
      const r = y * w, rn = (y == h - 1 ? 0 : y + 1) * w;
      for (let x = 0; x < w; x++) {
        const i = r + x, j = rn + x;
        const c: f32 = ph(i) != ph(j) ? 1 : ldg(g, j) + 1;
        if (c < ldg(g, i)) stg(g, i, c);
      }
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
      let n = 0;
      if (PX) {
        for (let x = -w; x < 2 * w; x++) n = addCandidate(n, x, ldg(g, r + ((x + w) % w)));
      } else {
        for (let x = 0; x < w; x++) n = addCandidate(n, x, ldg(g, r + x));
      }
      envelope(n, 0, w - 1, out, r, cap);
      continue;
    }
    if (PX) {
      // Walk unwrapped positions t .. t + w - 1; every run has other-phase bounds on both sides.
      let s = t;
      while (s < t + w) {
        const v = ph(r + (s % w));
        let e = s;
        while (e + 1 < t + w && ph(r + ((e + 1) % w)) == v) e++;
        let n = addCandidate(0, s - 1, 0);
        for (let x = s; x <= e; x++) n = addCandidate(n, x, ldg(g, r + (x % w)));
        n = addCandidate(n, e + 1, 0);
        envelope(n, s, e, out, r, cap);
        s = e + 1;
      }
    } else {
      let s = 0;
      while (s < w) {
        const v = ph(r + s);
        let e = s;
        while (e + 1 < w && ph(r + e + 1) == v) e++;
        let n = 0;
        if (s > 0) n = addCandidate(n, s - 1, 0);
        for (let x = s; x <= e; x++) n = addCandidate(n, x, ldg(g, r + x));
        if (e + 1 < w) n = addCandidate(n, e + 1, 0);
        envelope(n, s, e, out, r, cap);
        s = e + 1;
      }
    }
  }
}
