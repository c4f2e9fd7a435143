// Hexagonal frames for the spectrum: resampling of offset-row sites onto a square grid of the
// same density, so the square-grid spectrum (FFT, radial profile, ring order) applies unchanged
// and its period, correlation length and order come out in physical units.
//
// Lattice convention: site (x, y) at (x + (y & 1) / 2, y sqrt(3)/2) lattice constants. The square
// grid has spacing d = sqrt(sqrt(3)/2) ~ 0.9306 (one sample per site area); on a periodic axis
// the number of samples is the rounded side over d and the spacing is adjusted to fit the period
// exactly (a relative difference between the two axes below 1 / (2 n)).
// Interpolation: linear along the two rows bracketing the target point (each row at its own
// half-site offset), then linear between the rows by the target's height (bilinear on the
// sheared lattice). Periodic axes wrap; an open side clamps to the last site.
import type { Frame } from "../types";

const ROW = Math.sqrt(3) / 2;
/** Spacing of the square grid with one sample per hexagonal site, in lattice constants. */
export const HEX_SQUARE_SPACING = Math.sqrt(ROW);

export interface HexResampled {
  frame: Frame & { data: Float32Array };
  /** Spacing of the square samples along x and y, in lattice constants. */
  dx: number;
  dy: number;
}

/** Resamples hexagonal samples (`width` sites x `height` rows, offset rows) onto a square grid. */
export function resampleHexToSquare(
  data: ArrayLike<number>, width: number, height: number, periodicX: boolean, periodicY: boolean,
): HexResampled {
  const sizeX = periodicX ? width : width - 0.5; // span of the site positions (open: 0 .. w - 1/2)
  const sizeY = periodicY ? height * ROW : (height - 1) * ROW;
  const wo = Math.max(1, periodicX ? Math.round(sizeX / HEX_SQUARE_SPACING) : Math.floor(sizeX / HEX_SQUARE_SPACING) + 1);
  const ho = Math.max(1, periodicY ? Math.round(sizeY / HEX_SQUARE_SPACING) : Math.floor(sizeY / HEX_SQUARE_SPACING) + 1);
  const dx = periodicX ? sizeX / wo : HEX_SQUARE_SPACING;
  const dy = periodicY ? sizeY / ho : HEX_SQUARE_SPACING;
  const out = new Float32Array(wo * ho);
  // Per output column and row parity: the two sites along the row and the weight of the second.
  const i0 = [new Int32Array(wo), new Int32Array(wo)], i1 = [new Int32Array(wo), new Int32Array(wo)];
  const wt = [new Float64Array(wo), new Float64Array(wo)];
  const wrapX = (i: number) => (periodicX ? ((i % width) + width) % width : Math.min(width - 1, Math.max(0, i)));
  for (let p = 0; p < 2; p++) {
    for (let i = 0; i < wo; i++) {
      const u = i * dx - p / 2;
      const f = Math.floor(u);
      i0[p]![i] = wrapX(f); i1[p]![i] = wrapX(f + 1); wt[p]![i] = u - f;
    }
  }
  const wrapY = (r: number) => (periodicY ? ((r % height) + height) % height : Math.min(height - 1, Math.max(0, r)));
  for (let j = 0; j < ho; j++) {
    const rf = (j * dy) / ROW;
    const r0 = Math.floor(rf), sw = rf - r0;
    const ra = wrapY(r0), rb = wrapY(r0 + 1);
    const pa = ra & 1, pb = rb & 1;
    const a0 = i0[pa]!, a1 = i1[pa]!, aw = wt[pa]!, b0 = i0[pb]!, b1 = i1[pb]!, bw = wt[pb]!;
    const oa = ra * width, ob = rb * width, oj = j * wo;
    for (let i = 0; i < wo; i++) {
      const va = data[oa + a0[i]!]! + aw[i]! * (data[oa + a1[i]!]! - data[oa + a0[i]!]!);
      const vb = data[ob + b0[i]!]! + bw[i]! * (data[ob + b1[i]!]! - data[ob + b0[i]!]!);
      out[oj + i] = va + sw * (vb - va);
    }
  }
  return { frame: { width: wo, height: ho, data: out }, dx, dy };
}
