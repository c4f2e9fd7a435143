// Hexagonal (triangular-lattice) frames: labeling of both phases and per-domain measures.
//
// Convention (offset rows): site (x, y) of a W x H row-major array sits at
// (x + (y & 1) / 2, y * sqrt(3) / 2) in units of the lattice constant: odd rows are shifted right
// by half a site. Its six neighbours are (x +- 1, y) and, in rows y +- 1, (x - 1 + (y & 1), y +- 1)
// and (x + (y & 1), y +- 1). A periodic y axis needs an even H (checked in TypeScript) so that the
// row parity is consistent across the wrap.
//
// Both phases are 6-connected: on the triangular lattice a site set and its complement under the
// same six-neighbour rule have no connectivity paradox (Rosenfeld 1970, "Connectivity in digital
// pictures", J. ACM 17:146), so no complementary rule is needed.
//
// hexLabel: union-find over sites (Rosenfeld & Pfaltz 1966) in which every link carries the lattice
// shift it crosses (a union-find with potentials), so one pass over the forward edges E, SW, SE
// (wrapping on periodic sides) labels the domains and finds those that wind around the torus: a
// cycle whose shifts do not add up to zero. Ids 1..K in raster order of each domain's first site.
//
// hexMeasure: per domain, area (sites), first and second moments of the site positions (unwrapped,
// in lattice units), bounding box, Euler number V - E + F of the domain's subcomplex of the
// lattice (sites, lattice edges and lattice triangles with all corners in the domain), phase
// changes along the three lattice directions (for the Crofton wall length), flags and circular
// means for wrapping axes; per frame, V, E, F of each phase and the phase changes per direction.
import { W, H, PX, PY, PH, phaseAt, labelAt, setLabel, ldi, sti, ldf, stf } from "./common";

const ROW: f64 = 0.8660254037844386; // sqrt(3) / 2

let PAR: usize = 0; // i32 per site: union-find parent
let SX: usize = 0;  // i32 per site: shift (periods of W) relative to the parent
let SY: usize = 0;  // i32 per site: shift (periods of H) relative to the parent
let WF: usize = 0;  // i32 per site: winding flags at roots (bit 0 x, bit 1 y)
let FX: i32 = 0;
let FY: i32 = 0;

/** Binds four i32 site buffers (W * H each): parents, x shifts, y shifts, winding flags. */
export function hexBindLabel(par: usize, sx: usize, sy: usize, wf: usize): void {
  PAR = par; SX = sx; SY = sy; WF = wf;
}

/** Root of site i; leaves i's shift relative to the root in FX, FY; compresses the path. */
function hfind(i: i32): i32 {
  let r = i, sx = 0, sy = 0;
  let p = ldi(PAR, r);
  while (p != r) {
    sx += ldi(SX, r); sy += ldi(SY, r);
    r = p; p = ldi(PAR, r);
  }
  let node = i, cx = sx, cy = sy;
  while (node != r) {
    const up = ldi(PAR, node);
    const ox = ldi(SX, node), oy = ldi(SY, node);
    sti(PAR, node, r); sti(SX, node, cx); sti(SY, node, cy);
    cx -= ox; cy -= oy;
    node = up;
  }
  FX = sx; FY = sy;
  return r;
}

/** Joins site j, which is site i's neighbour after a shift of (tx, ty) periods. Roots link to the smaller index. */
function hunite(i: i32, j: i32, tx: i32, ty: i32): void {
  const ri = hfind(i);
  const ix = FX, iy = FY;
  const rj = hfind(j);
  const dx = ix + tx - FX, dy = iy + ty - FY; // rj's frame -> ri's frame
  if (ri == rj) {
    let f = ldi(WF, ri);
    if (dx != 0) f |= 1;
    if (dy != 0) f |= 2;
    sti(WF, ri, f);
    return;
  }
  if (ri < rj) {
    sti(PAR, rj, ri); sti(SX, rj, dx); sti(SY, rj, dy);
    sti(WF, ri, ldi(WF, ri) | ldi(WF, rj));
  } else {
    sti(PAR, ri, rj); sti(SX, ri, -dx); sti(SY, ri, -dy);
    sti(WF, rj, ldi(WF, rj) | ldi(WF, ri));
  }
}

// The forward neighbour k of site (x, y): k = 0 E (x + 1, y), 1 SW (x - 1 + o, y + 1),
// 2 SE (x + o, y + 1), o = y & 1. Sets NJ (site index, -1 outside an open side) and the shift
// crossed, TX, TY (periods).
let NJ: i32 = 0;
let TX: i32 = 0;
let TY: i32 = 0;

@inline function forward(x: i32, y: i32, k: i32): void {
  const o = y & 1;
  let nx = k == 0 ? x + 1 : k == 1 ? x - 1 + o : x + o;
  let ny = k == 0 ? y : y + 1;
  TX = 0; TY = 0;
  if (nx < 0) { if (!PX) { NJ = -1; return; } nx += W; TX = -1; }
  else if (nx >= W) { if (!PX) { NJ = -1; return; } nx -= W; TX = 1; }
  if (ny >= H) { if (!PY) { NJ = -1; return; } ny -= H; TY = 1; }
  NJ = ny * W + nx;
}

/** Labels both phases (six-connected, wrapping where periodic). Returns the number of domains K. */
export function hexLabel(): i32 {
  const w = W, h = H, n = w * h;
  for (let i = 0; i < n; i++) { sti(PAR, i, i); sti(SX, i, 0); sti(SY, i, 0); sti(WF, i, 0); }
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      const i = y * w + x;
      const v = phaseAt(i);
      for (let k = 0; k < 3; k++) {
        forward(x, y, k);
        if (NJ < 0 || phaseAt(NJ) != v) continue;
        hunite(i, NJ, TX, TY);
      }
    }
  }
  // Number the roots in raster order (a root is its set's smallest site index, so its first).
  let K = 0;
  for (let i = 0; i < n; i++) {
    const r = hfind(i);
    if (r == i) { K++; setLabel(i, K); } else setLabel(i, labelAt(r));
  }
  return K;
}

// ---- per-domain measures --------------------------------------------------------------------
// f64 columns c = 0..NCOL-1 of K + 1 entries each (index = domain id) at COLS + 8 (c (K+1) + d).
const C_AREA = 0, C_SX = 1, C_SY = 2, C_SXX = 3, C_SYY = 4, C_SXY = 5, C_MINX = 6, C_MAXX = 7;
const C_MINY = 8, C_MAXY = 9, C_EULER = 10, C_CROSS = 11, C_FLAGS = 12, C_PHASE = 13;
const C_CXC = 14, C_CXS = 15, C_CYC = 16, C_CYS = 17;
export const HEX_COLUMNS: i32 = 18;

let COLS: usize = 0;
let KK: i32 = 0;

@inline function col(c: i32, d: i32): usize {
  return COLS + ((<usize>(c * (KK + 1) + d)) << 3);
}
@inline function addc(c: i32, d: i32, v: f64): void {
  const p = col(c, d);
  store<f64>(p, load<f64>(p) + v);
}

/**
 * Fills the domain columns (at `cols`, HEX_COLUMNS x (K + 1) f64) and the frame statistics
 * (`stats`, 9 f64: V, E, F of the up phase, V, E, F of the down phase, phase changes along E,
 * SW, SE) from the labels of the last hexLabel.
 */
export function hexMeasure(K: i32, cols: usize, stats: usize): void {
  COLS = cols; KK = K;
  const w = W, h = H;
  memory.fill(cols, 0, <usize>(HEX_COLUMNS * (K + 1)) << 3);
  for (let d = 0; d <= K; d++) {
    stf(col(C_MINX, 0), d, Infinity); stf(col(C_MAXX, 0), d, -Infinity);
    stf(col(C_MINY, 0), d, Infinity); stf(col(C_MAXY, 0), d, -Infinity);
  }
  memory.fill(stats, 0, 9 << 3);
  const periodic = PX || PY;
  const tw = 2 * Math.PI / <f64>w, th = 2 * Math.PI / <f64>h;
  for (let y = 0; y < h; y++) {
    const o = y & 1;
    for (let x = 0; x < w; x++) {
      const i = y * w + x;
      const d = labelAt(i);
      const v = phaseAt(i);
      const sb = v == 1 ? 0 : 3; // stats base of this phase
      // Unwrapped position in the domain's root frame.
      let ux = <f64>x + 0.5 * <f64>o, uy = <f64>y;
      let wf = 0;
      if (periodic) {
        const r = hfind(i);
        ux += <f64>(FX * w);
        uy += <f64>(FY * h);
        wf = ldi(WF, r);
      }
      const py = uy * ROW;
      addc(C_AREA, d, 1);
      addc(C_SX, d, ux); addc(C_SY, d, py);
      addc(C_SXX, d, ux * ux); addc(C_SYY, d, py * py); addc(C_SXY, d, ux * py);
      if (ux < load<f64>(col(C_MINX, d))) store<f64>(col(C_MINX, d), ux);
      if (ux > load<f64>(col(C_MAXX, d))) store<f64>(col(C_MAXX, d), ux);
      if (uy < load<f64>(col(C_MINY, d))) store<f64>(col(C_MINY, d), uy);
      if (uy > load<f64>(col(C_MAXY, d))) store<f64>(col(C_MAXY, d), uy);
      let f = <i32>load<f64>(col(C_FLAGS, d)) | wf;
      if ((!PX && (x == 0 || x == w - 1)) || (!PY && (y == 0 || y == h - 1))) f |= 4;
      store<f64>(col(C_FLAGS, d), <f64>f);
      store<f64>(col(C_PHASE, d), <f64>v);
      if (wf != 0) {
        const ax = tw * (<f64>x + 0.5 * <f64>o), ay = th * <f64>y;
        addc(C_CXC, d, Math.cos(ax)); addc(C_CXS, d, Math.sin(ax));
        addc(C_CYC, d, Math.cos(ay)); addc(C_CYS, d, Math.sin(ay));
      }
      // Euler: +1 for the site, -1 per forward edge inside the domain, +1 per forward triangle
      // (E, SE) and (SW, SE) with all corners in it. Every lattice edge and triangle has exactly
      // one owning site this way (2 triangles and 3 edges per site on the torus).
      let chi = 1;
      forward(x, y, 0);
      const e = NJ;
      forward(x, y, 1);
      const sw = NJ;
      forward(x, y, 2);
      const se = NJ;
      const inE = e >= 0 && phaseAt(e) == v, inSW = sw >= 0 && phaseAt(sw) == v, inSE = se >= 0 && phaseAt(se) == v;
      chi -= <i32>inE + <i32>inSW + <i32>inSE;
      chi += <i32>(inE && inSE) + <i32>(inSW && inSE);
      addc(C_EULER, d, <f64>chi);
      stf(stats, sb, ldf(stats, sb) + 1);
      stf(stats, sb + 1, ldf(stats, sb + 1) + <f64>(<i32>inE + <i32>inSW + <i32>inSE));
      stf(stats, sb + 2, ldf(stats, sb + 2) + <f64>(<i32>(inE && inSE) + <i32>(inSW && inSE)));
      // Phase changes along the three lattice directions: each mixed edge once per frame and
      // once for each of the two domains it separates.
      if (e >= 0 && !inE) { addc(C_CROSS, d, 1); addc(C_CROSS, labelAt(e), 1); stf(stats, 6, ldf(stats, 6) + 1); }
      if (sw >= 0 && !inSW) { addc(C_CROSS, d, 1); addc(C_CROSS, labelAt(sw), 1); stf(stats, 7, ldf(stats, 7) + 1); }
      if (se >= 0 && !inSE) { addc(C_CROSS, d, 1); addc(C_CROSS, labelAt(se), 1); stf(stats, 8, ldf(stats, 8) + 1); }
    }
  }
}

/** Flips the sites of domains of `phase` with fewer than `minArea` sites (after hexMeasure). Returns sites flipped. */
export function hexAbsorb(phase: i32, minArea: i32): i32 {
  const n = W * H;
  let flipped = 0;
  for (let i = 0; i < n; i++) {
    const d = labelAt(i);
    if (<i32>load<f64>(col(C_PHASE, d)) == phase && load<f64>(col(C_AREA, d)) < <f64>minArea) {
      store<u8>(PH + <usize>i, <u8>(1 - phase));
      flipped++;
    }
  }
  return flipped;
}
