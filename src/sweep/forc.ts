// FORC distribution rho(Ha, Hb) = -(1/2) d2M/dHa dHb by a local second-order least-squares fit
// (Pike, Roberts & Verosub 1999, J. Appl. Phys. 85:6660), and its map in Hc = (Hb - Ha)/2,
// Hu = (Ha + Hb)/2 (Roberts, Pike & Verosub 2000, J. Geophys. Res. 105:28461).

import { bracket } from "./interpolate";
import {
  type ReversalCurve,
  type ReversalCurvesFromSweepOptions,
  type ReversalGridOptions,
  resampleReversalCurves,
  reversalCurvesFromSweep,
} from "./reversal-curves";

/** Options of {@link forcDistribution}. Grid options are those of the shared reversal-curve grid. */
export interface ForcOptions extends ReversalGridOptions {
  /**
   * SF: the fit at each grid point uses the (2 SF + 1)^2 grid points with |di|, |dj| <= SF.
   * @default 3
   */
  smoothingFactor?: number;
  /**
   * Step of both axes of the (Hc, Hu) map. Default: the Hb step of the grid.
   * @default undefined (the Hb step)
   */
  coordinateStep?: number;
}

/**
 * Why a grid point has no rho: `"not-measured"` = no resampled M at the point itself;
 * `"incomplete-window"` = M is there but some of the (2 SF + 1)^2 points around it are missing
 * or fall off the grid.
 */
export type ForcPointStatus = "ok" | "not-measured" | "incomplete-window";

/** rho resampled onto a regular (Hc, Hu) grid. */
export interface CoercivityInteractionMap {
  /** Hc = (Hb - Ha)/2 axis, from 0, evenly spaced. */
  coercivity: number[];
  /** Hu = (Ha + Hb)/2 axis, evenly spaced. */
  interaction: number[];
  /**
   * `rho[u * coercivity.length + c]` at (coercivity[c], interaction[u]): bilinear interpolation
   * of rho(Ha, Hb) at Ha = Hu - Hc, Hb = Hu + Hc; `null` unless all four surrounding grid points
   * have rho. Values are rho(Ha, Hb) itself, not rescaled for dHa dHb = 2 dHc dHu.
   */
  rho: (number | null)[];
}

/** Result of {@link forcDistribution}. */
export interface ForcDistribution {
  /** Ha axis (rows): the reversal fields of the curves, ascending. */
  reversalFields: number[];
  /** Hb axis (columns), evenly spaced. */
  fields: number[];
  /** The resampled M, `magnetization[i * fields.length + j]`, `null` where not measured. */
  magnetization: (number | null)[];
  /** rho(Ha, Hb) at the same points, `null` where `status` is not `"ok"`. Units: M / field^2. */
  rho: (number | null)[];
  status: ForcPointStatus[];
  counts: { ok: number; notMeasured: number; incompleteWindow: number };
  coercivityInteraction: CoercivityInteractionMap;
  options: {
    smoothingFactor: number;
    coordinateStep: number;
    fieldStep: number;
    fieldRange: [number, number];
    region: "measured" | "extended";
  };
}

/**
 * FORC distribution of a set of reversal curves. M is resampled onto the regular grid of
 * {@link resampleReversalCurves} (linear interpolation along each curve in Hb; rows at the curves'
 * own Ha). At each grid point, a1 + a2 Ha + a3 Ha^2 + a4 Hb + a5 Hb^2 + a6 Ha Hb is fitted by least
 * squares to the (2 SF + 1)^2 points around it, using their actual (Ha, Hb), and rho = -a6/2.
 * Points whose window is incomplete have rho `null`, with their status and counts.
 * Throws when no grid point at all has a complete window (curves too short or too few for SF).
 */
export function forcDistribution(curves: ReversalCurve[], options: ForcOptions = {}): ForcDistribution {
  const sf = options.smoothingFactor ?? 3;
  if (!Number.isInteger(sf) || sf < 1) {
    throw new Error(`forcDistribution: expected an integer smoothingFactor >= 1, got ${sf}`);
  }
  const grid = resampleReversalCurves(curves, options);
  const ha = grid.reversalFields;
  const hb = grid.fields;
  const na = ha.length;
  const nb = hb.length;
  const m = grid.values;
  const s = grid.options.fieldStep;
  const rho = new Array<number | null>(na * nb).fill(null);
  const status = new Array<ForcPointStatus>(na * nb);
  const counts = { ok: 0, notMeasured: 0, incompleteWindow: 0 };
  const ata = new Float64Array(36);
  const atz = new Float64Array(6);
  const row = new Float64Array(6);

  for (let i = 0; i < na; i++) {
    for (let j = 0; j < nb; j++) {
      const at = i * nb + j;
      if (m[at] === null) {
        status[at] = "not-measured";
        counts.notMeasured++;
        continue;
      }
      let complete = i - sf >= 0 && i + sf < na && j - sf >= 0 && j + sf < nb;
      for (let di = -sf; complete && di <= sf; di++) {
        for (let dj = -sf; dj <= sf; dj++) {
          if (m[(i + di) * nb + j + dj] === null) {
            complete = false;
            break;
          }
        }
      }
      if (!complete) {
        status[at] = "incomplete-window";
        counts.incompleteWindow++;
        continue;
      }
      // Normal equations in coordinates centred on the point and scaled by the Hb step.
      ata.fill(0);
      atz.fill(0);
      for (let di = -sf; di <= sf; di++) {
        const x = (ha[i + di] - ha[i]) / s;
        for (let dj = -sf; dj <= sf; dj++) {
          const y = (hb[j + dj] - hb[j]) / s;
          const z = m[(i + di) * nb + j + dj] as number;
          row[0] = 1;
          row[1] = x;
          row[2] = x * x;
          row[3] = y;
          row[4] = y * y;
          row[5] = x * y;
          for (let p = 0; p < 6; p++) {
            atz[p] += row[p] * z;
            for (let q = 0; q < 6; q++) ata[p * 6 + q] += row[p] * row[q];
          }
        }
      }
      const a = solve6(ata, atz);
      if (a === undefined) {
        status[at] = "incomplete-window";
        counts.incompleteWindow++;
        continue;
      }
      rho[at] = -a / (2 * s * s);
      status[at] = "ok";
      counts.ok++;
    }
  }
  if (counts.ok === 0) {
    const longest = curves.reduce((a, c) => Math.max(a, c.field.length), 0);
    throw new Error(
      `forcDistribution: no grid point has a complete (2 SF + 1)^2 = ${(2 * sf + 1) ** 2}-point window ` +
        `at SF = ${sf}: that needs ${2 * sf + 1} curves and ${2 * sf + 1} grid fields on each; ` +
        `got ${na} curves, the longest with ${longest} samples, on a grid of ${nb} Hb values ` +
        `(step ${s}). Use a smaller SF or longer curves.`,
    );
  }
  const coordinateStep = options.coordinateStep ?? s;
  if (!(coordinateStep > 0)) throw new Error(`forcDistribution: expected coordinateStep > 0, got ${coordinateStep}`);
  return {
    reversalFields: ha,
    fields: hb,
    magnetization: m,
    rho,
    status,
    counts,
    coercivityInteraction: toCoercivityInteraction(ha, hb, rho, coordinateStep),
    options: { smoothingFactor: sf, coordinateStep, ...grid.options },
  };
}

/** Options of {@link forcFromSweep}: splitting plus FORC options. */
export interface ForcFromSweepOptions extends ForcOptions, ReversalCurvesFromSweepOptions {}

/**
 * FORC distribution of a single per-frame sweep: reversal curves are cut out with
 * {@link reversalCurvesFromSweep} (each ascending branch after a descending one, starting at its
 * turning field), then passed to {@link forcDistribution}.
 */
export function forcFromSweep(
  field: ArrayLike<number>,
  magnetization: ArrayLike<number>,
  options: ForcFromSweepOptions = {},
): ForcDistribution & { curves: number; fieldTolerance: number } {
  const curves = reversalCurvesFromSweep(field, magnetization, options);
  if (curves.length === 0) {
    throw new Error("forcFromSweep: the sweep holds no ascending branch after a descending one, so no reversal curve");
  }
  return { ...forcDistribution(curves, options), curves: curves.length, fieldTolerance: options.fieldTolerance ?? 0 };
}

/** a6 of the 6 x 6 system A a = b (Gaussian elimination, partial pivoting), or undefined if singular. */
function solve6(ata: Float64Array, atz: Float64Array): number | undefined {
  const a = Float64Array.from(ata);
  const b = Float64Array.from(atz);
  for (let c = 0; c < 6; c++) {
    let p = c;
    for (let r = c + 1; r < 6; r++) if (Math.abs(a[r * 6 + c]) > Math.abs(a[p * 6 + c])) p = r;
    if (Math.abs(a[p * 6 + c]) < 1e-12 * Math.abs(a[0])) return undefined;
    if (p !== c) {
      for (let q = 0; q < 6; q++) {
        const t = a[c * 6 + q];
        a[c * 6 + q] = a[p * 6 + q];
        a[p * 6 + q] = t;
      }
      const t = b[c];
      b[c] = b[p];
      b[p] = t;
    }
    for (let r = c + 1; r < 6; r++) {
      const f = a[r * 6 + c] / a[c * 6 + c];
      if (f === 0) continue;
      for (let q = c; q < 6; q++) a[r * 6 + q] -= f * a[c * 6 + q];
      b[r] -= f * b[c];
    }
  }
  // Only the last unknown is needed: back substitution stops there.
  return b[5] / a[35];
}

function toCoercivityInteraction(
  ha: number[],
  hb: number[],
  rho: (number | null)[],
  step: number,
): CoercivityInteractionMap {
  const nb = hb.length;
  let hcMax = 0;
  let huMin = Infinity;
  let huMax = -Infinity;
  for (let i = 0; i < ha.length; i++) {
    for (let j = 0; j < nb; j++) {
      if (rho[i * nb + j] === null) continue;
      hcMax = Math.max(hcMax, (hb[j] - ha[i]) / 2);
      huMin = Math.min(huMin, (ha[i] + hb[j]) / 2);
      huMax = Math.max(huMax, (ha[i] + hb[j]) / 2);
    }
  }
  const nc = Math.floor(hcMax / step + 1e-9) + 1;
  const start = Math.floor(huMin / step + 1e-9) * step;
  const nu = Math.floor((huMax - start) / step + 1e-9) + 1;
  const coercivity = Array.from({ length: nc }, (_, c) => c * step);
  const interaction = Array.from({ length: nu }, (_, u) => start + u * step);
  const out = new Array<number | null>(nc * nu).fill(null);
  const slack = 1e-9 * step;
  for (let u = 0; u < nu; u++) {
    for (let c = 0; c < nc; c++) {
      const a = interaction[u] - coercivity[c];
      const b = interaction[u] + coercivity[c];
      const i = bracket(ha, a, slack);
      const j = bracket(hb, b, slack);
      if (i < 0 || j < 0) continue;
      const i1 = Math.min(i + 1, ha.length - 1);
      const j1 = Math.min(j + 1, nb - 1);
      const r00 = rho[i * nb + j];
      const r01 = rho[i * nb + j1];
      const r10 = rho[i1 * nb + j];
      const r11 = rho[i1 * nb + j1];
      if (r00 === null || r01 === null || r10 === null || r11 === null) continue;
      const t = i1 === i ? 0 : Math.min(1, Math.max(0, (a - ha[i]) / (ha[i1] - ha[i])));
      const v = j1 === j ? 0 : Math.min(1, Math.max(0, (b - hb[j]) / (hb[j1] - hb[j])));
      out[u * nc + c] = (1 - t) * ((1 - v) * r00 + v * r01) + t * ((1 - v) * r10 + v * r11);
    }
  }
  return { coercivity, interaction, rho: out };
}
