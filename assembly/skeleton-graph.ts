// Pixel adjacency of a thinned frame, the input of the skeleton graph (src/topology/skeleton.ts).
// Pixels are adjacent as the domain's phase is connected: 4-neighbours always, a diagonal pair
// where joinsDiagonal holds for its quad. For every skeleton pixel i (raster order) the kernel
// lists its skeleton neighbours of the same phase in the order E, N, W, S, NE, NW, SW, SE, each
// as 8 j + direction (direction codes in that order, 0..7), at nbr[8 i .. 8 i + deg - 1];
// deg (u8) is 0 off the skeleton. Each slot is written and kept only where the neighbour is
// there (d advances by 0 or 1), so the inner code has no data-dependent branch. The skeleton pixels themselves go to `list` in raster order.
import { W, H, PX, PY, PH, RULE, joinsDiagonal, ldi, sti, ldf, stf } from "./common";

@inline function skAt(sk: usize, j: i32, v: i32): i32 {
  return <i32>(load<u8>(sk + <usize>j) != 0) & <i32>(<i32>load<u8>(PH + <usize>j) == v);
}

/** Fills nbr (i32, 8 per pixel), deg (u8 per pixel) and list (i32); returns the skeleton pixel count. */
export function skeletonNeighbours(sk: usize, nbr: usize, deg: usize, list: usize): i32 {
  const w = W, h = H;
  const px = PX && w >= 3, py = PY && h >= 3;
  let count = 0;
  for (let y = 0; y < h; y++) {
    const ym = y > 0 ? y - 1 : py ? h - 1 : -1;
    const yp = y + 1 < h ? y + 1 : py ? 0 : -1;
    const row = y * w, rm = ym * w, rp = yp * w;
    memory.fill(deg + <usize>row, 0, <usize>w);
    for (let x = 0; x < w; x++) {
      const i = row + x;
      // Eight pixels off the skeleton at once (most of a frame).
      if ((x & 7) == 0 && x + 8 <= w && load<u64>(sk + <usize>i) == 0) { x += 7; continue; }
      if (load<u8>(sk + <usize>i) == 0) continue;
      store<i32>(list + (<usize>count << 2), i);
      count++;
      const v = <i32>load<u8>(PH + <usize>i);
      const xm = x > 0 ? x - 1 : px ? w - 1 : -1;
      const xp = x + 1 < w ? x + 1 : px ? 0 : -1;
      const base = nbr + (<usize>i << 5);
      let d = 0;
      let j = 0;
      if (xp >= 0) { j = row + xp; store<i32>(base + (<usize>d << 2), j << 3); d += skAt(sk, j, v); }
      if (ym >= 0) { j = rm + x; store<i32>(base + (<usize>d << 2), (j << 3) | 1); d += skAt(sk, j, v); }
      if (xm >= 0) { j = row + xm; store<i32>(base + (<usize>d << 2), (j << 3) | 2); d += skAt(sk, j, v); }
      if (yp >= 0) { j = rp + x; store<i32>(base + (<usize>d << 2), (j << 3) | 3); d += skAt(sk, j, v); }
      // Diagonals: NE quad top-left (x, y-1), NW (x-1, y-1), SW (x-1, y), SE (x, y).
      if (RULE == 2 || (RULE == 0) == (v == 1)) {
        if (ym >= 0 && xp >= 0 && joinsDiagonal(v, rm + x)) { j = rm + xp; store<i32>(base + (<usize>d << 2), (j << 3) | 4); d += skAt(sk, j, v); }
        if (ym >= 0 && xm >= 0 && joinsDiagonal(v, rm + xm)) { j = rm + xm; store<i32>(base + (<usize>d << 2), (j << 3) | 5); d += skAt(sk, j, v); }
        if (yp >= 0 && xm >= 0 && joinsDiagonal(v, row + xm)) { j = rp + xm; store<i32>(base + (<usize>d << 2), (j << 3) | 6); d += skAt(sk, j, v); }
        if (yp >= 0 && xp >= 0 && joinsDiagonal(v, i)) { j = rp + xp; store<i32>(base + (<usize>d << 2), (j << 3) | 7); d += skAt(sk, j, v); }
      }
      store<u8>(deg + <usize>i, <u8>d);
    }
  }
  return count;
}

// The walk of the skeleton graph (src/topology/skeleton.ts builds its tables from this): nodes
// are junction clusters (adjacent pixels of degree >= 3 are one node, at its pixel farthest from
// the other phase), ends (degree 1) and isolated points (degree 0), numbered in raster order of
// their first pixel; branches start at node pixels in raster order, neighbour order within a
// pixel, and run along degree-2 pixels to the next node; rings are the cycles of degree-2 pixels
// left over. Lengths: half a step at each node, plus half the chord between the pixels before
// and after each interior pixel (geometry tables by direction code, from TypeScript). The state
// of the walk is owner (i32 per pixel): -1 not reached, -2 - node on node pixels, the branch id
// on interior pixels; only skeleton pixels are read or written.

@inline function dist(d: usize, i: i32): f64 {
  return <f64>load<f32>(d + (<usize>i << 2));
}

/**
 * Node table at `nodes` (nodeCap rows of i32: best pixel, first pixel, degree), branch table at
 * `branches` (branchCap rows: i32 a, b, start pixel, pixel count, then f64 length, summed
 * distance, largest distance), geometry at `geom` (8 f64 steps, 64 f64 chords), `stack` (i32,
 * count entries), `pairs` (8 bytes per pixel index, scratch). Writes the node and branch counts to out[0], out[1]; returns 0, or -1 when the
 * branch table is too small (call again with more room).
 */
export function skeletonWalk(
  nbr: usize, deg: usize, list: usize, count: i32, dst: usize, owner: usize, geom: usize,
  nodes: usize, nodeCap: i32, branches: usize, branchCap: i32, stack: usize, out: usize, pairs: usize,
): i32 {
  // The first two neighbours of every pixel side by side (8 bytes a pixel instead of 32): the
  // walk along degree-2 pixels reads only these, from an array a quarter of the size.
  for (let t = 0; t < count; t++) {
    const i = ldi(list, t);
    store<u64>(pairs + (<usize>i << 3), load<u64>(nbr + (<usize>i << 5)));
  }
  const chord = geom + 64;
  const nBest = nodes, nFirst = nodes + (<usize>nodeCap << 2), nDeg = nodes + (<usize>nodeCap << 3);
  const cap = <usize>branchCap;
  const bA = branches, bB = branches + (cap << 2), bStart = branches + (cap << 3), bP = branches + 12 * cap;
  const bL = branches + 16 * cap, bS = branches + 24 * cap, bM = branches + 32 * cap;
  for (let t = 0; t < count; t++) sti(owner, ldi(list, t), -1);
  // Nodes.
  let nc = 0;
  for (let t = 0; t < count; t++) {
    const i = ldi(list, t);
    const di = <i32>load<u8>(deg + <usize>i);
    if (ldi(owner, i) != -1 || di == 2) continue;
    const tag = -2 - nc;
    let best = i;
    sti(owner, i, tag);
    if (di >= 3) {
      let sp = 0;
      sti(stack, sp++, i);
      while (sp > 0) {
        const p = ldi(stack, --sp);
        if (dist(dst, p) > dist(dst, best)) best = p;
        const dp = <i32>load<u8>(deg + <usize>p);
        const base = nbr + (<usize>p << 5);
        for (let k = 0; k < dp; k++) {
          const q = <i32>(<u32>load<i32>(base + (<usize>k << 2)) >> 3);
          if (ldi(owner, q) == -1 && <i32>load<u8>(deg + <usize>q) >= 3) { sti(owner, q, tag); sti(stack, sp++, q); }
        }
      }
    }
    sti(nBest, nc, best);
    sti(nFirst, nc, i);
    sti(nDeg, nc, 0);
    nc++;
  }
  // Branches from every node pixel.
  let bc = 0;
  for (let t = 0; t < count; t++) {
    const u = ldi(list, t);
    const ou = ldi(owner, u);
    if (ou > -2) continue;
    const a = -2 - ou;
    const du = <i32>load<u8>(deg + <usize>u);
    const ubase = nbr + (<usize>u << 5);
    for (let k = 0; k < du; k++) {
      const e0 = load<i32>(ubase + (<usize>k << 2));
      const wpx = <i32>(<u32>e0 >> 3), d0 = e0 & 7;
      const ow = ldi(owner, wpx);
      if (ow <= -2) {
        // Node pixel next to node pixel: a branch without interior (once, from the lower index).
        const b0 = -2 - ow;
        if (b0 == a || wpx < u) continue;
        if (bc >= branchCap) return -1;
        const eu: i32 = du == 1 ? 1 : 0, ew: i32 = <i32>load<u8>(deg + <usize>wpx) == 1 ? 1 : 0;
        const xu = dist(dst, u), xw = dist(dst, wpx);
        sti(bA, bc, a); sti(bB, bc, b0); sti(bStart, bc, u); sti(bP, bc, eu + ew);
        stf(bL, bc, ldf(geom, d0));
        stf(bS, bc, <f64>eu * xu + <f64>ew * xw);
        stf(bM, bc, xu > xw ? xu : xw);
        bc++;
        sti(nDeg, a, ldi(nDeg, a) + 1); sti(nDeg, b0, ldi(nDeg, b0) + 1);
        continue;
      }
      if (ow >= 0) continue; // walked already, from its other end
      let prev = u, cur = wpx, din = d0;
      let len = ldf(geom, d0) / 2;
      let sum: f64 = 0, mx: f64 = 0;
      let cnt = 0, b = -1;
      while (true) {
        sti(owner, cur, bc);
        const dc = dist(dst, cur);
        sum += dc; cnt++;
        if (dc > mx) mx = dc;
        const cbase = pairs + (<usize>cur << 3);
        // The way on is the pair's other entry: taken by a select, not a branch (which of the
        // two is the way back is a coin toss along a line, a branch mispredicted half the time).
        const n0 = load<i32>(cbase), n1 = load<i32>(cbase, 4);
        const e = select<i32>(n1, n0, <i32>(<u32>n0 >> 3) == prev);
        const next = <i32>(<u32>e >> 3), dout = e & 7;
        len += ldf(chord, (din << 3) + dout);
        const on = ldi(owner, next);
        if (on <= -2) {
          b = -2 - on;
          len += ldf(geom, dout) / 2;
          break;
        }
        if (on >= 0) break; // cannot happen on a clean line; stop rather than loop
        prev = cur; cur = next; din = dout;
      }
      if (b == -1) continue;
      if (bc >= branchCap) return -1;
      sti(bA, bc, a); sti(bB, bc, b); sti(bStart, bc, u); sti(bP, bc, cnt);
      stf(bL, bc, len); stf(bS, bc, sum); stf(bM, bc, mx);
      bc++;
      sti(nDeg, a, ldi(nDeg, a) + 1); sti(nDeg, b, ldi(nDeg, b) + 1);
    }
  }
  // Rings.
  for (let t = 0; t < count; t++) {
    const i = ldi(list, t);
    if (ldi(owner, i) != -1 || <i32>load<u8>(deg + <usize>i) != 2) continue;
    // Entered from the second neighbour: the step in is the one from it to i (as its list has it).
    const j = <i32>(<u32>load<i32>(pairs + (<usize>i << 3), 4) >> 3);
    let din = 0;
    // (j is a degree-2 pixel of the same ring: its two neighbours are in its pair)
    for (let k = 0; k < 2; k++) {
      const e = load<i32>(pairs + (<usize>j << 3) + (<usize>k << 2));
      if (<i32>(<u32>e >> 3) == i) { din = e & 7; break; }
    }
    let prev = j, cur = i, cnt = 0;
    let len: f64 = 0, sum: f64 = 0, mx: f64 = 0;
    while (ldi(owner, cur) < 0) {
      sti(owner, cur, bc);
      const dc = dist(dst, cur);
      sum += dc; cnt++;
      if (dc > mx) mx = dc;
      const cbase = pairs + (<usize>cur << 3);
      const n0 = load<i32>(cbase), n1 = load<i32>(cbase, 4);
      const e = select<i32>(n1, n0, <i32>(<u32>n0 >> 3) == prev);
      len += ldf(chord, (din << 3) + (e & 7));
      prev = cur; cur = <i32>(<u32>e >> 3); din = e & 7;
    }
    if (bc >= branchCap) return -1;
    sti(bA, bc, -1); sti(bB, bc, -1); sti(bStart, bc, i); sti(bP, bc, cnt);
    stf(bL, bc, len); stf(bS, bc, sum); stf(bM, bc, mx);
    bc++;
  }
  sti(out, 0, nc);
  sti(out, 1, bc);
  return 0;
}

/**
 * The adjacency renumbered by skeleton index t (raster order of `list`), so that the walk reads
 * small arrays instead of frame-sized ones: cnbr[8 t + k] = 8 t' + direction, cdeg (u8),
 * cdist (f32), ident[t] = t; `index` (i32 per pixel) is scratch, written on skeleton pixels.
 */
export function skeletonCompact(
  nbr: usize, deg: usize, list: usize, count: i32, dst: usize, index: usize,
  cnbr: usize, cdeg: usize, cdist: usize, ident: usize,
): void {
  for (let t = 0; t < count; t++) sti(index, ldi(list, t), t);
  for (let t = 0; t < count; t++) {
    const i = ldi(list, t);
    const d = <i32>load<u8>(deg + <usize>i);
    store<u8>(cdeg + <usize>t, <u8>d);
    store<f32>(cdist + (<usize>t << 2), load<f32>(dst + (<usize>i << 2)));
    sti(ident, t, t);
    const src = nbr + (<usize>i << 5), to = cnbr + (<usize>t << 5);
    for (let k = 0; k < d; k++) {
      const e = load<i32>(src + (<usize>k << 2));
      store<i32>(to + (<usize>k << 2), (ldi(index, <i32>(<u32>e >> 3)) << 3) | (e & 7));
    }
  }
}

/** clab[t] = the label (i32 per pixel at lab) of the pixel of skeleton index t, for t < count. */
function labelsByIndex(lab: usize, clab: usize, list: usize, count: i32): void {
  for (let t = 0; t < count; t++) sti(clab, t, ldi(lab, ldi(list, t)));
}

/**
 * The adjacency of skeletonNeighbours directly by skeleton index (the layout skeletonCompact
 * gives), without the frame-sized neighbour lists: list (pixel of each index, raster order),
 * cnbr[8 t + k] = 8 t' + direction (same order E, N, W, S, NE, NW, SW, SE), cdeg (u8), cdist
 * (f32, from dst), ident[t] = t; `index` (i32 per pixel) is scratch; where lab is not 0 (i32
 * labels per pixel), clab[t] = the label of index t. Returns the count.
 */
export function skeletonNeighboursCompact(
  sk: usize, dst: usize, index: usize, list: usize, cnbr: usize, cdeg: usize, cdist: usize, ident: usize,
  lab: usize, clab: usize,
): i32 {
  const w = W, h = H;
  const px = PX && w >= 3, py = PY && h >= 3;
  let count = 0;
  const n = w * h;
  // Eight pixels at a time: the nonzero bytes of a word, lowest first (raster order).
  const n8 = n & ~7;
  for (let i = 0; i < n8; i += 8) {
    let m = load<u64>(sk + <usize>i);
    while (m != 0) {
      const b = <i32>(ctz<u64>(m) >> 3);
      m &= ~(<u64>0xff << (<u64>b << 3));
      sti(index, i + b, count);
      sti(list, count, i + b);
      count++;
    }
  }
  for (let i = n8; i < n; i++) {
    if (load<u8>(sk + <usize>i) == 0) continue;
    sti(index, i, count);
    sti(list, count, i);
    count++;
  }
  // The list is in raster order: the row advances with it (no division per pixel).
  let y = -1, rowStart = -w, rowEnd = 0;
  let ym = -1, yp = -1, row = 0, rm = 0, rp = 0;
  for (let t = 0; t < count; t++) {
    const i = ldi(list, t);
    if (i >= rowEnd) {
      while (i >= rowEnd) { rowStart += w; rowEnd += w; y++; }
      ym = y > 0 ? y - 1 : py ? h - 1 : -1;
      yp = y + 1 < h ? y + 1 : py ? 0 : -1;
      row = rowStart; rm = ym * w; rp = yp * w;
    }
    const x = i - rowStart;
    const v = <i32>load<u8>(PH + <usize>i);
    const xm = x > 0 ? x - 1 : px ? w - 1 : -1;
    const xp = x + 1 < w ? x + 1 : px ? 0 : -1;
    const base = cnbr + (<usize>t << 5);
    // Every slot is written and kept only where the neighbour is there (d advances by 0 or 1):
    // no data-dependent branch (the index read off the skeleton is stale and never kept). The
    // E and W neighbours inside the row are the next and previous skeleton index (raster order).
    let d = 0;
    let j = 0;
    const diag = RULE == 2 ? 1 : i32((RULE == 0) == (v == 1));
    if (x > 0 && x + 1 < w && y > 0 && y + 1 < h && RULE != 2) {
      // Inside the frame under a fixed rule: neighbours at fixed offsets, the E and W ones the
      // next and previous index, diagonals for the 8-connected phase only.
      store<i32>(base, (t + 1) << 3); d += skAt(sk, i + 1, v);
      j = i - w; store<i32>(base + (<usize>d << 2), (ldi(index, j) << 3) | 1); d += skAt(sk, j, v);
      store<i32>(base + (<usize>d << 2), ((t - 1) << 3) | 2); d += skAt(sk, i - 1, v);
      j = i + w; store<i32>(base + (<usize>d << 2), (ldi(index, j) << 3) | 3); d += skAt(sk, j, v);
      j = i - w + 1; store<i32>(base + (<usize>d << 2), (ldi(index, j) << 3) | 4); d += skAt(sk, j, v) & diag;
      j = i - w - 1; store<i32>(base + (<usize>d << 2), (ldi(index, j) << 3) | 5); d += skAt(sk, j, v) & diag;
      j = i + w - 1; store<i32>(base + (<usize>d << 2), (ldi(index, j) << 3) | 6); d += skAt(sk, j, v) & diag;
      j = i + w + 1; store<i32>(base + (<usize>d << 2), (ldi(index, j) << 3) | 7); d += skAt(sk, j, v) & diag;
    } else {
      if (xp >= 0) { j = row + xp; store<i32>(base + (<usize>d << 2), (xp > x ? t + 1 : ldi(index, j)) << 3); d += skAt(sk, j, v); }
      if (ym >= 0) { j = rm + x; store<i32>(base + (<usize>d << 2), (ldi(index, j) << 3) | 1); d += skAt(sk, j, v); }
      if (xm >= 0) { j = row + xm; store<i32>(base + (<usize>d << 2), ((xm < x ? t - 1 : ldi(index, j)) << 3) | 2); d += skAt(sk, j, v); }
      if (yp >= 0) { j = rp + x; store<i32>(base + (<usize>d << 2), (ldi(index, j) << 3) | 3); d += skAt(sk, j, v); }
      // Diagonals: NE quad top-left (x, y-1), NW (x-1, y-1), SW (x-1, y), SE (x, y); with the
      // fixed rules, none in the 4-connected phase.
      if (ym >= 0 && xp >= 0) { j = rm + xp; store<i32>(base + (<usize>d << 2), (ldi(index, j) << 3) | 4); d += skAt(sk, j, v) & diag & i32(joinsDiagonal(v, rm + x)); }
      if (ym >= 0 && xm >= 0) { j = rm + xm; store<i32>(base + (<usize>d << 2), (ldi(index, j) << 3) | 5); d += skAt(sk, j, v) & diag & i32(joinsDiagonal(v, rm + xm)); }
      if (yp >= 0 && xm >= 0) { j = rp + xm; store<i32>(base + (<usize>d << 2), (ldi(index, j) << 3) | 6); d += skAt(sk, j, v) & diag & i32(joinsDiagonal(v, row + xm)); }
      if (yp >= 0 && xp >= 0) { j = rp + xp; store<i32>(base + (<usize>d << 2), (ldi(index, j) << 3) | 7); d += skAt(sk, j, v) & diag & i32(joinsDiagonal(v, i)); }
    }
    store<u8>(cdeg + <usize>t, <u8>d);
    store<f32>(cdist + (<usize>t << 2), load<f32>(dst + (<usize>i << 2)));
    sti(ident, t, t);
  }
  if (lab != 0) labelsByIndex(lab, clab, list, count);
  return count;
}

/**
 * Pixel count, phase (of the last pixel, 0/1) and largest distance to the other phase of every
 * domain, run by run of one label: labels (i32, 1..count), ph (u8), dist (f32) of n pixels into
 * area (f64), maxd (f64) and dph (u8) of count entries. Returns the first pixel whose label is
 * outside 1..count, or -1.
 */
export function domainTotals(labels: usize, ph: usize, dist: usize, n: i32, count: i32, area: usize, maxd: usize, dph: usize): i32 {
  memory.fill(area, 0, <usize>count << 3);
  memory.fill(maxd, 0, <usize>count << 3);
  memory.fill(dph, 0, <usize>count);
  let i = 0;
  while (i < n) {
    const l = load<i32>(labels + (<usize>i << 2)), d = l - 1;
    if (d < 0 || d >= count) return i;
    const pm = maxd + (<usize>d << 3);
    // Four pixels at a time while all four carry l (the first always does), then one by one.
    const lv = i32x4.splat(l);
    let mv = f32x4.splat(0);
    let j = i;
    while (j + 4 <= n) {
      const q = <usize>j << 2;
      if (i32x4.bitmask(i32x4.eq(v128.load(labels + q), lv)) != 15) break;
      mv = f32x4.pmax(mv, v128.load(dist + q));
      j += 4;
    }
    // The lanes' largest by shuffles and comparisons (f32.max / f64.max also order NaN and -0,
    // at a cost: distances have neither).
    mv = f32x4.pmax(mv, v128.shuffle<f32>(mv, mv, 2, 3, 0, 1));
    mv = f32x4.pmax(mv, v128.shuffle<f32>(mv, mv, 1, 0, 3, 2));
    let m = load<f64>(pm);
    const v4 = <f64>f32x4.extract_lane(mv, 0);
    if (v4 > m) m = v4;
    while (j < n && load<i32>(labels + (<usize>j << 2)) == l) {
      const v = <f64>load<f32>(dist + (<usize>j << 2));
      if (v > m) m = v;
      j++;
    }
    const pa = area + (<usize>d << 3);
    store<f64>(pa, load<f64>(pa) + <f64>(j - i));
    store<f64>(pm, m);
    store<u8>(dph + <usize>d, load<u8>(ph + <usize>(j - 1)) != 0 ? 1 : 0);
    i = j;
  }
  return -1;
}

// ---- the compact adjacency from bit planes (fixed rules) ---------------------------------
// The same output as skeletonNeighboursCompact under RULE 0 or 1, from three bit planes of the
// skeleton (up, down, both; bit x of a row = pixel x, rows of RBB bytes with zeros past the
// frame) and the skeleton index of each row word (the pixels before it in raster order). A
// pixel's ring comes from three unaligned 64-bit loads of its phase's plane; its neighbours'
// indices from one rank per row above and below: N at rank(x), NE at rank(x) + [skeleton at x],
// NW at rank(x) - 1 (it is a skeleton pixel), E and W the next and previous index.

let RBB: usize = 0; // bytes per plane row: whole words and one spare word

/** Bytes of the planes and word ranks that skeletonNeighboursBits needs for a w x h frame. */
export function neighbourBitsBytes(w: i32, h: i32): i32 {
  const ww = (w + 63) >> 6;
  return 3 * h * ((ww + 1) << 3) + 4 * h * ww + 16;
}

@inline function bitAt(plane: usize, y: i32, x: i32): i32 {
  return <i32>(load<u8>(plane + <usize>y * RBB + (<usize>x >> 3)) >> <u8>(x & 7)) & 1;
}

@inline function rankAt(both: usize, ranks: usize, ww: i32, y: i32, x: i32): i32 {
  const k = x >> 6;
  const word = load<u64>(both + <usize>y * RBB + (<usize>k << 3));
  return ldi(ranks, y * ww + k) + <i32>popcnt(word & ((<u64>1 << <u64>(x & 63)) - 1));
}

/**
 * skeletonNeighboursCompact for RULE 0 or 1 from bit planes carved from `work`
 * (neighbourBitsBytes, 8-byte aligned): same list, cnbr, cdeg, cdist, ident and clab.
 * Returns the count.
 */
export function skeletonNeighboursBits(
  sk: usize, dst: usize, work: usize, list: usize, cnbr: usize, cdeg: usize, cdist: usize, ident: usize,
  lab: usize, clab: usize,
): i32 {
  const w = W, h = H;
  const px = PX && w >= 3, py = PY && h >= 3;
  const ww = (w + 63) >> 6;
  RBB = <usize>(ww + 1) << 3;
  const up = work, down = up + <usize>h * RBB, both = down + <usize>h * RBB;
  const ranks = both + <usize>h * RBB;
  // Planes and ranks, sixteen pixels a step.
  const z = i8x16.splat(0);
  let count = 0;
  for (let y = 0; y < h; y++) {
    const row = y * w;
    const ro = <usize>y * RBB;
    for (let k = 0; k < ww; k++) {
      const x0 = k << 6;
      let s: u64 = 0, u: u64 = 0;
      if (x0 + 64 <= w) {
        for (let q = 0; q < 4; q++) {
          const o = <usize>(row + x0 + (q << 4));
          const sh = <u64>(q << 4);
          s |= <u64>i8x16.bitmask(i8x16.ne(v128.load(sk + o), z)) << sh;
          u |= <u64>i8x16.bitmask(i8x16.ne(v128.load(PH + o), z)) << sh;
        }
      } else {
        for (let x = x0; x < w; x++) {
          const b = <u64>1 << <u64>(x - x0);
          if (load<u8>(sk + <usize>(row + x)) != 0) s |= b;
          if (load<u8>(PH + <usize>(row + x)) != 0) u |= b;
        }
      }
      const ko = <usize>k << 3;
      store<u64>(up + ro + ko, s & u);
      store<u64>(down + ro + ko, s & ~u);
      store<u64>(both + ro + ko, s);
      sti(ranks, y * ww + k, count);
      count += <i32>popcnt(s);
    }
    // The spare word: zeros past the frame for the unaligned loads.
    const last = <usize>ww << 3;
    store<u64>(up + ro + last, 0); store<u64>(down + ro + last, 0); store<u64>(both + ro + last, 0);
  }
  let t = 0;
  for (let y = 0; y < h; y++) {
    const row = y * w;
    const ym = y > 0 ? y - 1 : py ? h - 1 : -1;
    const yp = y + 1 < h ? y + 1 : py ? 0 : -1;
    const inner = y > 0 && y + 1 < h;
    // Row starts in each plane: this row, the one above and the one below (inside the frame).
    const ro = <usize>y * RBB;
    const uo = inner ? ro - RBB : ro, doo = inner ? ro + RBB : ro;
    const rankUp = inner ? ranks + (<usize>((y - 1) * ww) << 2) : 0, rankDown = inner ? ranks + (<usize>((y + 1) * ww) << 2) : 0;
    for (let k = 0; k < ww; k++) {
      const ko = <usize>k << 3;
      let m = load<u64>(both + ro + ko);
      const upWord = load<u64>(up + ro + ko);
      while (m != 0) {
        const b = <i32>ctz(m);
        const x = (k << 6) + b;
        m &= m - 1;
        const i = row + x;
        const v = <i32>((upWord >> <u64>b) & 1);
        const plane = v == 1 ? up : down;
        const diag = i32((RULE == 0) == (v == 1));
        const base = cnbr + (<usize>t << 5);
        let d = 0;
        if (inner && x > 0 && x + 1 < w) {
          const xo = <usize>(x - 1) >> 3, xs = <u64>((x - 1) & 7);
          const c3 = <i32>((load<u64>(plane + ro + xo) >> xs) & 7);
          const n3 = <i32>((load<u64>(plane + uo + xo) >> xs) & 7);
          const s3 = <i32>((load<u64>(plane + doo + xo) >> xs) & 7);
          // Ranks of (x, y - 1) and (x, y + 1), and whether those are skeleton pixels.
          const below = ((<u64>1) << <u64>b) - 1;
          const wn = load<u64>(both + uo + ko), wsw = load<u64>(both + doo + ko);
          const rn = load<i32>(rankUp + (<usize>k << 2)) + <i32>popcnt(wn & below);
          const rs = load<i32>(rankDown + (<usize>k << 2)) + <i32>popcnt(wsw & below);
          const bn = <i32>((wn >> <u64>b) & 1), bs = <i32>((wsw >> <u64>b) & 1);
          // E, N, W, S, then NE, NW, SW, SE (diagonals for the 8-connected phase only). Every
          // slot is written and kept only where the neighbour is there (d advances by 0 or 1):
          // whether a ring pixel is there follows no pattern a branch predictor could learn.
          const dm = -diag;
          store<i32>(base, (t + 1) << 3); d += (c3 >> 2) & 1;
          store<i32>(base + (<usize>d << 2), (rn << 3) | 1); d += (n3 >> 1) & 1;
          store<i32>(base + (<usize>d << 2), ((t - 1) << 3) | 2); d += c3 & 1;
          store<i32>(base + (<usize>d << 2), (rs << 3) | 3); d += (s3 >> 1) & 1;
          store<i32>(base + (<usize>d << 2), ((rn + bn) << 3) | 4); d += (n3 >> 2) & dm & 1;
          store<i32>(base + (<usize>d << 2), ((rn - 1) << 3) | 5); d += n3 & dm & 1;
          store<i32>(base + (<usize>d << 2), ((rs - 1) << 3) | 6); d += s3 & dm & 1;
          store<i32>(base + (<usize>d << 2), ((rs + bs) << 3) | 7); d += (s3 >> 2) & dm & 1;
        } else {
          // On the frame's rim: wrap-aware positions, -1 beyond an open side.
          const xm = x > 0 ? x - 1 : px ? w - 1 : -1;
          const xp = x + 1 < w ? x + 1 : px ? 0 : -1;
          if (xp >= 0 && bitAt(plane, y, xp) != 0) { store<i32>(base + (<usize>d << 2), (xp > x ? t + 1 : rankAt(both, ranks, ww, y, xp)) << 3); d++; }
          if (ym >= 0 && bitAt(plane, ym, x) != 0) { store<i32>(base + (<usize>d << 2), (rankAt(both, ranks, ww, ym, x) << 3) | 1); d++; }
          if (xm >= 0 && bitAt(plane, y, xm) != 0) { store<i32>(base + (<usize>d << 2), ((xm < x ? t - 1 : rankAt(both, ranks, ww, y, xm)) << 3) | 2); d++; }
          if (yp >= 0 && bitAt(plane, yp, x) != 0) { store<i32>(base + (<usize>d << 2), (rankAt(both, ranks, ww, yp, x) << 3) | 3); d++; }
          if (diag) {
            if (ym >= 0 && xp >= 0 && bitAt(plane, ym, xp) != 0) { store<i32>(base + (<usize>d << 2), (rankAt(both, ranks, ww, ym, xp) << 3) | 4); d++; }
            if (ym >= 0 && xm >= 0 && bitAt(plane, ym, xm) != 0) { store<i32>(base + (<usize>d << 2), (rankAt(both, ranks, ww, ym, xm) << 3) | 5); d++; }
            if (yp >= 0 && xm >= 0 && bitAt(plane, yp, xm) != 0) { store<i32>(base + (<usize>d << 2), (rankAt(both, ranks, ww, yp, xm) << 3) | 6); d++; }
            if (yp >= 0 && xp >= 0 && bitAt(plane, yp, xp) != 0) { store<i32>(base + (<usize>d << 2), (rankAt(both, ranks, ww, yp, xp) << 3) | 7); d++; }
          }
        }
        sti(list, t, i);
        store<u8>(cdeg + <usize>t, <u8>d);
        store<f32>(cdist + (<usize>t << 2), load<f32>(dst + (<usize>i << 2)));
        sti(ident, t, t);
        t++;
      }
    }
  }
  if (lab != 0) labelsByIndex(lab, clab, list, count);
  return count;
}
