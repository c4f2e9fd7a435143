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

/** SK of every pixel at the start: in the skeleton, its phase (bit 3 down, bit 4 up), EDGE on the frame's rim. */
function initSkeleton(): void {
  const w = W, h = H, n = w * h;
  for (let i = 0; i < n; i++) store<u8>(SK + <usize>i, <u8>(1 | (<i32>load<u8>(PH + <usize>i) != 0 ? 16 : 8)));
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
  for (let i = 0; i < n; i++) {
    store<u8>(SK + <usize>i, <u8>(<i32>load<u8>(SK + <usize>i) & 1));
  }
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
