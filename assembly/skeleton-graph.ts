// Pixel adjacency of a thinned frame, the input of the skeleton graph (src/topology/skeleton.ts).
// Pixels are adjacent as the domain's phase is connected: 4-neighbours always, a diagonal pair
// where joinsDiagonal holds for its quad. For every skeleton pixel i (raster order) the kernel
// lists its skeleton neighbours of the same phase in the order E, N, W, S, NE, NW, SW, SE, each
// as 8 j + direction (direction codes in that order, 0..7), at nbr[8 i .. 8 i + deg - 1];
// deg (u8) is 0 off the skeleton. Each slot is written and kept only where the neighbour is
// there (d advances by 0 or 1), so the inner code has no data-dependent branch. The skeleton pixels themselves go to `list` in raster order.
import { W, H, PX, PY, PH, RULE, joinsDiagonal } from "./common";

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
