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
  // Value of row r (any integer; wrapped or clamped) at position X along the row.
  const rowAt = (r: number, X: number): number => {
    if (periodicY) r = ((r % height) + height) % height;
    else r = Math.min(height - 1, Math.max(0, r));
    const u = X - (r & 1) / 2;
    let i0 = Math.floor(u);
    const t = u - i0;
    let i1 = i0 + 1;
    if (periodicX) {
      i0 = ((i0 % width) + width) % width;
      i1 = ((i1 % width) + width) % width;
    } else {
      i0 = Math.min(width - 1, Math.max(0, i0));
      i1 = Math.min(width - 1, Math.max(0, i1));
    }
    const row = r * width;
    return (1 - t) * data[row + i0]! + t * data[row + i1]!;
  };
  for (let j = 0; j < ho; j++) {
    const Y = j * dy;
    const rf = Y / ROW;
    const r0 = Math.floor(rf), s = rf - r0;
    for (let i = 0; i < wo; i++) {
      const X = i * dx;
      const a = rowAt(r0, X);
      out[j * wo + i] = s > 0 ? (1 - s) * a + s * rowAt(r0 + 1, X) : a;
    }
  }
  return { frame: { width: wo, height: ho, data: out }, dx, dy };
}
