// Topology-preserving thinning of both phases of the phase map, each inside its own domains.
// Directional border sweeps (N, S, E, W) with an explicit simple-point test (Rosenfeld 1975,
// "A characterization of parallel thinning algorithms", Inf. Control 29:286; Kong & Rosenfeld
// 1989, CVGIP 48:357): candidates are marked in parallel, then deleted one by one after a
// re-check against the current state, so every single deletion is of a simple point and the
// topology of each phase (domain count, holes, winding) is kept exactly. End pixels (one
// neighbour) are never deleted, so branches keep their length. A last pass removes every 2x2
// block of skeleton pixels (strictly 8-thin), by a simple deletion or, where no block pixel is
// simple, by moving the block pixel to a simple neighbour of the same phase.
//
// Connectivity per quad: at a 2x2 quad whose skeleton pixels of phase v sit on one diagonal,
// the pair is adjacent iff joinsDiagonal(v, quad), the rule the labeling used; the background
// of the thinning (the other phase, the image outside, deleted pixels) takes the other choice.
// So the 8-connected phase gives an 8-connected skeleton on a 4-connected background and the
// 4-connected phase a 4-connected (staircase) skeleton on an 8-connected background; with the
// saddle rule the choice is read per quad. One table of 4096 entries covers every rule:
// index bits 0..7 = ring E, NE, N, NW, W, SW, S, SE in the skeleton; bits 8..11 = diagonal
// decisions of the quads NE, NW, SW, SE of the pixel. Entry bit 0 = simple, bit 1 = end.
//
// SK (u8 per pixel): bit 0 = in the skeleton of its own phase, bit 1 = on the work list,
// bit 2 = neighbourhood changed in this sweep, bit 3 / bit 4 = phase down / up, bit 5 = on the
// first or last row or column (EDGE).
// Thinning phase v reads only pixels with PH == v as foreground, so the phases never interact.
import { W, H, PX, PY, PH, RULE, joinsDiagonal } from "./common";

let TABLE: usize = 0; // 4096 u8
let SK: usize = 0;
let LA: usize = 0; // i32 work list (W * H)
let LB2: usize = 0; // i32 candidates (W * H)
let NLIST: i32 = 0;
// Periodic axes narrower than 3 pixels would make a pixel its own neighbour: treated as open.
let WX: bool = false;
let WY: bool = false;

/** Binds the skeleton buffer (u8), the work list and candidate list (i32, W * H each) and a 4096-byte table. */
export function bindThin(sk: usize, list: usize, cand: usize, table: usize): void {
  SK = sk; LA = list; LB2 = cand;
  if (TABLE != table) { TABLE = table; buildTable(); }
}

@inline function ldl(p: usize, k: i32): i32 {
  return load<i32>(p + (<usize>k << 2));
}
@inline function stl(p: usize, k: i32, v: i32): void {
  store<i32>(p + (<usize>k << 2), v);
}

// ---- the simple-point / end table -----------------------------------------------------------

// Static scratch in the data segment (the module's heap belongs to the TS side).
const UF: usize = memory.data(32);
const NB: usize = memory.data(32);

function ufFind(a: i32): i32 {
  while (ldl(UF, a) != a) a = ldl(UF, a);
  return a;
}
function ufJoin(a: i32, b: i32): void {
  const ra = ufFind(a), rb = ufFind(b);
  if (ra != rb) stl(UF, ra, rb);
}

/** Components of the ring set `set` (8 bits) adjacent to the centre; diagonal pairs join where `diag` bits say. */
function adjacentComponents(set: i32, diag: i32): i32 {
  for (let k = 0; k < 8; k++) stl(UF, k, k);
  for (let k = 0; k < 8; k++) {
    const k1 = (k + 1) & 7;
    if (((set >> k) & 1) != 0 && ((set >> k1) & 1) != 0) ufJoin(k, k1);
  }
  // Ring pairs across the centre's quads: (E, N) in NE, (N, W) in NW, (W, S) in SW, (S, E) in SE.
  for (let q = 0; q < 4; q++) {
    const a = q * 2, b = (q * 2 + 2) & 7;
    if (((diag >> q) & 1) != 0 && ((set >> a) & 1) != 0 && ((set >> b) & 1) != 0) ufJoin(a, b);
  }
  let roots = 0; // bitmask of roots adjacent to the centre
  for (let k = 0; k < 8; k++) {
    if (((set >> k) & 1) == 0) continue;
    // 4-neighbours (even k) always touch the centre; the diagonal one of quad q = (k - 1) / 2 if joined.
    if ((k & 1) == 1 && ((diag >> (k >> 1)) & 1) == 0) continue;
    roots |= 1 << ufFind(k);
  }
  return popcnt(roots);
}

function buildTable(): void {
  for (let c = 0; c < 4096; c++) {
    const fg = c & 255, d = c >> 8;
    const bg = 255 ^ fg, nd = 15 ^ d;
    let out = 0;
    if (adjacentComponents(fg, d) == 1 && adjacentComponents(bg, nd) == 1) out |= 1;
    let touching = 0;
    for (let k = 0; k < 8; k++) {
      if (((fg >> k) & 1) == 0) continue;
      if ((k & 1) == 1 && ((d >> (k >> 1)) & 1) == 0) continue;
      touching++;
    }
    if (touching == 1) out |= 2;
    store<u8>(TABLE + <usize>c, <u8>out);
  }
}

// ---- neighbourhoods --------------------------------------------------------------------------

// While thinning, SK also holds the pixel's phase: bit 3 down, bit 4 up (thinStart sets them).
@inline function inSkel(v: i32, j: i32): i32 {
  if (j < 0) return 0;
  const m = 1 | (8 << v);
  return <i32>((<i32>load<u8>(SK + <usize>j) & m) == m);
}

// Neighbour indices of the last `gather` (-1 outside an open side).
let NE_: i32 = 0; let N_: i32 = 0; let NW_: i32 = 0; let W_: i32 = 0;
let SW_: i32 = 0; let S_: i32 = 0; let SE_: i32 = 0; let E_: i32 = 0;

// SK bit 5 marks the pixels of the first and last row and column: only they need the
// wrap-aware (or open-side) neighbour indices; every other pixel has its ring at fixed offsets.
const EDGE: i32 = 32;
// Diagonal decision bits of the table index under a fixed rule, for the phase being thinned.
let DIAG: i32 = 0;

/** Neighbourhood code of pixel i in the skeleton of phase v (table index). */
@inline function gather(v: i32, i: i32): i32 {
  if ((<i32>load<u8>(SK + <usize>i) & EDGE) != 0) return gatherEdge(v, i);
  const w = W;
  E_ = i + 1; NE_ = i - w + 1; N_ = i - w; NW_ = i - w - 1;
  W_ = i - 1; SW_ = i + w - 1; S_ = i + w; SE_ = i + w + 1;
  const m = 1 | (8 << v);
  const p = SK + <usize>i, uw = <usize>w;
  let c = <i32>((<i32>load<u8>(p + 1) & m) == m) |
    (<i32>((<i32>load<u8>(p - uw + 1) & m) == m) << 1) |
    (<i32>((<i32>load<u8>(p - uw) & m) == m) << 2) |
    (<i32>((<i32>load<u8>(p - uw - 1) & m) == m) << 3) |
    (<i32>((<i32>load<u8>(p - 1) & m) == m) << 4) |
    (<i32>((<i32>load<u8>(p + uw - 1) & m) == m) << 5) |
    (<i32>((<i32>load<u8>(p + uw) & m) == m) << 6) |
    (<i32>((<i32>load<u8>(p + uw + 1) & m) == m) << 7);
  if (RULE != 2) return c | DIAG;
  // Quads by top-left corner: NE (x, y-1), NW (x-1, y-1), SW (x-1, y), SE (x, y).
  c |= (<i32>joinsDiagonal(v, i - w) << 8) | (<i32>joinsDiagonal(v, i - w - 1) << 9) |
    (<i32>joinsDiagonal(v, i - 1) << 10) | (<i32>joinsDiagonal(v, i) << 11);
  return c;
}

/** gather for a pixel of the first or last row or column: wrap-aware indices, -1 outside an open side. */
function gatherEdge(v: i32, i: i32): i32 {
  const w = W, h = H;
  const y = i / w, x = i - y * w;
  const xm = x > 0 ? x - 1 : (WX ? w - 1 : -1);
  const xp = x + 1 < w ? x + 1 : (WX ? 0 : -1);
  const ym = y > 0 ? y - 1 : (WY ? h - 1 : -1);
  const yp = y + 1 < h ? y + 1 : (WY ? 0 : -1);
  const rm = ym * w, r0 = y * w, rp = yp * w;
  E_ = xp < 0 ? -1 : r0 + xp;
  NE_ = xp < 0 || ym < 0 ? -1 : rm + xp;
  N_ = ym < 0 ? -1 : rm + x;
  NW_ = xm < 0 || ym < 0 ? -1 : rm + xm;
  W_ = xm < 0 ? -1 : r0 + xm;
  SW_ = xm < 0 || yp < 0 ? -1 : rp + xm;
  S_ = yp < 0 ? -1 : rp + x;
  SE_ = xp < 0 || yp < 0 ? -1 : rp + xp;
  let c = inSkel(v, E_) | (inSkel(v, NE_) << 1) | (inSkel(v, N_) << 2) | (inSkel(v, NW_) << 3) |
    (inSkel(v, W_) << 4) | (inSkel(v, SW_) << 5) | (inSkel(v, S_) << 6) | (inSkel(v, SE_) << 7);
  // Where a quad leaves an open side its decision never matters (it cannot hold a diagonal
  // skeleton pair).
  if (RULE != 2) return c | DIAG;
  const qx0 = xm < 0 ? x : xm, qy0 = ym < 0 ? y : ym;
  const dNE = <i32>joinsDiagonal(v, qy0 * w + x);
  const dNW = <i32>joinsDiagonal(v, qy0 * w + qx0);
  const dSW = <i32>joinsDiagonal(v, r0 + qx0);
  const dSE = <i32>joinsDiagonal(v, r0 + x);
  c |= (dNE << 8) | (dNW << 9) | (dSW << 10) | (dSE << 11);
  return c;
}

/** Sets EDGE on the pixels of the first and last row and column. */
function markRimEdge(): void {
  const w = W, h = H;
  for (let x = 0; x < w; x++) {
    store<u8>(SK + <usize>x, load<u8>(SK + <usize>x) | EDGE);
    const j = (h - 1) * w + x;
    store<u8>(SK + <usize>j, load<u8>(SK + <usize>j) | EDGE);
  }
  for (let y = 0; y < h; y++) {
    const a = y * w, b = a + w - 1;
    store<u8>(SK + <usize>a, load<u8>(SK + <usize>a) | EDGE);
    store<u8>(SK + <usize>b, load<u8>(SK + <usize>b) | EDGE);
  }
}

/** SK of every pixel at the start: in the skeleton, its phase (bit 3 down, bit 4 up), EDGE on the frame's rim. */
function initSkeleton(): void {
  const w = W, h = H, n = w * h;
  for (let i = 0; i < n; i++) store<u8>(SK + <usize>i, <u8>(1 | (<i32>load<u8>(PH + <usize>i) != 0 ? 16 : 8)));
  markRimEdge();
}

// SK bit 6 marks the pixels of either phase with a 4-neighbour of the other phase or outside an
// open side (set once per frame by markBorder, before any deletion).
const BORDER: i32 = 64;

/** Sets BORDER on the first border of both phases: 4-neighbour of the other phase or beyond an open side. */
function markBorder(): void {
  const w = W, h = H, uw = <usize>w;
  for (let y = 1; y < h - 1; y++) {
    const r = y * w;
    for (let i = r + 1, e = r + w - 1; i < e; i++) {
      const p = PH + <usize>i;
      const c = <i32>load<u8>(p);
      const d = (<i32>load<u8>(p - 1) ^ c) | (<i32>load<u8>(p + 1) ^ c) |
        (<i32>load<u8>(p - uw) ^ c) | (<i32>load<u8>(p + uw) ^ c);
      if (d != 0) store<u8>(SK + <usize>i, <u8>(<i32>load<u8>(SK + <usize>i) | BORDER));
    }
  }
  for (let x = 0; x < w; x++) { markRim(x); markRim((h - 1) * w + x); }
  for (let y = 0; y < h; y++) { markRim(y * w); markRim(y * w + w - 1); }
}

function markRim(i: i32): void {
  const s = <i32>load<u8>(SK + <usize>i);
  const v = (s & 16) != 0 ? 1 : 0;
  if ((gatherEdge(v, i) & 0x55) != 0x55) store<u8>(SK + <usize>i, <u8>(s | BORDER));
}

@inline function entry(code: i32): i32 {
  return <i32>load<u8>(TABLE + <usize>code);
}

// SK bit 7 (DIRTY): a neighbour left the skeleton since the last directional marking scan.
const DIRTY: i32 = 128;

@inline function enlist(j: i32): void {
  const s = <i32>load<u8>(SK + <usize>j);
  store<u8>(SK + <usize>j, <u8>(s | 6 | DIRTY)); // listed, touched, dirty
  if ((s & 2) == 0) {
    stl(LA, NLIST, j);
    NLIST++;
  }
}

/** Puts the skeleton neighbours of the last gathered pixel on the work list. */
function enlistNeighbours(v: i32): void {
  if (inSkel(v, E_)) enlist(E_);
  if (inSkel(v, NE_)) enlist(NE_);
  if (inSkel(v, N_)) enlist(N_);
  if (inSkel(v, NW_)) enlist(NW_);
  if (inSkel(v, W_)) enlist(W_);
  if (inSkel(v, SW_)) enlist(SW_);
  if (inSkel(v, S_)) enlist(S_);
  if (inSkel(v, SE_)) enlist(SE_);
}

/** enlistNeighbours for a pixel off the rim: the ring at fixed offsets, same order. */
@inline function enlistRing(m: i32, i: i32, w: i32): void {
  if ((<i32>load<u8>(SK + <usize>(i + 1)) & m) == m) enlist(i + 1);
  if ((<i32>load<u8>(SK + <usize>(i - w + 1)) & m) == m) enlist(i - w + 1);
  if ((<i32>load<u8>(SK + <usize>(i - w)) & m) == m) enlist(i - w);
  if ((<i32>load<u8>(SK + <usize>(i - w - 1)) & m) == m) enlist(i - w - 1);
  if ((<i32>load<u8>(SK + <usize>(i - 1)) & m) == m) enlist(i - 1);
  if ((<i32>load<u8>(SK + <usize>(i + w - 1)) & m) == m) enlist(i + w - 1);
  if ((<i32>load<u8>(SK + <usize>(i + w)) & m) == m) enlist(i + w);
  if ((<i32>load<u8>(SK + <usize>(i + w + 1)) & m) == m) enlist(i + w + 1);
}

@inline function setSkel(j: i32, on: bool): void {
  const s = <i32>load<u8>(SK + <usize>j);
  store<u8>(SK + <usize>j, <u8>(on ? s | 1 : s & ~1));
}

/**
 * Drops list entries that left the skeleton and, with `settled`, those whose neighbourhood did
 * not change during the sweep: they were tested in all four directions against the same
 * neighbourhood, so they can only become deletable after a neighbour goes (which lists them again).
 */
function compactList(settled: bool): void {
  let k = 0;
  for (let j = 0; j < NLIST; j++) {
    const i = ldl(LA, j);
    const s = <i32>load<u8>(SK + <usize>i);
    if ((s & 1) != 0 && (!settled || (s & 4) != 0)) { stl(LA, k, i); k++; store<u8>(SK + <usize>i, <u8>(s & ~(4 | DIRTY))); }
    else store<u8>(SK + <usize>i, <u8>(s & ~(6 | DIRTY)));
  }
  NLIST = k;
}

/** Lists every skeleton pixel of phase v. */
function listAll(v: i32): void {
  const n = W * H;
  for (let j = 0; j < NLIST; j++) {
    const i = ldl(LA, j);
    store<u8>(SK + <usize>i, <u8>(<i32>load<u8>(SK + <usize>i) & ~6));
  }
  NLIST = 0;
  for (let i = 0; i < n; i++) if (inSkel(v, i)) enlist(i);
}

/** Sequential deletion of simple non-end pixels over the work list until none is left. */
function sweepSequential(v: i32): i32 {
  let removed = 0;
  let again = true;
  while (again) {
    again = false;
    for (let j = 0; j < NLIST; j++) {
      const i = ldl(LA, j);
      if (!inSkel(v, i)) continue;
      const e = entry(gather(v, i));
      if (e == 1) { setSkel(i, false); removed++; again = true; enlistNeighbours(v); }
    }
  }
  return removed;
}

@inline function blockAt(v: i32, i: i32): bool {
  // 2x2 block with top-left i (wrapping where periodic); false where it leaves an open side.
  const w = W, h = H;
  if ((<i32>load<u8>(SK + <usize>i) & EDGE) == 0) {
    const m = 1 | (8 << v);
    return (<i32>load<u8>(SK + <usize>i) & m) == m && (<i32>load<u8>(SK + <usize>(i + 1)) & m) == m &&
      (<i32>load<u8>(SK + <usize>(i + w)) & m) == m && (<i32>load<u8>(SK + <usize>(i + w + 1)) & m) == m;
  }
  const y = i / w, x = i - y * w;
  const xp = x + 1 < w ? x + 1 : (WX ? 0 : -1);
  const yp = y + 1 < h ? y + 1 : (WY ? 0 : -1);
  if (xp < 0 || yp < 0) return false;
  return inSkel(v, i) != 0 && inSkel(v, y * w + xp) != 0 && inSkel(v, yp * w + x) != 0 &&
    inSkel(v, yp * w + xp) != 0;
}

/** Whether pixel j lies in any 2x2 skeleton block. */
function inAnyBlock(v: i32, j: i32): bool {
  gather(v, j);
  const n = N_, nw = NW_, ww = W_;
  if (blockAt(v, j)) return true;
  if (ww >= 0 && blockAt(v, ww)) return true;
  if (n >= 0 && blockAt(v, n)) return true;
  if (nw >= 0 && blockAt(v, nw)) return true;
  return false;
}

/** Tries to remove pixel p of a block by moving it to a simple neighbour q of the same phase. */
function moveOut(v: i32, p: i32): bool {
  gather(v, p);
  stl(NB, 0, E_); stl(NB, 1, NE_); stl(NB, 2, N_); stl(NB, 3, NW_);
  stl(NB, 4, W_); stl(NB, 5, SW_); stl(NB, 6, S_); stl(NB, 7, SE_);
  for (let k = 0; k < 8; k++) {
    const q = ldl(NB, k);
    if (q < 0 || <i32>load<u8>(PH + <usize>q) != v || inSkel(v, q)) continue;
    if ((entry(gather(v, q)) & 1) == 0) continue; // adding q must itself be simple
    setSkel(q, true);
    if (entry(gather(v, p)) == 1) {
      setSkel(p, false);
      if (!inAnyBlock(v, q)) {
        enlist(q);
        gather(v, p);
        enlistNeighbours(v);
        return true;
      }
      setSkel(p, true);
    }
    setSkel(q, false);
  }
  return false;
}

/** Removes 2x2 blocks of the skeleton of phase v. Returns the number of blocks left. */
function breakBlocks(v: i32): i32 {
  let left = 0;
  for (let round = 0; round < 4; round++) {
    left = 0;
    let fixed = 0;
    const n = NLIST;
    for (let j = 0; j < n; j++) {
      const i = ldl(LA, j);
      if (!blockAt(v, i)) continue;
      const w = W, h = H;
      const y = i / w, x = i - y * w;
      const xp = x + 1 < w ? x + 1 : 0, yp = y + 1 < h ? y + 1 : 0;
      const b1 = y * w + xp, b2 = yp * w + x, b3 = yp * w + xp;
      let done = false;
      // A simple block pixel goes first (any simple pixel of a block has >= 2 neighbours).
      if (entry(gather(v, i)) == 1) { setSkel(i, false); enlistNeighbours(v); done = true; }
      else if (entry(gather(v, b1)) == 1) { setSkel(b1, false); enlistNeighbours(v); done = true; }
      else if (entry(gather(v, b2)) == 1) { setSkel(b2, false); enlistNeighbours(v); done = true; }
      else if (entry(gather(v, b3)) == 1) { setSkel(b3, false); enlistNeighbours(v); done = true; }
      else done = moveOut(v, i) || moveOut(v, b1) || moveOut(v, b2) || moveOut(v, b3);
      if (done) fixed++; else left++;
    }
    sweepSequential(v);
    if (fixed == 0) break;
  }
  return left;
}

/**
 * Thins the phase-v pixels of the frame (PH, geometry from setGeometry). Call thinPhase(1) first
 * (it fills SK), then thinPhase(0), then thinFinish. Returns the number of 2x2 blocks that could not be broken (0 in every case measured).
 */
export function thinPhase(v: i32): i32 {
  const w = W, h = H, n = w * h;
  WX = PX && w >= 3;
  WY = PY && h >= 3;
  NLIST = 0;
  DIAG = joinsDiagonal(v, 0) ? 0xf00 : 0;
  if (v == 1) { initSkeleton(); markBorder(); }
  // Initial border: phase-v pixels with a 4-neighbour outside the skeleton (BORDER, raster order).
  const bm = BORDER | (8 << v);
  for (let i = 0; i < n; i++) {
    if ((<i32>load<u8>(SK + <usize>i) & bm) == bm) { stl(LA, NLIST, i); NLIST++; }
  }
  // Directional sweeps: N (bit 2), S (bit 6), E (bit 0), W (bit 4) border pixels in turn.
  let changed = true;
  while (changed) {
    changed = false;
    for (let dir = 0; dir < 4; dir++) {
      const bit = dir == 0 ? 4 : dir == 1 ? 64 : dir == 2 ? 1 : 16;
      // The neighbour on the swept side must be outside the skeleton: read that one byte
      // before the whole neighbourhood (rim pixels take the wrap-aware gather).
      const off = dir == 0 ? -w : dir == 1 ? w : dir == 2 ? 1 : -1;
      const sm = 1 | (8 << v);
      let nc = 0;
      const m = NLIST;
      for (let j = 0; j < m; j++) {
        const i = ldl(LA, j);
        let s = <i32>load<u8>(SK + <usize>i);
        if ((s & DIRTY) != 0) { s &= ~DIRTY; store<u8>(SK + <usize>i, <u8>s); }
        if ((s & sm) != sm) continue;
        if ((s & EDGE) == 0 && (<i32>load<u8>(SK + <usize>(i + off)) & sm) == sm) continue;
        const c = gather(v, i);
        if ((c & bit) == 0 && entry(c) == 1) { stl(LB2, nc, i); nc++; }
      }
      // Every pixel whose ring lost a pixel since the marking scan carries DIRTY (all such
      // pixels are listed, and the scan cleared the bit): the others are still deletable as
      // marked, and only need their ring's indices for listing.
      for (let k = 0; k < nc; k++) {
        const i = ldl(LB2, k);
        const s = <i32>load<u8>(SK + <usize>i);
        if ((s & (DIRTY | EDGE)) == 0) {
          store<u8>(SK + <usize>i, <u8>(s & ~1));
          changed = true;
          enlistRing(sm, i, w);
          continue;
        }
        const c = gather(v, i);
        if ((c & bit) == 0 && entry(c) == 1) {
          setSkel(i, false);
          changed = true;
          enlistNeighbours(v);
        }
      }
    }
    compactList(true);
  }
  // Simple pixels with no 4-neighbour outside (possible for a 4-connected skeleton), then blocks.
  listAll(v);
  sweepSequential(v);
  compactList(false);
  const left = breakBlocks(v);
  compactList(false);
  return left;
}

/** Clears the work bits of SK, leaving 1 on skeleton pixels (call after both phases, up first). */
export function thinFinish(n: i32): void {
  const one = i8x16.splat(1);
  let i = 0;
  for (; i + 16 <= n; i += 16) v128.store(SK + <usize>i, v128.and(v128.load(SK + <usize>i), one));
  for (; i < n; i++) store<u8>(SK + <usize>i, <u8>(<i32>load<u8>(SK + <usize>i) & 1));
}

/**
 * Distance-ordered thinning of both phases (Pudney 1998, CVIU 72:404): every pixel is tested
 * once, in order of increasing distance to the other phase (half-pixel levels, raster order
 * within a level), and deleted when simple and not an end; then the sequential sweep and the
 * block pass of `thinPhase` finish each phase. Same guarantees, about one neighbourhood test
 * per pixel instead of one per pixel and sweep. `dist` is the f32 distance map
 * (distancePhases), `counts` i32 scratch of `levels + 1` entries. Returns the blocks left.
 */
export function thinByDistance(dist: usize, counts: usize, levels: i32): i32 {
  const w = W, h = H, n = w * h;
  WX = PX && w >= 3;
  WY = PY && h >= 3;
  initSkeleton();
  // Counting sort of the pixels by level into LB2.
  memory.fill(counts, 0, <usize>(levels + 1) << 2);
  const top = levels - 1;
  for (let i = 0; i < n; i++) {
    let l = <i32>(load<f32>(dist + (<usize>i << 2)) * 2);
    if (l > top) l = top;
    stl(counts, l + 1, ldl(counts, l + 1) + 1);
  }
  for (let l = 1; l <= levels; l++) stl(counts, l, ldl(counts, l) + ldl(counts, l - 1));
  for (let i = 0; i < n; i++) {
    let l = <i32>(load<f32>(dist + (<usize>i << 2)) * 2);
    if (l > top) l = top;
    const k = ldl(counts, l);
    stl(LB2, k, i);
    stl(counts, l, k + 1);
  }
  const d1 = joinsDiagonal(1, 0) ? 0xf00 : 0, d0 = joinsDiagonal(0, 0) ? 0xf00 : 0;
  for (let k = 0; k < n; k++) {
    const i = ldl(LB2, k);
    const v = <i32>load<u8>(PH + <usize>i) != 0 ? 1 : 0;
    DIAG = v == 1 ? d1 : d0;
    if (entry(gather(v, i)) == 1) setSkel(i, false);
  }
  let left = 0;
  NLIST = 0;
  for (let v = 1; v >= 0; v--) {
    DIAG = v == 1 ? d1 : d0;
    listAll(v);
    sweepSequential(v);
    compactList(false);
    left += breakBlocks(v);
    compactList(false);
  }
  return left;
}

// ---- bit-parallel directional thinning (fixed rules) ------------------------------------------
//
// Under the fixed rules (one phase 8-connected, the other 4-connected) the directional sweeps run
// on bit planes, 128 pixels an operation: in a pass with side d (N, S, E, W), every skeleton pixel
// of the phase whose d-neighbour is outside, that is simple and not an end, is deleted at once.
// The simple-point test is Yokoi's connectivity number (Yokoi, Toriwaki & Fukumura 1975, CGIP
// 4:63): with the ring x0..x7 = E, NE, N, NW, W, SW, S, SE, an 8-connected pixel is simple iff
// the sum over k = 0, 2, 4, 6 of !x_k & (x_{k+1} | x_{k+2}) is 1, a 4-connected pixel iff the sum
// of x_k & !(x_{k+1} & x_{k+2}) is 1 (the same answers as the 4096-entry table above for all 256
// rings; tested). Deleting all such border pixels of one side at once keeps the topology
// (Rosenfeld 1975; with Ronse's minimal non-simple sets, 1988, it is enough that every 8-adjacent
// pair and every subset of a 2x2 square of candidates can be deleted one after the other, which
// holds for all 2^16 configurations of a 4x4 window, both connectivities and all four sides:
// tested exhaustively in test/skeleton/thin-bits.test.ts). The result does not depend on a raster
// order, so it is exactly invariant under cyclic shifts of a periodic frame.
// A 4-connected pixel can be simple with all four 4-neighbours inside; those go in subfield
// passes (the classes of (x mod 2, y mod 2): no two pixels of a class are neighbours, so deleting
// a class at once is deleting it one by one), alternated with the sweeps until both are stable.
// Rows whose neighbourhood did not change since the last pass of the same side are skipped.
// 2x2 blocks left at the end go to breakBlocks above, on the byte map.

let WW: i32 = 0; // words holding pixels
let WP: i32 = 0; // words per row (even: rows are whole v128 pairs)
let RB: usize = 0; // bytes per row
let PLANE1: usize = 0;
let PLANE0: usize = 0;
let RS: usize = 0; // bytes per row of a plane: the row, its E shift, its W shift (3 RB)
let PREV: usize = 0; // the row above as it was before this pass changed it (3 RB)
let ZSLOT: usize = 0; // the row beyond an open side (3 RB of zeros)
let ROW0: usize = 0; // row 0 before the pass (periodic y; 3 RB)
let DBUF: usize = 0;
let CHG: usize = 0; // pass number of each row's last deletion (i32)
// Pass number at which each side was last evaluated (-1: not since the plane started).
const LASTD: usize = memory.data(16);
// EXPAND[b]: the 8 bits of b as 8 bytes 0/1 (u64, little-endian).
const EXPAND: usize = memory.data(256 * 8);
let expandReady: bool = false;
let flagsReady: bool = false;

@inline function ldw(r: usize, k: i32): u64 {
  return load<u64>(r + (<usize>k << 3));
}
@inline function ldc(y: i32): i32 {
  return load<i32>(CHG + (<usize>y << 2));
}
@inline function lastd(d: i32): i32 {
  return load<i32>(LASTD + (<usize>d << 2));
}

/** Writes the E and W shifts of the row at `slot` (bit x = pixel x + 1, x - 1) after it. */
function fillShifts(slot: usize): void {
  const rb = RB, wp = WP, e = slot + rb, wv = slot + 2 * rb;
  for (let k = 0; k < wp; k += 2) {
    const off = <usize>k << 3;
    const a = v128.load(slot + off);
    const nx = v128.load(slot + off + 8); // words k + 1, k + 2 (the last pair's is fixed below)
    const pv = v128.load(slot + off - 8); // words k - 1, k (the first pair's is fixed below)
    v128.store(e + off, v128.or(i64x2.shr_u(a, 1), i64x2.shl(nx, 63)));
    v128.store(wv + off, v128.or(i64x2.shl(a, 1), i64x2.shr_u(pv, 63)));
  }
  // The last word of pixels and the first: no word beyond; the wrap on a periodic x axis.
  const last = WW - 1, top = <u64>((W - 1) & 63);
  let el = ldw(slot, last) >> 1;
  if (WX) el |= (ldw(slot, 0) & 1) << top;
  store<u64>(e + (<usize>last << 3), el);
  let w0 = ldw(slot, 0) << 1;
  if (WX) w0 |= (ldw(slot, last) >> top) & 1;
  store<u64>(wv, w0);
}

@inline function copyRow3(dst: usize, src: usize): void {
  for (let o: usize = 0, e = RS; o < e; o += 16) v128.store(dst + o, v128.load(src + o));
}

/**
 * One parallel pass over `plane` (t = pass number, for skipping rows): mode 0..3 deletes N, S, E,
 * W border pixels, mode 4 the pixels of subfield (x mod 2 = sx, y mod 2 = sy) with no side
 * condition. Returns whether a pixel went.
 */
function bitPass(plane: usize, eight: bool, mode: i32, t: i32, sx: i32, sy: i32): bool {
  const h = H, wp = WP, rb = RB, rs = RS;
  if (WY) copyRow3(ROW0, plane);
  let prevChanged = false;
  const ones = i64x2.splat(-1), zero = i64x2.splat(0);
  const sub = mode < 4 ? ones : i64x2.splat(sx != 0 ? <i64>0xaaaaaaaaaaaaaaaa : <i64>0x5555555555555555);
  const since = mode < 4 ? lastd(mode) : -1;
  let any = false;
  for (let y = 0; y < h; y++) {
    if (mode == 4) { if ((y & 1) != sy) continue; }
    else if (since >= 0) {
      let m = ldc(y);
      if (y > 0) m = max(m, ldc(y - 1)); else if (WY) m = max(m, ldc(h - 1));
      if (y + 1 < h) m = max(m, ldc(y + 1)); else if (WY) m = max(m, ldc(0));
      if (m < since) { prevChanged = false; continue; }
    }
    // Rows as they were before the pass: the one above from PREV if this pass changed it.
    const c = plane + <usize>y * rs;
    const u = y > 0 ? (prevChanged ? PREV : c - rs) : (WY ? plane + <usize>(h - 1) * rs : ZSLOT);
    const d = y + 1 < h ? c + rs : (WY ? ROW0 : ZSLOT);
    const ue = u + rb, uw = u + 2 * rb, ce = c + rb, cw = c + 2 * rb, de = d + rb, dw = d + 2 * rb;
    // The neighbour on the pass's side (N: the row above, S: below, E / W: the row's shifts);
    // a subfield pass has no side (the zero row).
    const side = mode == 0 ? u : mode == 1 ? d : mode == 2 ? ce : mode == 3 ? cw : ZSLOT;
    let acc = zero;
    for (let k = 0; k < wp; k += 2) {
      const off = <usize>k << 3;
      const cc = v128.load(c + off);
      let dk = zero;
      if (v128.any_true(cc)) {
        const x0 = v128.load(ce + off), x1 = v128.load(ue + off), x2 = v128.load(u + off), x3 = v128.load(uw + off);
        const x4 = v128.load(cw + off), x5 = v128.load(dw + off), x6 = v128.load(d + off), x7 = v128.load(de + off);
        let t0: v128, t2: v128, t4: v128, t6: v128, one: v128, two: v128;
        if (eight) {
          t0 = v128.andnot(v128.or(x1, x2), x0); t2 = v128.andnot(v128.or(x3, x4), x2);
          t4 = v128.andnot(v128.or(x5, x6), x4); t6 = v128.andnot(v128.or(x7, x0), x6);
          // End: exactly one of the eight ring pixels.
          one = x0; two = zero;
          two = v128.or(two, v128.and(one, x1)); one = v128.or(one, x1);
          two = v128.or(two, v128.and(one, x2)); one = v128.or(one, x2);
          two = v128.or(two, v128.and(one, x3)); one = v128.or(one, x3);
          two = v128.or(two, v128.and(one, x4)); one = v128.or(one, x4);
          two = v128.or(two, v128.and(one, x5)); one = v128.or(one, x5);
          two = v128.or(two, v128.and(one, x6)); one = v128.or(one, x6);
          two = v128.or(two, v128.and(one, x7)); one = v128.or(one, x7);
        } else {
          t0 = v128.andnot(x0, v128.and(x1, x2)); t2 = v128.andnot(x2, v128.and(x3, x4));
          t4 = v128.andnot(x4, v128.and(x5, x6)); t6 = v128.andnot(x6, v128.and(x7, x0));
          // End: exactly one of the four 4-neighbours.
          one = x0; two = zero;
          two = v128.or(two, v128.and(one, x2)); one = v128.or(one, x2);
          two = v128.or(two, v128.and(one, x4)); one = v128.or(one, x4);
          two = v128.or(two, v128.and(one, x6)); one = v128.or(one, x6);
        }
        const a = v128.or(t0, t2), b = v128.or(t4, t6);
        const multi = v128.or(v128.or(v128.and(t0, t2), v128.and(t4, t6)), v128.and(a, b));
        const simple = v128.andnot(v128.or(a, b), multi);
        const end = v128.andnot(one, two);
        dk = v128.andnot(v128.and(v128.and(cc, sub), v128.andnot(simple, end)), v128.load(side + off));
      }
      v128.store(DBUF + off, dk);
      acc = v128.or(acc, dk);
    }
    prevChanged = false;
    if (v128.any_true(acc)) {
      copyRow3(PREV, c);
      prevChanged = true;
      const r = c;
      for (let k = 0; k < wp; k += 2) {
        const off = <usize>k << 3;
        v128.store(r + off, v128.andnot(v128.load(r + off), v128.load(DBUF + off)));
      }
      fillShifts(r);
      store<i32>(CHG + (<usize>y << 2), t);
      any = true;
    }
  }
  return any;
}

/** Passes N, S, E, W, ... until every side has run once after the last deletion; returns the next pass number. */
function sweepBits(plane: usize, eight: bool, t0: i32): i32 {
  let t = t0, lastChange = t0 - 1;
  while (true) {
    let done = true;
    for (let d = 0; d < 4; d++) if (lastd(d) <= lastChange) done = false;
    if (done) break;
    const d = t & 3;
    if (bitPass(plane, eight, d, t, 0, 0)) lastChange = t;
    store<i32>(LASTD + (<usize>d << 2), t);
    t++;
  }
  return t;
}

function thinPlane(plane: usize, eight: bool): void {
  const h = H;
  for (let y = 0; y < h; y++) store<i32>(CHG + (<usize>y << 2), -1);
  for (let d = 0; d < 4; d++) store<i32>(LASTD + (<usize>d << 2), -1);
  let t = sweepBits(plane, eight, 0);
  if (eight) return; // an 8-connected pixel with all four 4-neighbours inside is never simple
  while (true) {
    let changed = false;
    for (let s = 0; s < 4; s++) if (bitPass(plane, false, 4, t, s & 1, s >> 1)) changed = true;
    if (!changed) break;
    // The rows the subfield passes changed (CHG = t) are looked at again by every side.
    t = sweepBits(plane, false, t + 1);
  }
}

/** Lists the top-left pixels of the 2x2 blocks of `plane` (phase v) on the work list; returns how many. */
function listBlocks(plane: usize): i32 {
  const h = H, w = W, ww = WW, rb = RB, rs = RS;
  NLIST = 0;
  for (let y = 0; y < h; y++) {
    if (y + 1 >= h && !WY) break;
    const c = plane + <usize>y * rs;
    const d = y + 1 < h ? c + rs : plane;
    for (let k = 0; k < ww; k++) {
      let b = ldw(c, k) & ldw(c + rb, k) & ldw(d, k) & ldw(d + rb, k);
      while (b != 0) {
        const x = (k << 6) + <i32>ctz(b);
        b &= b - 1;
        if (x >= w) continue;
        const i = y * w + x;
        stl(LA, NLIST, i);
        NLIST++;
        store<u8>(SK + <usize>i, <u8>(<i32>load<u8>(SK + <usize>i) | 2));
      }
    }
  }
  return NLIST;
}

/** SK bits 3 / 4 (phase) and EDGE, as initSkeleton sets them, on the thinned byte map. */
function setFlags(): void {
  const w = W, h = H, n = w * h;
  const eight = i8x16.splat(8);
  let i = 0;
  for (; i + 16 <= n; i += 16) {
    const s = v128.load(SK + <usize>i), p = v128.load(PH + <usize>i);
    // phase 1 -> 16, phase 0 -> 8 (PH is 0 or 1).
    v128.store(SK + <usize>i, v128.or(v128.and(s, i8x16.splat(~(8 | 16))), i8x16.add(eight, i8x16.shl(p, 3))));
  }
  for (; i < n; i++) store<u8>(SK + <usize>i, <u8>((<i32>load<u8>(SK + <usize>i) & ~24) | (load<u8>(PH + <usize>i) != 0 ? 16 : 8)));
  markRimEdge();
  flagsReady = true;
}

/** Bytes of `work` thinBits needs for a W x H frame. */
export function thinBitsBytes(w: i32, h: i32): i32 {
  const rb = ((((w + 63) >> 6) + 1) >> 1) << 4;
  return 6 * h * rb + 13 * rb + 4 * h + 96;
}

/**
 * Thins both phases under a fixed rule (RULE 0 or 1) on bit planes carved from `work`
 * (thinBitsBytes, 16-byte aligned). Leaves SK as thinFinish does. Returns the 2x2 blocks left.
 */
export function thinBits(work: usize): i32 {
  const w = W, h = H, n = w * h;
  WX = PX && w >= 3;
  WY = PY && h >= 3;
  WW = (w + 63) >> 6;
  WP = (WW + 1) & ~1;
  RB = <usize>WP << 3;
  RS = 3 * RB;
  const planeBytes = <usize>h * RS;
  PLANE1 = work + 16; PLANE0 = PLANE1 + planeBytes; // (16 bytes before: the first row's word -1 is read)
  PREV = PLANE0 + planeBytes; ZSLOT = PREV + RS; ROW0 = ZSLOT + RS; DBUF = ROW0 + RS;
  CHG = DBUF + RB;
  memory.fill(ZSLOT, 0, 3 * RB);
  if (!expandReady) {
    for (let b = 0; b < 256; b++) {
      let e: u64 = 0;
      for (let j = 0; j < 8; j++) if (((b >> j) & 1) != 0) e |= (<u64>1) << (<u64>(j << 3));
      store<u64>(EXPAND + (<usize>b << 3), e);
    }
    expandReady = true;
  }
  // Phase map -> planes (bit x of a row's words = pixel x; bits past the row stay 0).
  for (let y = 0; y < h; y++) {
    const src = PH + <usize>(y * w);
    const r1 = PLANE1 + <usize>y * RS, r0 = PLANE0 + <usize>y * RS;
    store<u64>(r1 + RB - 8, 0); store<u64>(r0 + RB - 8, 0);
    for (let k = 0; k < WW; k++) {
      const x0 = k << 6;
      const cnt = min(64, w - x0);
      let bits: u64 = 0;
      if (cnt == 64) {
        const z = i8x16.splat(0);
        const p = src + <usize>x0;
        bits = <u64>i8x16.bitmask(i8x16.ne(v128.load(p), z)) |
          (<u64>i8x16.bitmask(i8x16.ne(v128.load(p, 16), z)) << 16) |
          (<u64>i8x16.bitmask(i8x16.ne(v128.load(p, 32), z)) << 32) |
          (<u64>i8x16.bitmask(i8x16.ne(v128.load(p, 48), z)) << 48);
        store<u64>(r1 + (<usize>k << 3), bits);
        store<u64>(r0 + (<usize>k << 3), ~bits);
      } else {
        for (let j = 0; j < cnt; j++) if (load<u8>(src + <usize>(x0 + j)) != 0) bits |= (<u64>1) << <u64>j;
        const mask = ((<u64>1) << <u64>cnt) - 1;
        store<u64>(r1 + (<usize>k << 3), bits);
        store<u64>(r0 + (<usize>k << 3), ~bits & mask);
      }
    }
  }
  for (let y = 0; y < h; y++) { fillShifts(PLANE1 + <usize>y * RS); fillShifts(PLANE0 + <usize>y * RS); }
  const eight1 = joinsDiagonal(1, 0);
  thinPlane(PLANE1, eight1);
  thinPlane(PLANE0, !eight1);
  // Planes -> SK bytes (1 on the skeleton).
  for (let y = 0; y < h; y++) {
    const r1 = PLANE1 + <usize>y * RS, r0 = PLANE0 + <usize>y * RS;
    const dst = SK + <usize>(y * w);
    for (let k = 0; k < WW; k++) {
      const bits = ldw(r1, k) | ldw(r0, k);
      const x0 = k << 6;
      const cnt = min(64, w - x0);
      const p = dst + <usize>x0;
      if (cnt == 64) {
        for (let j = 0; j < 8; j++) {
          store<u64>(p + <usize>(j << 3), load<u64>(EXPAND + (<usize>((bits >> <u64>(j << 3)) & 0xff) << 3)));
        }
      } else {
        for (let j = 0; j < cnt; j++) store<u8>(p + <usize>j, <u8>((bits >> <u64>j) & 1));
      }
    }
  }
  // 2x2 blocks: on the byte map with the phase bits, as the list-based thinning breaks them.
  let left = 0;
  for (let v = 1; v >= 0; v--) {
    if (listBlocks(v == 1 ? PLANE1 : PLANE0) == 0) continue;
    if (!flagsReady) setFlags();
    DIAG = joinsDiagonal(v, 0) ? 0xf00 : 0;
    left += breakBlocks(v);
    compactList(false);
  }
  if (flagsReady) { flagsReady = false; thinFinish(n); }
  return left;
}

/** Bytes at p: 0 stays 0, anything else becomes 1 (a phase map handed in with other values). */
export function binarize(p: usize, n: i32): void {
  const one = i8x16.splat(1);
  let i = 0;
  for (; i + 16 <= n; i += 16) v128.store(p + <usize>i, i8x16.min_u(v128.load(p + <usize>i), one));
  for (; i < n; i++) if (load<u8>(p + <usize>i) != 0) store<u8>(p + <usize>i, 1);
}
