// Otsu's threshold (Otsu 1979, IEEE Trans. Syst. Man Cybern. 9:62): the bin split that
// maximizes the between-class variance of a histogram.

/**
 * Returns the index t of the last bin of the lower class (samples in bins 0..t are "down"),
 * or -1 when the histogram has fewer than two occupied bins (no split exists).
 */
export function otsuBin(hist: ArrayLike<number>): number {
  let total = 0, sum = 0, occupied = 0;
  for (let i = 0; i < hist.length; i++) {
    const c = hist[i]!;
    if (c > 0) occupied++;
    total += c;
    sum += i * c;
  }
  if (occupied < 2) return -1;
  // Empty bins between the classes give a plateau of equal variance: take its middle.
  let w0 = 0, sum0 = 0, first = -1, last = -1, bestVar = -1;
  for (let t = 0; t < hist.length - 1; t++) {
    const c = hist[t]!;
    w0 += c;
    sum0 += t * c;
    if (w0 === 0) continue;
    const w1 = total - w0;
    if (w1 === 0) break;
    const m0 = sum0 / w0, m1 = (sum - sum0) / w1;
    const between = w0 * w1 * (m0 - m1) * (m0 - m1);
    if (between > bestVar * (1 + 1e-12)) { bestVar = between; first = t; last = t; }
    else if (between >= bestVar * (1 - 1e-12)) last = t;
  }
  return Math.floor((first + last) / 2);
}
