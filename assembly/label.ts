// Connected-component labeling of both phases of a binary frame in one raster scan.
// Two-pass union-find (Rosenfeld & Pfaltz 1966); the first pass labels runs with fixed
// connectivity (see scanFixed) or pixels under the saddle rule; one phase is 8-, the other 4-connected
// (complementary connectivity, so that the phases' topologies agree). Periodic boundaries: the
// open-boundary components are then joined across the wrap edges by a second union-find whose
// edges carry lattice shifts (a "union-find with potentials"); a cycle with a non-zero total
// shift means the domain winds around the torus along that axis.
import {
  W, H, PX, PY, RULE, PH, PA, LB,
  phaseAt, labelAt, setLabel, ldi, sti, joinsDiagonal, sameMask, runEnd, fillRun,
} from "./common";

// ---- provisional union-find (PA), roots always link to the smaller label -------------------

function findRoot(x: i32): i32 {
  let p = ldi(PA, x);
  while (p != x) { // path halving
    const g = ldi(PA, p);
    sti(PA, x, g);
    x = g;
    p = ldi(PA, x);
  }
  return x;
}

function unite(a: i32, b: i32): i32 {
  const ra = findRoot(a);
  const rb = findRoot(b);
  if (ra < rb) { sti(PA, rb, ra); return ra; }
  if (rb < ra) { sti(PA, ra, rb); return rb; }
  return ra;
}

@inline function fresh(next: i32): i32 {
  sti(PA, next, next);
  return next;
}

// ---- first pass with fixed connectivity: one label per run ---------------------------------
// Run-based first scan (He, Chao & Suzuki 2008, IEEE Trans. Image Process. 17:749): each
// horizontal run of one phase takes one provisional label, joined with the runs of its phase in
// the row above that touch it (directly above for the 4-connected phase, one pixel further on
// either side for the 8-connected one). Runs and touching runs are found 16 pixels at a time
// from byte-lane masks (see sameMask in common.ts).

/** First pass with fixed connectivity (RULE 0 or 1). Returns the number of provisional labels. */
function scanFixed(): i32 {
  const w = W, h = H, n = w * h;
  const e8 = RULE == 0 ? 1 : 0; // the 8-connected phase
  let next = 1;
  sti(PA, 0, 0);
  for (let y = 0; y < h; y++) {
    const row = y * w;
    const pr = PH + <usize>row;
    const north = row - w;
    const pn = PH + <usize>north;
    let x0 = 0;
    while (x0 < w) {
      const v = <i32>load<u8>(pr + <usize>x0);
      const vv = i8x16.splat(<i8>v);
      const x1 = runEnd(pr, x0 + 1, w, vv) - 1;
      let l = 0;
      if (y > 0) {
        let lo = x0, hi = x1;
        if (v == e8) { lo = max(lo - 1, 0); hi = min(hi + 1, w - 1); }
        // Starts of same-phase stretches of the north row within lo..hi: one label each.
        let carry = 0;
        for (let s = lo; s <= hi; s += 16) {
          let m = sameMask(pn + <usize>s, vv);
          const span = hi - s + 1;
          if (span < 16) m &= (1 << span) - 1;
          let starts = m & ~((m << 1) | carry);
          carry = (m >> 15) & 1;
          while (starts != 0) {
            const ln = labelAt(north + s + <i32>ctz(starts));
            starts &= starts - 1;
            if (l == 0) l = ln;
            else if (ln != l) l = unite(l, ln);
          }
        }
      }
      if (l == 0) { l = fresh(next); next++; if (LAREA != 0) sti(LAREA, l, v); }
      if (LAREA != 0) sti(LAREA, l, ldi(LAREA, l) + ((x1 - x0 + 1) << 1));
      fillRun(row + x0, row + x1, l, n);
      x0 = x1 + 1;
    }
  }
  return next - 1;
}

@inline function joinInto(l: i32, j: i32): i32 {
  const lj = labelAt(j);
  if (l == 0) return lj;
  return lj == l ? l : unite(l, lj);
}

/** First pass with the saddle rule: diagonal pairs join as QM decides, per quad. */
function scanSaddle(): i32 {
  const w = W, h = H;
  let next = 1;
  sti(PA, 0, 0);
  for (let y = 0; y < h; y++) {
    const row = y * w;
    for (let x = 0; x < w; x++) {
      const i = row + x;
      const v = phaseAt(i);
      let l = 0;
      if (x > 0 && phaseAt(i - 1) == v) l = joinInto(l, i - 1);
      if (y > 0) {
        const n = i - w;
        if (phaseAt(n) == v) l = joinInto(l, n);
        // NW-p is the main diagonal of quad (x-1, y-1); NE-p the anti-diagonal of quad (x, y-1).
        if (x > 0 && phaseAt(n - 1) == v && joinsDiagonal(v, n - 1)) l = joinInto(l, n - 1);
        if (x + 1 < w && phaseAt(n + 1) == v && joinsDiagonal(v, n)) l = joinInto(l, n + 1);
      }
      if (l == 0) { l = fresh(next); next++; if (LAREA != 0) sti(LAREA, l, v); }
      if (LAREA != 0) sti(LAREA, l, ldi(LAREA, l) + 2);
      setLabel(i, l);
    }
  }
  return next - 1;
}

/**
 * Labels both phases with open boundaries, then numbers the components 1..k in raster order of
 * their first pixel: afterwards PA[provisional] is the component of that provisional label.
 * Returns k. Pixel labels stay provisional until `measureRuns` rewrites them.
 */
export function labelScan(): i32 {
  const n = RULE == 2 ? scanSaddle() : scanFixed();
  let k = 0;
  for (let l = 1; l <= n; l++) {
    const p = ldi(PA, l);
    if (p == l) { k++; sti(PA, l, k); } else sti(PA, l, ldi(PA, p));
  }
  LABELS = n;
  return k;
}

// ---- periodic boundaries: union-find over components with lattice shifts ------------------
// CQ parent, CSX/CSY shift of a component relative to its parent (in periods), CWF winding flags
// (bit 0: x, bit 1: y), CFIN final domain id. Shift convention: a component's pixels sit at
// (x + sx * W, y + sy * H) in its root's unwrapped frame.

let CQ: usize = 0;
let CSX: usize = 0;
let CSY: usize = 0;
let CWF: usize = 0;
let CFIN: usize = 0;
let FX: i32 = 0;
let FY: i32 = 0;

export function bindComponents(q: usize, sx: usize, sy: usize, wf: usize, fin: usize): void {
  CQ = q; CSX = sx; CSY = sy; CWF = wf; CFIN = fin;
}

/** Root of component c; leaves c's shift relative to the root in FX, FY; compresses the path. */
function cfind(c: i32): i32 {
  let r = c;
  let sx = 0, sy = 0;
  let p = ldi(CQ, r);
  while (p != r) {
    sx += ldi(CSX, r);
    sy += ldi(CSY, r);
    r = p;
    p = ldi(CQ, r);
  }
  let node = c, cx = sx, cy = sy;
  while (node != r) {
    const up = ldi(CQ, node);
    const ox = ldi(CSX, node), oy = ldi(CSY, node);
    sti(CQ, node, r); sti(CSX, node, cx); sti(CSY, node, cy);
    cx -= ox; cy -= oy;
    node = up;
  }
  FX = sx; FY = sy;
  return r;
}

/** Joins component b, shifted by (tx, ty) periods, to component a. */
function cunite(a: i32, b: i32, tx: i32, ty: i32): void {
  const ra = cfind(a);
  const ax = FX, ay = FY;
  const rb = cfind(b);
  const dx = ax + tx - FX, dy = ay + ty - FY; // rb's frame -> ra's frame
  if (ra == rb) {
    let f = ldi(CWF, ra);
    if (dx != 0) f |= 1;
    if (dy != 0) f |= 2;
    sti(CWF, ra, f);
    return;
  }
  if (ra < rb) {
    sti(CQ, rb, ra); sti(CSX, rb, dx); sti(CSY, rb, dy);
    sti(CWF, ra, ldi(CWF, ra) | ldi(CWF, rb));
  } else {
    sti(CQ, ra, rb); sti(CSX, ra, -dx); sti(CSY, ra, -dy);
    sti(CWF, rb, ldi(CWF, rb) | ldi(CWF, ra));
  }
}

@inline function componentOf(i: i32): i32 {
  return ldi(PA, labelAt(i));
}

/** The forward edge from (x, y) by (dx, dy), dy >= 0, if it crosses a periodic side. */
function wrapEdge(x: i32, y: i32, dx: i32, dy: i32): void {
  let nx = x + dx, ny = y + dy, tx = 0, ty = 0;
  if (nx < 0) { if (!PX) return; nx += W; tx = -1; }
  else if (nx >= W) { if (!PX) return; nx -= W; tx = 1; }
  if (ny >= H) { if (!PY) return; ny -= H; ty = 1; }
  if (tx == 0 && ty == 0) return;
  const i = y * W + x, j = ny * W + nx;
  const v = phaseAt(i);
  if (phaseAt(j) != v) return;
  if (dx != 0 && dy != 0) {
    let qx = dx > 0 ? x : x - 1;
    if (qx < 0) qx += W;
    if (!joinsDiagonal(v, y * W + qx)) return;
  }
  cunite(componentOf(i), componentOf(j), tx, ty);
}

function wrapPixel(x: i32, y: i32): void {
  wrapEdge(x, y, 1, 0);
  wrapEdge(x, y, 0, 1);
  wrapEdge(x, y, 1, 1);
  wrapEdge(x, y, -1, 1);
}

/**
 * Joins the k open-boundary components across the periodic sides and numbers the resulting
 * domains 1..K (in order of their smallest component). Returns K. Without periodic sides the
 * domains are the components.
 */
export function resolvePeriodic(k: i32): i32 {
  for (let c = 0; c <= k; c++) {
    sti(CQ, c, c); sti(CSX, c, 0); sti(CSY, c, 0); sti(CWF, c, 0);
  }
  const w = W, h = H;
  for (let x = 0; x < w; x++) {
    wrapPixel(x, 0);
    if (h > 1) wrapPixel(x, h - 1);
  }
  for (let y = 1; y < h - 1; y++) {
    wrapPixel(0, y);
    if (w > 1) wrapPixel(w - 1, y);
  }
  return numberDomains(k);
}

/** Compresses every component's path to its root and numbers the domains 1..K in order of their root (the smallest component). Returns K. */
function numberDomains(k: i32): i32 {
  let K = 0;
  for (let c = 1; c <= k; c++) {
    if (cfind(c) == c) { K++; sti(CFIN, c, K); }
  }
  for (let c = 1; c <= k; c++) {
    const r = ldi(CQ, c);
    if (r != c) sti(CFIN, c, ldi(CFIN, r));
  }
  return K;
}

// ---- speck absorption before measuring -----------------------------------------------------
// With a minimum domain area, the scan also counts each provisional label's pixels (LAREA:
// 2 x pixels + phase), componentAreas sums them per component (CAREA, CPHASE), and after
// resolvePeriodic the domains below the limit are flipped into the other phase and joined to
// its components in place: no second labeling. A flipped pixel joins its 4-neighbours of the
// new phase (a diagonal pair with a flipped pixel always has a 4-path through the quad as well:
// the pixel's old 4-neighbours of its old phase were in its own domain and flipped with it).
// Domain ids stay in order of the smallest component (the first pixel in raster order), as a
// fresh labeling of the edited phase map numbers them.

let LAREA: usize = 0;  // i32 per provisional label (0: not counted)
let CAREA: usize = 0;  // i32 per component: pixels
let CPHASE: usize = 0; // i32 per component: phase (updated when flipped)
let DMARK: usize = 0;  // i32 per component: domain pixels at roots, -1 on every component of a speck

let LABELS: i32 = 0;    // provisional labels of the last scan

/** Binds the speck buffers: larea (pixels + 1 entries) or 0 to count nothing; the others per component. */
export function bindSpecks(larea: usize, carea: usize, cphase: usize, dmark: usize): void {
  LAREA = larea; CAREA = carea; CPHASE = cphase; DMARK = dmark;
}

/** Pixels and phase of each of the k components of the last scan, from its provisional labels' counts. */
export function componentAreas(k: i32): void {
  for (let c = 0; c <= k; c++) sti(CAREA, c, 0);
  for (let l = 1; l <= LABELS; l++) {
    const c = ldi(PA, l), a = ldi(LAREA, l);
    sti(CAREA, c, ldi(CAREA, c) + (a >> 1));
    sti(CPHASE, c, a & 1);
  }
}

/**
 * After resolvePeriodic (k components, each CQ entry its root): marks every component of the
 * domains of phase p with fewer than minArea pixels. Returns the number of such domains.
 */
export function markSpecks(k: i32, p: i32, minArea: i32): i32 {
  for (let c = 0; c <= k; c++) sti(DMARK, c, 0);
  for (let c = 1; c <= k; c++) { const r = ldi(CQ, c); sti(DMARK, r, ldi(DMARK, r) + ldi(CAREA, c)); }
  let count = 0;
  // Roots are the smallest component of their domain: each root is seen before its members.
  for (let c = 1; c <= k; c++) {
    const r = ldi(CQ, c);
    if (r == c) {
      if (ldi(CPHASE, c) == p && ldi(DMARK, c) < minArea) { sti(DMARK, c, -1); count++; }
    } else sti(DMARK, c, ldi(DMARK, r) == -1 ? -1 : 0);
  }
  return count;
}

/** Joins component c (flipped into phase q) with that of pixel j, at lattice shift (tx, ty), when j is of phase q. */
@inline function joinFlipped(c: i32, q: i32, j: i32, tx: i32, ty: i32): void {
  if (phaseAt(j) == q) cunite(c, ldi(PA, labelAt(j)), tx, ty);
}

/**
 * Flips the pixels of the components markSpecks marked (phase p) into phase 1 - p, joins them
 * to their 4-neighbours of that phase, and renumbers the domains 1..K in order of their
 * smallest component. Returns K.
 */
export function absorbMarked(k: i32, p: i32): i32 {
  const w = W, h = H, q = 1 - p;
  for (let y = 0; y < h; y++) {
    const row = y * w;
    let x0 = 0;
    const pr = PH + <usize>row;
    while (x0 < w) {
      // One run of one phase, sixteen pixels a step: its pixels are in one domain (row
      // neighbours of one phase always join, and a first round's flipped pixels were joined to
      // theirs), so the component of its first pixel tells whether the run goes.
      const v = <i32>load<u8>(pr + <usize>x0);
      const x1 = runEnd(pr, x0 + 1, w, i8x16.splat(<i8>v));
      const c = ldi(PA, labelAt(row + x0));
      if (ldi(DMARK, c) == -1) {
        memory.fill(PH + <usize>(row + x0), <u8>q, <usize>(x1 - x0));
        sti(CPHASE, c, q);
        // West of the run's start, east of its end (across a periodic side: shifted by a period).
        if (x0 > 0) joinFlipped(c, q, row + x0 - 1, 0, 0);
        else if (PX) joinFlipped(c, q, row + w - 1, -1, 0);
        if (x1 < w) joinFlipped(c, q, row + x1, 0, 0);
        else if (PX) joinFlipped(c, q, row, 1, 0);
        for (let x = x0; x < x1; x++) {
          if (y > 0) joinFlipped(c, q, row - w + x, 0, 0);
          else if (PY) joinFlipped(c, q, (h - 1) * w + x, 0, -1);
          if (y + 1 < h) joinFlipped(c, q, row + w + x, 0, 0);
          else if (PY) joinFlipped(c, q, x, 0, 1);
        }
      }
      x0 = x1;
    }
  }
  return numberDomains(k);
}
