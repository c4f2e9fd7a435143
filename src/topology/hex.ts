// Hexagonal frames: the domains table and the per-phase numbers from the hexagonal kernels, in
// physical units so that they mean the same as a square frame's. Lattice convention: see `Grid`
// in options.ts (odd rows shifted right by half a site, row spacing sqrt(3)/2, site area
// sqrt(3)/2 in lattice constants squared).
import type { HexWorkspace, HexFrameStats } from "../wasm/hex";
import type { DomainTable } from "./domains";

/** Row spacing of the hexagonal lattice, and area of one site's cell, in lattice constants. */
export const HEX_ROW = Math.sqrt(3) / 2;
export const HEX_SITE_AREA = Math.sqrt(3) / 2;

/**
 * Crofton wall length (lattice constants) from the phase changes along the three lattice
 * directions. A curve of length L crosses a family of parallel lines of spacing d, averaged over
 * orientations, 2 L / (pi d) times (Cauchy-Crofton; Ohser & Muecklich 2000, Statistical Analysis
 * of Microstructures). The lattice lines along each of the three directions (60 degrees apart)
 * have spacing d = sqrt(3)/2, and every crossing of a wall by such a line is one phase change
 * between neighbouring sites, so with N = N_0 + N_60 + N_120 the mean over the three directions
 * gives L = (pi d / 2) (N / 3) = (pi sqrt(3) / 12) N.
 */
export function hexCroftonLength(changes: number): number {
  return ((Math.PI * Math.sqrt(3)) / 12) * changes;
}

/** Second moment of a regular hexagonal cell of unit width (flat to flat) about an axis through its centre, per area: 5/72. */
const CELL_MOMENT = 5 / 72;

function wrapMean(c: number, sn: number, size: number): number {
  let a = Math.atan2(sn, c);
  if (a < 0) a += 2 * Math.PI;
  const v = (a * size) / (2 * Math.PI);
  return v >= size ? 0 : v;
}

function mod(v: number, size: number): number {
  return ((v % size) + size) % size;
}

/**
 * The domains table of the last hexagonal labeling, in `pixelSize` units (pixelSize = lattice
 * constant): areas sites x sqrt(3)/2 s^2, centroids, boxes and moments of the site positions
 * (x + (y & 1)/2, y sqrt(3)/2) s, each site a hexagonal cell.
 */
export function buildHexDomainTable(ws: HexWorkspace, pixelSize: number): DomainTable {
  const K = ws.domainCount;
  const w = ws.width, h = ws.height;
  const c = (name: Parameters<HexWorkspace["column"]>[0]) => ws.column(name).slice();
  const area = c("area"), sx = c("sx"), sy = c("sy"), sxx = c("sxx"), syy = c("syy"), sxy = c("sxy");
  const minX = c("minX"), maxX = c("maxX"), minY = c("minY"), maxY = c("maxY"), euler = c("euler");
  const crossings = c("crossings"), flags = c("flags"), phase = c("phase");
  const cxc = c("cxc"), cxs = c("cxs"), cyc = c("cyc"), cys = c("cys");
  const s = pixelSize, s2 = s * s;
  const sizeY = h * HEX_ROW;
  const t: DomainTable = {
    count: K, phase: new Uint8Array(K), area: new Float64Array(K), wallLength: new Float64Array(K),
    euler: new Int32Array(K), holes: new Float64Array(K), centroidX: new Float64Array(K),
    centroidY: new Float64Array(K), bboxX: new Float64Array(K), bboxY: new Float64Array(K),
    bboxWidth: new Float64Array(K), bboxHeight: new Float64Array(K),
    equivalentDiameter: new Float64Array(K), elongation: new Float64Array(K),
    orientation: new Float64Array(K), wrapsX: new Uint8Array(K), wrapsY: new Uint8Array(K),
    edge: new Uint8Array(K),
  };
  for (let d = 1; d <= K; d++) {
    const i = d - 1;
    const n = area[d]!;
    const f = flags[d]!;
    const wx = (f & 1) !== 0, wy = (f & 2) !== 0;
    const a = n * HEX_SITE_AREA;
    t.phase[i] = phase[d]!;
    t.area[i] = a * s2;
    t.wallLength[i] = hexCroftonLength(crossings[d]!) * s;
    t.euler[i] = euler[d]!;
    t.holes[i] = wx || wy ? NaN : 1 - euler[d]!;
    t.wrapsX[i] = wx ? 1 : 0;
    t.wrapsY[i] = wy ? 1 : 0;
    t.edge[i] = (f & 4) !== 0 ? 1 : 0;
    const mx = sx[d]! / n, my = sy[d]! / n;
    t.centroidX[i] = (wx ? wrapMean(cxc[d]!, cxs[d]!, w) : mod(mx, w)) * s;
    t.centroidY[i] = (wy ? wrapMean(cyc[d]!, cys[d]!, h) * HEX_ROW : mod(my, sizeY)) * s;
    // Boxes from the site centres, extended by one site spacing along x and one row along y
    // (as a square frame's box spans maxX - minX + 1 pixels).
    t.bboxX[i] = (wx ? 0 : mod(minX[d]!, w)) * s;
    t.bboxWidth[i] = (wx ? w : maxX[d]! - minX[d]! + 1) * s;
    t.bboxY[i] = (wy ? 0 : mod(minY[d]!, h) * HEX_ROW) * s;
    t.bboxHeight[i] = (wy ? sizeY : (maxY[d]! - minY[d]! + 1) * HEX_ROW) * s;
    t.equivalentDiameter[i] = Math.sqrt((4 * a) / Math.PI) * s;
    if (wx || wy) {
      t.elongation[i] = NaN;
      t.orientation[i] = NaN;
    } else {
      const uxx = sxx[d]! / n - mx * mx + CELL_MOMENT;
      const uyy = syy[d]! / n - my * my + CELL_MOMENT;
      const uxy = sxy[d]! / n - mx * my;
      const half = (uxx + uyy) / 2;
      const root = Math.sqrt(((uxx - uyy) / 2) ** 2 + uxy * uxy);
      const major = half + root, minor = Math.max(half - root, 1e-12);
      t.elongation[i] = Math.sqrt(major / minor);
      let deg = (0.5 * Math.atan2(-2 * uxy, uxx - uyy) * 180) / Math.PI;
      if (deg <= -90) deg += 180;
      t.orientation[i] = Math.abs(deg) < 1e-9 ? 0 : deg;
    }
  }
  return t;
}

/** Euler numbers V - E + F of the two phases' lattice subcomplexes. */
export function hexPhaseEulers(stats: HexFrameStats): { up: number; down: number } {
  return {
    up: stats.up.v - stats.up.e + stats.up.f,
    down: stats.down.v - stats.down.e + stats.down.f,
  };
}

/** Crofton wall length of the whole frame, lattice constants. */
export function hexFrameWallLength(stats: HexFrameStats): number {
  const [a, b, c] = stats.crossings;
  return hexCroftonLength(a + b + c);
}
