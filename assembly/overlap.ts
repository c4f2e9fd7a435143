// Runs of equal (previous label, current label) pairs along the pixels of two label images of
// one shape, the input of the overlap count between consecutive frames (src/sequence/
// tracking-overlap.ts). Four pixels at a time are skipped while neither image changes.

/**
 * Writes each run's previous label, current label and length to outA, outB, outN (i32, room
 * for n runs) and returns the number of runs, or -(i + 1) for the first pixel i whose current
 * label is outside 0..maxCur.
 */
export function overlapRuns(prev: usize, cur: usize, n: i32, maxCur: i32, outA: usize, outB: usize, outN: usize): i32 {
  if (n <= 0) return 0;
  let a = load<i32>(prev), b = load<i32>(cur);
  if (b < 0 || b > maxCur) return -1;
  let runs = 0, start = 0, i = 1;
  while (true) {
    while (i + 4 <= n) {
      const o = <usize>i << 2;
      const same = v128.and(
        i32x4.eq(v128.load(prev + o), v128.load(prev + o - 4)),
        i32x4.eq(v128.load(cur + o), v128.load(cur + o - 4)));
      if (!i32x4.all_true(same)) break;
      i += 4;
    }
    while (i < n && load<i32>(prev + (<usize>i << 2)) == a && load<i32>(cur + (<usize>i << 2)) == b) i++;
    store<i32>(outA + (<usize>runs << 2), a);
    store<i32>(outB + (<usize>runs << 2), b);
    store<i32>(outN + (<usize>runs << 2), i - start);
    runs++;
    if (i >= n) return runs;
    a = load<i32>(prev + (<usize>i << 2));
    const nb = load<i32>(cur + (<usize>i << 2));
    if (nb != b && (nb < 0 || nb > maxCur)) return -(i + 1);
    b = nb;
    start = i;
    i++;
  }
  return runs; // (not reached: the loop returns)
}
