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
 * count entries). Writes the node and branch counts to out[0], out[1]; returns 0, or -1 when the
 * branch table is too small (call again with more room).
 */
export function skeletonWalk(
  nbr: usize, deg: usize, list: usize, count: i32, dst: usize, owner: usize, geom: usize,
  nodes: usize, nodeCap: i32, branches: usize, branchCap: i32, stack: usize, out: usize,
): i32 {
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
        const cbase = nbr + (<usize>cur << 5);
        const n0 = load<i32>(cbase);
        const e = <i32>(<u32>n0 >> 3) == prev ? load<i32>(cbase, 4) : n0;
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
    const j = <i32>(<u32>load<i32>(nbr + (<usize>i << 5), 4) >> 3);
    const dj = <i32>load<u8>(deg + <usize>j);
    let din = 0;
    for (let k = 0; k < dj; k++) {
      const e = load<i32>(nbr + (<usize>j << 5) + (<usize>k << 2));
      if (<i32>(<u32>e >> 3) == i) { din = e & 7; break; }
    }
    let prev = j, cur = i, cnt = 0;
    let len: f64 = 0, sum: f64 = 0, mx: f64 = 0;
    while (ldi(owner, cur) < 0) {
      sti(owner, cur, bc);
      const dc = dist(dst, cur);
      sum += dc; cnt++;
      if (dc > mx) mx = dc;
      const cbase = nbr + (<usize>cur << 5);
      const n0 = load<i32>(cbase);
      const e = <i32>(<u32>n0 >> 3) == prev ? load<i32>(cbase, 4) : n0;
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
  if (lab != 0) for (let t = 0; t < count; t++) sti(clab, t, ldi(lab, ldi(list, t)));
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
      mv = f32x4.max(mv, v128.load(dist + q));
      j += 4;
    }
    let m = max(load<f64>(pm), <f64>max(max(f32x4.extract_lane(mv, 0), f32x4.extract_lane(mv, 1)), max(f32x4.extract_lane(mv, 2), f32x4.extract_lane(mv, 3))));
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
