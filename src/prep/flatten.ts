// Background surfaces removed before thresholding: a least-squares polynomial surface of low
// order, and per-line levelling (each row's median or mean). Both work in place on Float32 frames.

/**
 * Least-squares fit of sum c[a,b] u^a v^b (a + b <= order) to the samples, with u, v the column
 * and row mapped onto [-1, 1]. On a full grid the normal matrix separates into column and row
 * power sums, G[(a,b),(c,d)] = Su[a+c] Sv[b+d], so the fit costs (order + 1) passes' worth of
 * multiply-adds per pixel; it is solved by Cholesky factorization in double precision.
 */
export class PolynomialSurface {
  readonly width: number;
  readonly height: number;
  readonly order: number;
  /** Exponent pairs [a, b] of the terms, in the order of `fit`'s coefficients. */
  readonly terms: ReadonlyArray<readonly [number, number]>;
  private readonly powU: Float64Array; // powU[a * width + x] = u_x^a
  private readonly powV: Float64Array; // powV[b * height + y] = v_y^b
  private readonly chol: Float64Array; // lower-triangular factor of the normal matrix
  private readonly rowMoments: Float64Array;
  private readonly rhs: Float64Array;

  constructor(width: number, height: number, order: number) {
    if (width <= order || height <= order) {
      throw new Error(
        `flatten: a surface of order ${order} needs at least ${order + 1} x ${order + 1} pixels, got ${width} x ${height}`,
      );
    }
    this.width = width;
    this.height = height;
    this.order = order;
    const terms: [number, number][] = [];
    for (let total = 0; total <= order; total++) {
      for (let b = 0; b <= total; b++) terms.push([total - b, b]);
    }
    this.terms = terms;
    const powers = (n: number, deg: number) => {
      const p = new Float64Array((deg + 1) * n);
      for (let i = 0; i < n; i++) {
        const u = n === 1 ? 0 : (2 * i - (n - 1)) / (n - 1);
        let v = 1;
        for (let a = 0; a <= deg; a++) { p[a * n + i] = v; v *= u; }
      }
      return p;
    };
    this.powU = powers(width, order);
    this.powV = powers(height, order);
    const su = powers(width, 2 * order), sv = powers(height, 2 * order);
    const sumU = new Float64Array(2 * order + 1), sumV = new Float64Array(2 * order + 1);
    for (let a = 0; a <= 2 * order; a++) {
      for (let x = 0; x < width; x++) sumU[a]! += su[a * width + x]!;
      for (let y = 0; y < height; y++) sumV[a]! += sv[a * height + y]!;
    }
    const m = terms.length;
    const g = new Float64Array(m * m);
    for (let i = 0; i < m; i++) {
      for (let j = 0; j < m; j++) {
        g[i * m + j] = sumU[terms[i]![0] + terms[j]![0]]! * sumV[terms[i]![1] + terms[j]![1]]!;
      }
    }
    // Cholesky: g = L L^T (positive definite: the monomials are independent on >= order+1 points).
    for (let j = 0; j < m; j++) {
      let d = g[j * m + j]!;
      for (let k = 0; k < j; k++) d -= g[j * m + k]! * g[j * m + k]!;
      const l = Math.sqrt(d);
      g[j * m + j] = l;
      for (let i = j + 1; i < m; i++) {
        let s = g[i * m + j]!;
        for (let k = 0; k < j; k++) s -= g[i * m + k]! * g[j * m + k]!;
        g[i * m + j] = s / l;
      }
    }
    this.chol = g;
    this.rowMoments = new Float64Array(order + 1);
    this.rhs = new Float64Array(m);
  }

  /** Coefficients c (one per term) of the least-squares surface through `data`. */
  fit(data: Float32Array): Float64Array {
    const { width: w, height: h, order, powU, powV, rowMoments, rhs, chol } = this;
    const m = this.terms.length;
    rhs.fill(0);
    for (let y = 0; y < h; y++) {
      const o = y * w;
      for (let a = 0; a <= order; a++) {
        let s = 0;
        const p = a * w;
        for (let x = 0; x < w; x++) s += data[o + x]! * powU[p + x]!;
        rowMoments[a] = s;
      }
      for (let i = 0; i < m; i++) {
        const [a, b] = this.terms[i]!;
        rhs[i]! += rowMoments[a]! * powV[b * h + y]!;
      }
    }
    const c = new Float64Array(m);
    for (let i = 0; i < m; i++) { // L z = rhs
      let s = rhs[i]!;
      for (let k = 0; k < i; k++) s -= chol[i * m + k]! * c[k]!;
      c[i] = s / chol[i * m + i]!;
    }
    for (let i = m - 1; i >= 0; i--) { // L^T c = z
      let s = c[i]!;
      for (let k = i + 1; k < m; k++) s -= chol[k * m + i]! * c[k]!;
      c[i] = s / chol[i * m + i]!;
    }
    return c;
  }

  /** data -= surface(c) - offset, row by row (the surface as a polynomial in u per row). */
  subtract(data: Float32Array, c: Float64Array, offset: number): void {
    const { width: w, height: h, order, powU, powV, rowMoments: cu } = this;
    for (let y = 0; y < h; y++) {
      cu.fill(0);
      for (let i = 0; i < this.terms.length; i++) {
        const [a, b] = this.terms[i]!;
        cu[a]! += c[i]! * powV[b * h + y]!;
      }
      const o = y * w;
      for (let x = 0; x < w; x++) {
        let s = 0;
        for (let a = 0; a <= order; a++) s += cu[a]! * powU[a * w + x]!;
        data[o + x] = data[o + x]! - s + offset;
      }
    }
  }
}

/** Median of the first n entries of `scratch` (reordered): the mean of the middle two for even n. */
export function medianInPlace(scratch: Float32Array | Float64Array, n: number): number {
  const v = scratch.subarray(0, n).sort();
  const m = n >> 1;
  return n % 2 === 1 ? v[m]! : 0.5 * (v[m - 1]! + v[m]!);
}

/**
 * Per-line levelling: subtracts from each row its median or mean, then adds `offset` back.
 * Returns the mean of the removed row levels (what `offset: 'mean'` adds back).
 */
export function levelLines(
  data: Float32Array, width: number, height: number, statistic: "median" | "mean",
  offset: "mean" | "zero", rowLevels: Float64Array, scratch: Float32Array,
): number {
  let total = 0;
  for (let y = 0; y < height; y++) {
    const row = data.subarray(y * width, (y + 1) * width);
    let level: number;
    if (statistic === "mean") {
      let s = 0;
      for (let x = 0; x < width; x++) s += row[x]!;
      level = s / width;
    } else {
      scratch.set(row);
      level = medianInPlace(scratch, width);
    }
    rowLevels[y] = level;
    total += level;
  }
  const mean = total / height;
  const add = offset === "mean" ? mean : 0;
  for (let y = 0; y < height; y++) {
    const o = y * width, shift = add - rowLevels[y]!;
    for (let x = 0; x < width; x++) data[o + x]! += shift;
  }
  return mean;
}
