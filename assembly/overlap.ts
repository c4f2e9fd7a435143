// Same-phase overlap pairs between two label images of one shape, the input of the tracker's
// links between consecutive frames (src/sequence/tracking-overlap.ts). One pass over the pixels:
// runs of equal (previous label, current label) pairs along a row are found four pixels at a
// time (compared with the run's pair), and each run adds its length to its pair in an
// open-addressing table (linear probing, the pair itself as key). A previous domain usually
// meets the same partner run after run, so the slot of its last pair is remembered.

@inline function slotOf(a: i32, b: i32, mask: i32): i32 {
  // Multiplicative mixing of both labels (golden-ratio and murmur3 constants), then fold.
  let h = (a * <i32>0x9e3779b1) ^ (b * <i32>0x85ebca77);
  h ^= <i32>(<u32>h >> 15);
  return h & mask;
}

/**
 * Pairs of `prev` (labels 0..prevCount) and `cur` (0..maxCur) over n pixels whose labels have
 * the same phase (pph[a], cph[b]: u8 per label; label 0 overlaps nothing). `table`: 3 columns of
 * `cap` i32 (cap a power of two), `memo`: 2 (prevCount + 1) i32. Writes the pairs (previous
 * label, current label, shared pixels) to outA, outB, outN (room for cap / 2) and returns their
 * number; -1 when the table is half full (call again with more slots); -2 - i for a current
 * label outside 0..maxCur at pixel i; -2 - n - i for a previous label outside 0..prevCount.
 */
export function overlapPairs(
  prev: usize, cur: usize, n: i32, prevCount: i32, maxCur: i32, pph: usize, cph: usize,
  table: usize, cap: i32, memo: usize, outA: usize, outB: usize, outN: usize,
): i32 {
  const kA = table, kB = table + (<usize>cap << 2), kV = table + (<usize>cap << 3);
  const mCur = memo, mSlot = memo + (<usize>(prevCount + 1) << 2);
  memory.fill(kA, 0, <usize>cap << 2);
  memory.fill(mCur, 0xff, <usize>(prevCount + 1) << 2); // -1: no pair yet
  if (n <= 0) return 0;
  const mask = cap - 1;
  let used = 0;
  let a = load<i32>(prev), b = load<i32>(cur);
  if (<u32>b > <u32>maxCur) return -2;
  if (<u32>a > <u32>prevCount) return -2 - n;
  let start = 0, i = 1;
  while (true) {
    // The run's end: four pixels at a time against the pair, the first that differs by its lane.
    const av = i32x4.splat(a), bv = i32x4.splat(b);
    let open = true;
    while (i + 4 <= n) {
      const o = <usize>i << 2;
      const m = i32x4.bitmask(v128.and(i32x4.eq(v128.load(prev + o), av), i32x4.eq(v128.load(cur + o), bv)));
      if (m != 15) { i += <i32>ctz(~m); open = false; break; }
      i += 4;
    }
    if (open) while (i < n && load<i32>(prev + (<usize>i << 2)) == a && load<i32>(cur + (<usize>i << 2)) == b) i++;
    if (a > 0 && b > 0 && load<u8>(pph + <usize>a) == load<u8>(cph + <usize>b)) {
      const len = i - start;
      const ma = mCur + (<usize>a << 2);
      if (load<i32>(ma) == b) {
        const p = kV + (<usize>load<i32>(mSlot + (<usize>a << 2)) << 2);
        store<i32>(p, load<i32>(p) + len);
      } else {
        let s = slotOf(a, b, mask);
        while (true) {
          const k = load<i32>(kA + (<usize>s << 2));
          if (k == 0) {
            store<i32>(kA + (<usize>s << 2), a);
            store<i32>(kB + (<usize>s << 2), b);
            store<i32>(kV + (<usize>s << 2), len);
            used++;
            if (used * 2 > cap) return -1;
            break;
          }
          if (k == a && load<i32>(kB + (<usize>s << 2)) == b) {
            store<i32>(kV + (<usize>s << 2), load<i32>(kV + (<usize>s << 2)) + len);
            break;
          }
          s = (s + 1) & mask;
        }
        store<i32>(ma, b);
        store<i32>(mSlot + (<usize>a << 2), s);
      }
    }
    if (i >= n) break;
    a = load<i32>(prev + (<usize>i << 2));
    const nb = load<i32>(cur + (<usize>i << 2));
    if (nb != b && <u32>nb > <u32>maxCur) return -2 - i;
    if (<u32>a > <u32>prevCount) return -2 - n - i;
    b = nb;
    start = i;
    i++;
  }
  let e = 0;
  for (let s = 0; s < cap; s++) {
    const k = load<i32>(kA + (<usize>s << 2));
    if (k == 0) continue;
    store<i32>(outA + (<usize>e << 2), k);
    store<i32>(outB + (<usize>e << 2), load<i32>(kB + (<usize>s << 2)));
    store<i32>(outN + (<usize>e << 2), load<i32>(kV + (<usize>s << 2)));
    e++;
  }
  return e;
}
