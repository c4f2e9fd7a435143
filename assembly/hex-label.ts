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
// hexLabel: run-based first scan (He, Chao & Suzuki 2008, IEEE Trans. Image Process. 17:749) with
// union-find over provisional labels (Rosenfeld & Pfaltz 1966): each horizontal run of one phase
// takes one label, joined with the same-phase runs of the row above that touch it; a run x0..x1
// of row y touches x0 - 1 + o .. x1 + o of row y - 1 (o = y & 1). Periodic sides: the components
// are then joined across the wrap edges by a second union-find whose links carry the lattice
// shift they cross (a union-find with potentials), so a cycle whose shifts do not add up to zero
// marks a domain winding around the torus. Ids 1..K in raster order of each domain's first site.
//
// hexMeasure (after hexLabel): final labels, then per domain area (sites), first and second
// moments of the site positions (unwrapped, lattice units), bounding box and flags from the runs;
// Euler number V - E + F of the domain's subcomplex of the lattice (sites, lattice edges and
// lattice triangles with all corners in the domain) and phase changes along the three lattice
// directions site by site, touching the domain columns only where a site's forward neighbours
// (E, SW, SE) are not all of its phase (elsewhere a site adds 1 - 3 + 2 = 0); per frame, V, E, F
// of each phase and the phase changes per direction.
import { W, H, PX, PY, PH, phaseAt, labelAt, ldi, sti, ldf, stf, sameMask, runEnd, fillRun, fillRunExact } from "./common";

const ROW: f64 = 0.8660254037844386; // sqrt(3) / 2

let PAR: usize = 0;  // i32, n + 1: provisional label parents, then label -> component
let CQ: usize = 0;   // i32, n + 1: component parents (periodic)
let CSX: usize = 0;  // i32, n + 1: component shift (periods of W) relative to its parent
let CSY: usize = 0;  // i32, n + 1: ... (periods of H)
let CWF: usize = 0;  // i32, n + 1: winding flags at roots (bit 0 x, bit 1 y)
let CFIN: usize = 0; // i32, n + 1: component -> domain id
let NCOMP: i32 = 0;
let FX: i32 = 0;
let FY: i32 = 0;

/** Binds six i32 buffers of W * H + 1 entries: label parents, component parents, shifts x / y, winding flags, domain ids. */
export function hexBindLabel(par: usize, cq: usize, csx: usize, csy: usize, cwf: usize, cfin: usize): void {
  PAR = par; CQ = cq; CSX = csx; CSY = csy; CWF = cwf; CFIN = cfin;
}

function lfind(x: i32): i32 {
  let p = ldi(PAR, x);
  while (p != x) {
    const g = ldi(PAR, p);
    sti(PAR, x, g);
    x = g;
    p = ldi(PAR, x);
  }
  return x;
}

function lunite(a: i32, b: i32): i32 {
  const ra = lfind(a), rb = lfind(b);
  if (ra < rb) { sti(PAR, rb, ra); return ra; }
  if (rb < ra) { sti(PAR, ra, rb); return rb; }
  return ra;
}

/** Root of component c; leaves c's shift relative to the root in FX, FY; compresses the path. */
function cfind(c: i32): i32 {
  let r = c, sx = 0, sy = 0;
  let p = ldi(CQ, r);
  while (p != r) {
    sx += ldi(CSX, r); sy += ldi(CSY, r);
    r = p; p = ldi(CQ, r);
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

/** Joins component b, reached from component a across a shift of (tx, ty) periods. */
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

/** The forward edges of site (x, y) that cross a periodic side, as component links. */
function wrapSite(x: i32, y: i32): void {
  const i = y * W + x;
  const v = phaseAt(i);
  for (let k = 0; k < 3; k++) {
    forward(x, y, k);
    if (NJ < 0 || (TX == 0 && TY == 0) || phaseAt(NJ) != v) continue;
    cunite(ldi(PAR, labelAt(i)), ldi(PAR, labelAt(NJ)), TX, TY);
  }
}

/**
 * Labels both phases (six-connected, wrapping where periodic). Returns the number of domains K;
 * site labels stay provisional until hexMeasure rewrites them.
 */
export function hexLabel(): i32 {
  const w = W, h = H, n = w * h;
  let next = 1;
  sti(PAR, 0, 0);
  for (let y = 0; y < h; y++) {
    const row = y * w, o = y & 1;
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
        const lo = max(x0 - 1 + o, 0), hi = min(x1 + o, w - 1);
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
            else if (ln != l) l = lunite(l, ln);
          }
        }
      }
      if (l == 0) { sti(PAR, next, next); l = next; next++; }
      fillRun(row + x0, row + x1, l, n);
      x0 = x1 + 1;
    }
  }
  // Components 1..k in raster order of their first run; PAR[label] = component.
  let k = 0;
  for (let l = 1; l < next; l++) {
    const p = ldi(PAR, l);
    if (p == l) { k++; sti(PAR, l, k); } else sti(PAR, l, ldi(PAR, p));
  }
  NCOMP = k;
  for (let c = 0; c <= k; c++) { sti(CQ, c, c); sti(CSX, c, 0); sti(CSY, c, 0); sti(CWF, c, 0); }
  if (PX) for (let y = 0; y < h; y++) { wrapSite(0, y); if (w > 1) wrapSite(w - 1, y); }
  if (PY) for (let x = 0; x < w; x++) wrapSite(x, h - 1);
  let K = 0;
  for (let c = 1; c <= k; c++) if (cfind(c) == c) { K++; sti(CFIN, c, K); }
  for (let c = 1; c <= k; c++) {
    const r = ldi(CQ, c);
    if (r != c) sti(CFIN, c, ldi(CFIN, r));
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

@inline function sumSquares(k: f64): f64 {
  return k * (k + 1) * (2 * k + 1) / 6; // sum of j^2 for j = 1..k, extended to all integers
}

/**
 * Rewrites the provisional labels of the last hexLabel to domain ids 1..K, then fills the domain
 * columns (at `cols`, HEX_COLUMNS x (K + 1) f64) and the frame statistics (`stats`, 9 f64: V, E, F
 * of the up phase, V, E, F of the down phase, phase changes along E, SW, SE).
 */
export function hexMeasure(K: i32, cols: usize, stats: usize, trig: usize): void {
  COLS = cols; KK = K;
  const w = W, h = H;
  // Circular-mean tables: prefix sums of cos / sin of 2 pi (x + o/2) / W for o = 0, 1 (W + 1
  // entries each), then cos / sin of 2 pi y / H (H entries each).
  const tc0 = trig, ts0 = trig + (<usize>(w + 1) << 3), tc1 = trig + (<usize>(2 * (w + 1)) << 3);
  const ts1 = trig + (<usize>(3 * (w + 1)) << 3), tcy = trig + (<usize>(4 * (w + 1)) << 3);
  const tsy = tcy + (<usize>h << 3);
  const tw = 2 * Math.PI / <f64>w, th = 2 * Math.PI / <f64>h;
  if (PX || PY) {
    let c0 = 0.0, s0 = 0.0, c1 = 0.0, s1 = 0.0;
    stf(tc0, 0, 0); stf(ts0, 0, 0); stf(tc1, 0, 0); stf(ts1, 0, 0);
    for (let x = 0; x < w; x++) {
      c0 += Math.cos(tw * <f64>x); s0 += Math.sin(tw * <f64>x);
      c1 += Math.cos(tw * (<f64>x + 0.5)); s1 += Math.sin(tw * (<f64>x + 0.5));
      stf(tc0, x + 1, c0); stf(ts0, x + 1, s0); stf(tc1, x + 1, c1); stf(ts1, x + 1, s1);
    }
    for (let y = 0; y < h; y++) { stf(tcy, y, Math.cos(th * <f64>y)); stf(tsy, y, Math.sin(th * <f64>y)); }
  }
  memory.fill(cols, 0, <usize>(HEX_COLUMNS * (K + 1)) << 3);
  for (let d = 0; d <= K; d++) {
    stf(col(C_MINX, 0), d, Infinity); stf(col(C_MAXX, 0), d, -Infinity);
    stf(col(C_MINY, 0), d, Infinity); stf(col(C_MAXY, 0), d, -Infinity);
  }
  memory.fill(stats, 0, 9 << 3);
  const periodic = PX || PY;
  // Runs: final labels, area, moments, box, flags, phase.
  for (let y = 0; y < h; y++) {
    const row = y * w, o = y & 1;
    const pr = PH + <usize>row;
    let x0 = 0;
    while (x0 < w) {
      const v = <i32>load<u8>(pr + <usize>x0);
      const x1 = runEnd(pr, x0 + 1, w, i8x16.splat(<i8>v)) - 1;
      const c = ldi(PAR, labelAt(row + x0));
      const d = ldi(CFIN, c);
      fillRunExact(row + x0, row + x1, d);
      let sx = 0, sy = 0, wf = 0;
      if (periodic) { const r = cfind(c); sx = FX; sy = FY; wf = ldi(CWF, r); }
      const fn = <f64>(x1 - x0 + 1);
      const off = 0.5 * <f64>o + <f64>(sx * w);
      const ux0 = <f64>x0 + off, ux1 = <f64>x1 + off;
      const py = <f64>(y + sy * h) * ROW;
      // Sum of (x + off) and of (x + off)^2 over x = x0..x1.
      const s1 = fn * (ux0 + ux1) * 0.5;
      const sq = sumSquares(<f64>x1) - sumSquares(<f64>(x0 - 1));
      const sx1 = fn * (<f64>x0 + <f64>x1) * 0.5;
      const s2 = sq + 2 * off * sx1 + fn * off * off;
      addc(C_AREA, d, fn);
      addc(C_SX, d, s1); addc(C_SY, d, fn * py);
      addc(C_SXX, d, s2); addc(C_SYY, d, fn * py * py); addc(C_SXY, d, s1 * py);
      if (ux0 < load<f64>(col(C_MINX, d))) store<f64>(col(C_MINX, d), ux0);
      if (ux1 > load<f64>(col(C_MAXX, d))) store<f64>(col(C_MAXX, d), ux1);
      const uy = <f64>(y + sy * h);
      if (uy < load<f64>(col(C_MINY, d))) store<f64>(col(C_MINY, d), uy);
      if (uy > load<f64>(col(C_MAXY, d))) store<f64>(col(C_MAXY, d), uy);
      let f = <i32>load<f64>(col(C_FLAGS, d)) | wf;
      if ((!PX && (x0 == 0 || x1 == w - 1)) || (!PY && (y == 0 || y == h - 1))) f |= 4;
      store<f64>(col(C_FLAGS, d), <f64>f);
      store<f64>(col(C_PHASE, d), <f64>v);
      if (wf != 0) {
        const tc = o == 0 ? tc0 : tc1, ts = o == 0 ? ts0 : ts1;
        addc(C_CXC, d, ldf(tc, x1 + 1) - ldf(tc, x0)); addc(C_CXS, d, ldf(ts, x1 + 1) - ldf(ts, x0));
        addc(C_CYC, d, fn * ldf(tcy, y)); addc(C_CYS, d, fn * ldf(tsy, y));
      }
      x0 = x1 + 1;
    }
  }
  // Sites: Euler contributions (+1 the site, -1 per forward edge inside the domain, +1 per
  // forward triangle (E, SE) and (SW, SE) inside it; every lattice edge and triangle has one
  // owning site this way) and phase changes (each mixed edge once per frame and once for each
  // of the two domains it separates). A site whose three forward neighbours share its phase
  // adds nothing to its domain and only 1, 3, 2 to its phase's V, E, F.
  let vu: i64 = 0, eu: i64 = 0, fu: i64 = 0, vd: i64 = 0, ed: i64 = 0, fd: i64 = 0; // V, E, F of each phase
  let ne: i64 = 0, nsw: i64 = 0, nse: i64 = 0;
  for (let y = 0; y < h; y++) {
    const o = y & 1;
    const row = y * w;
    const interiorRow = y + 1 < h;
    const below = interiorRow ? row + w : 0;
    for (let x = 0; x < w; x++) {
      const i = row + x;
      const v = phaseAt(i);
      let e = -1, sw = -1, se = -1;
      if (interiorRow && x > 0 && x + 1 < w) {
        // Interior: forward neighbours without wrapping; most sites have all three in their phase.
        e = i + 1; sw = below + x - 1 + o; se = below + x + o;
        if (phaseAt(e) == v && phaseAt(sw) == v && phaseAt(se) == v) {
          if (v == 1) { vu++; eu += 3; fu += 2; } else { vd++; ed += 3; fd += 2; }
          continue;
        }
      } else {
        forward(x, y, 0); e = NJ;
        forward(x, y, 1); sw = NJ;
        forward(x, y, 2); se = NJ;
      }
      const inE = e >= 0 && phaseAt(e) == v, inSW = sw >= 0 && phaseAt(sw) == v, inSE = se >= 0 && phaseAt(se) == v;
      const edges = <i32>inE + <i32>inSW + <i32>inSE;
      const tris = <i32>(inE && inSE) + <i32>(inSW && inSE);
      const d = labelAt(i);
      const chi = 1 - edges + tris;
      if (chi != 0) addc(C_EULER, d, <f64>chi);
      if (v == 1) { vu++; eu += <i64>edges; fu += <i64>tris; } else { vd++; ed += <i64>edges; fd += <i64>tris; }
      let cross = 0;
      if (e >= 0 && !inE) { cross++; addc(C_CROSS, labelAt(e), 1); ne++; }
      if (sw >= 0 && !inSW) { cross++; addc(C_CROSS, labelAt(sw), 1); nsw++; }
      if (se >= 0 && !inSE) { cross++; addc(C_CROSS, labelAt(se), 1); nse++; }
      if (cross != 0) addc(C_CROSS, d, <f64>cross);
    }
  }
  stf(stats, 0, <f64>vu); stf(stats, 1, <f64>eu); stf(stats, 2, <f64>fu);
  stf(stats, 3, <f64>vd); stf(stats, 4, <f64>ed); stf(stats, 5, <f64>fd);
  stf(stats, 6, <f64>ne); stf(stats, 7, <f64>nsw); stf(stats, 8, <f64>nse);
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
