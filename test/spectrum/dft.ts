// Reference transforms for the FFT tests: a direct separable DFT in f64.
import { uniformSource } from "../../src/demo/random";

/** Direct 2-D DFT of a real w x h frame: returns re, im of X(kx, ky) at [ky * w + kx]. */
export function directDft2(data: ArrayLike<number>, w: number, h: number): { re: Float64Array; im: Float64Array } {
  // along x for every row, then along y for every column
  const rr = new Float64Array(w * h), ri = new Float64Array(w * h);
  const cw = new Float64Array(w), sw = new Float64Array(w);
  for (let k = 0; k < w; k++) { cw[k] = Math.cos((2 * Math.PI * k) / w); sw[k] = Math.sin((2 * Math.PI * k) / w); }
  for (let y = 0; y < h; y++) {
    for (let kx = 0; kx < w; kx++) {
      let a = 0, b = 0;
      for (let x = 0; x < w; x++) {
        const e = (kx * x) % w, v = data[y * w + x]!;
        a += v * cw[e]!; b -= v * sw[e]!;
      }
      rr[y * w + kx] = a; ri[y * w + kx] = b;
    }
  }
  const ch = new Float64Array(h), sh = new Float64Array(h);
  for (let k = 0; k < h; k++) { ch[k] = Math.cos((2 * Math.PI * k) / h); sh[k] = Math.sin((2 * Math.PI * k) / h); }
  const re = new Float64Array(w * h), im = new Float64Array(w * h);
  for (let kx = 0; kx < w; kx++) {
    for (let ky = 0; ky < h; ky++) {
      let a = 0, b = 0;
      for (let y = 0; y < h; y++) {
        const e = (ky * y) % h, c = ch[e]!, s = -sh[e]!;
        const xr = rr[y * w + kx]!, xi = ri[y * w + kx]!;
        a += xr * c - xi * s; b += xr * s + xi * c;
      }
      re[ky * w + kx] = a; im[ky * w + kx] = b;
    }
  }
  return { re, im };
}

/** Seeded uniform numbers in [0, 1): the project's mulberry32 (src/demo/random.ts). */
export const seeded = uniformSource;
