// Per-domain accumulators and per-frame quad statistics, after labeling.
//  - measureRuns: final labels, area, bounding box, first and second moments in unwrapped
//    coordinates, circular means for wrapping axes, edge flags; summed over horizontal runs.
//    Also each domain's phase changes along rows (N0), from the ends of its runs.
//  - measureQuads: the 2x2 bit-quad histogram (Gray 1971, IEEE Trans. Comput. C-20:551), each
//    domain's Euler number from its own quad patterns, and the phase changes along columns and
//    both diagonals that the Crofton wall-length estimate needs (Ohser & Muecklich 2000).
import {
  W, H, PX, PY, RULE, PH, PA, QM, LB,
  phaseAt, labelAt, ldi, sti, ldf, stf, runEnd, fillRunExact,
} from "./common";

// Domain columns, indexed by domain id 1..K. i32 columns:
let D_AREA: usize = 0;
let D_MINX: usize = 0;
let D_MAXX: usize = 0;
let D_MINY: usize = 0;
let D_MAXY: usize = 0;
let D_EULER4: usize = 0; // 4 x Euler number
let D_N0: usize = 0;     // phase changes along rows
let D_N90: usize = 0;    // ... along columns
let D_N45: usize = 0;    // ... along anti-diagonals (x+1, y-1)
let D_N135: usize = 0;   // ... along diagonals (x+1, y+1)
let D_FLAGS: usize = 0;  // bit 0 wraps x, bit 1 wraps y, bit 2 touches an open image side
let D_PHASE: usize = 0;
// f64 columns:
let D_SX: usize = 0;
let D_SY: usize = 0;
let D_SXX: usize = 0;
let D_SYY: usize = 0;
let D_SXY: usize = 0;
let D_CXC: usize = 0; // sum of cos(2 pi x / W), for domains wrapping in x
let D_CXS: usize = 0;
let D_CYC: usize = 0;
let D_CYS: usize = 0;
// Components (periodic only): final id, shifts and winding flags; trig prefix tables.
let C_FIN: usize = 0;
let C_SX: usize = 0;
let C_SY: usize = 0;
let C_WF: usize = 0;
let C_Q: usize = 0;
let T_CX: usize = 0; // prefix sums of cos(2 pi x / W), W + 1 entries
let T_SX: usize = 0;
let T_CY: usize = 0; // cos(2 pi y / H), H entries
let T_SY: usize = 0;
// Frame statistics: HIST[0..15] quad codes (bit 0 top-left, 1 top-right, 2 bottom-left,
// 3 bottom-right set = up) with diagonal quads 6 and 9 counted where the up pair joins, and
// HIST[16] (code 6) / HIST[17] (code 9) where the down pair joins. BORDER: [0] phase changes
// along open sides (zero-padding quads), [1] up corners, [2] down corners, [3] row changes in
// the last row and [4] column changes in the last column of an open frame.
let HIST: usize = 0;
let BORDER: usize = 0;

/** `table` holds 32 u32 pointers in the order of the declarations above. */
export function bindDomains(table: usize): void {
  D_AREA = load<u32>(table, 0); D_MINX = load<u32>(table, 4); D_MAXX = load<u32>(table, 8);
  D_MINY = load<u32>(table, 12); D_MAXY = load<u32>(table, 16); D_EULER4 = load<u32>(table, 20);
  D_N0 = load<u32>(table, 24); D_N90 = load<u32>(table, 28); D_N45 = load<u32>(table, 32);
  D_N135 = load<u32>(table, 36); D_FLAGS = load<u32>(table, 40); D_PHASE = load<u32>(table, 44);
  D_SX = load<u32>(table, 48); D_SY = load<u32>(table, 52); D_SXX = load<u32>(table, 56);
  D_SYY = load<u32>(table, 60); D_SXY = load<u32>(table, 64); D_CXC = load<u32>(table, 68);
  D_CXS = load<u32>(table, 72); D_CYC = load<u32>(table, 76); D_CYS = load<u32>(table, 80);
  C_FIN = load<u32>(table, 84); C_SX = load<u32>(table, 88); C_SY = load<u32>(table, 92);
  C_WF = load<u32>(table, 96); C_Q = load<u32>(table, 100);
  T_CX = load<u32>(table, 104); T_SX = load<u32>(table, 108);
  T_CY = load<u32>(table, 112); T_SY = load<u32>(table, 116);
  HIST = load<u32>(table, 120); BORDER = load<u32>(table, 124);
}

/** Fills the trigonometric tables for circular means (once per frame shape). */
export function fillTrigTables(): void {
  let c = 0.0, s = 0.0;
  stf(T_CX, 0, 0); stf(T_SX, 0, 0);
  for (let x = 0; x < W; x++) {
    const a = 2 * Math.PI * <f64>x / <f64>W;
    c += Math.cos(a); s += Math.sin(a);
    stf(T_CX, x + 1, c); stf(T_SX, x + 1, s);
  }
  for (let y = 0; y < H; y++) {
    const a = 2 * Math.PI * <f64>y / <f64>H;
    stf(T_CY, y, Math.cos(a)); stf(T_SY, y, Math.sin(a));
  }
}

@inline function sumSquares(k: f64): f64 {
  return k * (k + 1) * (2 * k + 1) / 6; // sum of j^2 for j = 1..k, extended to all integers
}

function clearDomains(K: i32): void {
  for (let d = 0; d <= K; d++) {
    sti(D_AREA, d, 0);
    sti(D_MINX, d, i32.MAX_VALUE); sti(D_MAXX, d, i32.MIN_VALUE);
    sti(D_MINY, d, i32.MAX_VALUE); sti(D_MAXY, d, i32.MIN_VALUE);
    sti(D_EULER4, d, 0);
    sti(D_N0, d, 0); sti(D_N90, d, 0); sti(D_N45, d, 0); sti(D_N135, d, 0);
    sti(D_FLAGS, d, 0); sti(D_PHASE, d, 0);
    stf(D_SX, d, 0); stf(D_SY, d, 0); stf(D_SXX, d, 0); stf(D_SYY, d, 0); stf(D_SXY, d, 0);
    stf(D_CXC, d, 0); stf(D_CXS, d, 0); stf(D_CYC, d, 0); stf(D_CYS, d, 0);
  }
}

/** Adds the run x0..x1 of row y (component c, domain d, phase v) to d's accumulators. */
function addRun(d: i32, c: i32, v: i32, x0: i32, x1: i32, y: i32, periodic: bool): void {
  let sx = 0, sy = 0, wf = 0;
  if (periodic) {
    sx = ldi(C_SX, c); sy = ldi(C_SY, c);
    wf = ldi(C_WF, ldi(C_Q, c));
  }
  const n = x1 - x0 + 1;
  const ux0 = x0 + sx * W, ux1 = x1 + sx * W, uy = y + sy * H;
  sti(D_AREA, d, ldi(D_AREA, d) + n);
  if (ux0 < ldi(D_MINX, d)) sti(D_MINX, d, ux0);
  if (ux1 > ldi(D_MAXX, d)) sti(D_MAXX, d, ux1);
  if (uy < ldi(D_MINY, d)) sti(D_MINY, d, uy);
  if (uy > ldi(D_MAXY, d)) sti(D_MAXY, d, uy);
  const fn = <f64>n, fy = <f64>uy;
  const su = fn * (<f64>ux0 + <f64>ux1) * 0.5;
  const su2 = sumSquares(<f64>ux1) - sumSquares(<f64>(ux0 - 1));
  stf(D_SX, d, ldf(D_SX, d) + su);
  stf(D_SXX, d, ldf(D_SXX, d) + su2);
  stf(D_SY, d, ldf(D_SY, d) + fn * fy);
  stf(D_SYY, d, ldf(D_SYY, d) + fn * fy * fy);
  stf(D_SXY, d, ldf(D_SXY, d) + fy * su);
  let f = ldi(D_FLAGS, d) | wf;
  if ((!PX && (x0 == 0 || x1 == W - 1)) || (!PY && (y == 0 || y == H - 1))) f |= 4;
  sti(D_FLAGS, d, f);
  // Runs end where the phase changes (same-phase row neighbours always join), so each end
  // inside the row, or across a periodic side of another phase, is one row change (N0).
  const row = y * W;
  sti(D_PHASE, d, v);
  let ends = <i32>(x0 > 0) + <i32>(x1 < W - 1);
  if (PX) {
    const across = <i32>(phaseAt(row) != phaseAt(row + W - 1));
    ends += (<i32>(x0 == 0) + <i32>(x1 == W - 1)) * across;
  }
  sti(D_N0, d, ldi(D_N0, d) + ends);
  if (wf != 0) {
    stf(D_CXC, d, ldf(D_CXC, d) + ldf(T_CX, x1 + 1) - ldf(T_CX, x0));
    stf(D_CXS, d, ldf(D_CXS, d) + ldf(T_SX, x1 + 1) - ldf(T_SX, x0));
    stf(D_CYC, d, ldf(D_CYC, d) + fn * ldf(T_CY, y));
    stf(D_CYS, d, ldf(D_CYS, d) + fn * ldf(T_SY, y));
  }
}

/**
 * Rewrites provisional labels to domain ids 1..K and fills the run-based accumulators.
 * `periodic`: components were joined by resolvePeriodic (C_FIN, shifts and flags are valid).
 */
export function measureRuns(K: i32, periodic: bool): void {
  clearDomains(K);
  LASTK = K;
  const w = W, h = H;
  for (let y = 0; y < h; y++) {
    const row = y * w;
    const pr = PH + <usize>row;
    let x0 = 0;
    while (x0 < w) {
      // One run: pixels of one phase, so of one component (same-phase row neighbours always
      // join); its provisional labels, whatever they are, become the domain id.
      const v = <i32>load<u8>(pr + <usize>x0);
      const x1 = runEnd(pr, x0 + 1, w, i8x16.splat(<i8>v)) - 1;
      const c = ldi(PA, labelAt(row + x0));
      const d = periodic ? ldi(C_FIN, c) : c;
      fillRunExact(row + x0, row + x1, d);
      addRun(d, c, v, x0, x1, y, periodic);
      x0 = x1 + 1;
    }
  }
}

@inline function bump(col: usize, d: i32, by: i32): void {
  sti(col, d, ldi(col, d) + by);
}

// The quad pass accumulates four numbers per domain side by side, [4 x Euler, N90, N45, N135]
// (16 bytes at QACC + 16 d), so that one corner of a quad is one SIMD add; they are copied into
// their columns at the end. QTAB holds those adds per quad bin (0..17, as HIST) and corner
// (a, b, c, d): 18 x 4 x 16 bytes.
let QACC: usize = 0;
let LASTK: i32 = 0;
const QTAB: usize = memory.data(18 * 64, 16);
const LANES: usize = memory.data(16, 16);

function fillQuadTable(): void {
  for (let e = 0; e < 18; e++) {
    const code = e == 16 ? 6 : e == 17 ? 9 : e;
    const p = [code & 1, (code >> 1) & 1, (code >> 2) & 1, (code >> 3) & 1]; // a, b, c, d
    const eu = [0, 0, 0, 0], n90 = [0, 0, 0, 0], n45 = [0, 0, 0, 0], n135 = [0, 0, 0, 0];
    if (p[0] != p[2]) { n90[0] = 1; n90[2] = 1; }
    if (p[1] != p[2]) { n45[1] = 1; n45[2] = 1; }
    if (p[0] != p[3]) { n135[0] = 1; n135[3] = 1; }
    const n = p[0] + p[1] + p[2] + p[3];
    if (code == 6 || code == 9) {
      // Diagonal quad: the joined pair is one domain (-2), each pixel of the other +1.
      const upJoins = e < 16;
      const upFirst = code == 9; // up pair is (a, d) for code 9, (b, c) for code 6
      const u0 = upFirst ? 0 : 1, u1 = upFirst ? 3 : 2;
      const d0 = upFirst ? 1 : 0, d1 = upFirst ? 2 : 3;
      if (upJoins) { eu[u0] = -2; eu[d0] = 1; eu[d1] = 1; }
      else { eu[d0] = -2; eu[u0] = 1; eu[u1] = 1; }
    } else if (n == 1 || n == 3) {
      // One pixel differs from the other three: +1 to its domain, -1 to theirs (once).
      const odd = n == 1 ? code : 15 ^ code;
      const s = odd == 1 ? 0 : odd == 2 ? 1 : odd == 4 ? 2 : 3;
      eu[s] = 1;
      eu[s == 0 ? 1 : 0] = -1;
    }
    for (let k = 0; k < 4; k++) {
      const at = QTAB + <usize>(e * 64 + k * 16);
      store<i32>(at, eu[k]); store<i32>(at, n90[k], 4);
      store<i32>(at, n45[k], 8); store<i32>(at, n135[k], 12);
    }
  }
}
fillQuadTable();

/** Where the quad pass keeps its per-domain numbers: 16 bytes per domain id 0..K. */
export function bindQuadAccumulators(acc: usize): void {
  QACC = acc;
}

@inline function addQuadCorner(l: i32, delta: v128): void {
  const p = QACC + (<usize>l << 4);
  v128.store(p, i32x4.add(v128.load(p), delta));
}

/** A non-uniform quad with corners at pixels ia, ib (top) and ic, id (bottom). */
@inline function mixedQuad(code: i32, q: i32, ia: i32, ib: i32, ic: i32, id: i32): void {
  let e = code;
  if (code == 6 || code == 9) {
    let upJoins = RULE == 0;
    if (RULE == 2) upJoins = load<u8>(QM + <usize>q) == 1;
    if (!upJoins) e = code == 6 ? 16 : 17;
  }
  const t = QTAB + (<usize>e << 6);
  addQuadCorner(labelAt(ia), v128.load(t));
  addQuadCorner(labelAt(ib), v128.load(t, 16));
  addQuadCorner(labelAt(ic), v128.load(t, 32));
  addQuadCorner(labelAt(id), v128.load(t, 48));
  bump(HIST, e, 1);
}

/** The quad pass over final labels; see the header. Row changes (N0) come from measureRuns. */
export function measureQuads(): void {
  const w = W, h = H;
  for (let k = 0; k < 18; k++) sti(HIST, k, 0);
  for (let k = 0; k < 5; k++) sti(BORDER, k, 0);
  memory.fill(QACC, 0, <usize>(LASTK + 1) << 4);
  const qh = PY ? h : h - 1;
  const qw = PX ? w : w - 1;
  let down = 0, up = 0; // uniform quads (codes 0 and 15), the bulk of any frame
  const zero = i8x16.splat(0), full = i8x16.splat(15);
  for (let y = 0; y < qh; y++) {
    const r0 = y * w;
    const r1 = (y + 1 == h ? 0 : y + 1) * w;
    const p0 = PH + <usize>r0, p1 = PH + <usize>r1;
    let x = 0;
    // Sixteen quads at a time: code = a | b << 1 | c << 2 | d << 3 per byte lane; uniform
    // lanes are only counted, the others are taken one by one from the lane mask.
    for (; x + 16 < w; x += 16) {
      const o = <usize>x;
      const code = v128.or(
        v128.or(v128.load(p0 + o), i8x16.shl(v128.load(p0 + o, 1), 1)),
        v128.or(i8x16.shl(v128.load(p1 + o), 2), i8x16.shl(v128.load(p1 + o, 1), 3)));
      const m0 = i8x16.bitmask(i8x16.eq(code, zero));
      const m15 = i8x16.bitmask(i8x16.eq(code, full));
      down += <i32>popcnt(m0);
      up += <i32>popcnt(m15);
      let mixed = 0xffff ^ (m0 | m15);
      if (mixed == 0) continue;
      v128.store(LANES, code);
      do {
        const j = <i32>ctz(mixed);
        mixed &= mixed - 1;
        const q = r0 + x + j;
        mixedQuad(<i32>load<u8>(LANES + <usize>j), q, q, q + 1, r1 + x + j, r1 + x + j + 1);
      } while (mixed != 0);
    }
    for (; x < qw; x++) {
      const x1 = x + 1 == w ? 0 : x + 1;
      const code = phaseAt(r0 + x) | (phaseAt(r0 + x1) << 1) |
        (phaseAt(r1 + x) << 2) | (phaseAt(r1 + x1) << 3);
      if (code == 0) { down++; continue; }
      if (code == 15) { up++; continue; }
      mixedQuad(code, r0 + x, r0 + x, r0 + x1, r1 + x, r1 + x1);
    }
  }
  for (let d = 0; d <= LASTK; d++) {
    const p = QACC + (<usize>d << 4);
    sti(D_EULER4, d, load<i32>(p)); sti(D_N90, d, load<i32>(p, 4));
    sti(D_N45, d, load<i32>(p, 8)); sti(D_N135, d, load<i32>(p, 12));
  }
  sti(HIST, 0, down);
  sti(HIST, 15, up);
  // Open sides: the zero-padding quads hold two (or one, at corners) pixels of the frame.
  if (!PY) {
    const pairs = PX ? w : w - 1;
    for (let side = 0; side < 2; side++) {
      const row = side == 0 ? 0 : (h - 1) * w;
      for (let x = 0; x < pairs; x++) {
        const i = row + x, j = row + (x + 1 == w ? 0 : x + 1);
        if (phaseAt(i) != phaseAt(j)) {
          bump(D_EULER4, labelAt(i), 1); bump(D_EULER4, labelAt(j), 1);
          bump(BORDER, 0, 1);
          if (side == 1) bump(BORDER, 3, 1);
        }
      }
    }
  }
  if (!PX) {
    const pairs = PY ? h : h - 1;
    for (let side = 0; side < 2; side++) {
      const col = side == 0 ? 0 : w - 1;
      for (let y = 0; y < pairs; y++) {
        const i = y * w + col, j = (y + 1 == h ? 0 : y + 1) * w + col;
        if (phaseAt(i) != phaseAt(j)) {
          bump(D_EULER4, labelAt(i), 1); bump(D_EULER4, labelAt(j), 1);
          bump(BORDER, 0, 1);
          if (side == 1) { bump(BORDER, 4, 1); bump(D_N90, labelAt(i), 1); bump(D_N90, labelAt(j), 1); }
        }
      }
    }
  }
  if (!PX && !PY) {
    for (let k = 0; k < 4; k++) {
      const i = ((k & 1) != 0 ? w - 1 : 0) + ((k & 2) != 0 ? (h - 1) * w : 0);
      bump(D_EULER4, labelAt(i), 1);
      bump(BORDER, phaseAt(i) == 1 ? 1 : 2, 1);
    }
  }
}
