// The domains table: one row per domain (struct of arrays), built from the kernel accumulators.
import type { LabelingWorkspace } from "../wasm/labeling";

/** Per-domain columns; row i describes the domain with label id i + 1. */
export interface DomainTable {
  count: number;
  /** 1 up, 0 down. */
  phase: Uint8Array;
  /** Area in unit^2. */
  area: Float64Array;
  /** Crofton estimate of the domain's wall length in unit (walls against the image border excluded). */
  wallLength: Float64Array;
  /** Euler number of the domain under its phase's connectivity (on the torus where periodic). */
  euler: Int32Array;
  /** Holes = 1 - Euler number; NaN for domains that wrap (holes are not defined there). */
  holes: Float64Array;
  /** Centroid in unit; on periodic axes in [0, size) (circular mean along axes the domain wraps). */
  centroidX: Float64Array;
  centroidY: Float64Array;
  /** Bounding box in unit; on periodic axes it may run past the far side (x + width > frame). */
  bboxX: Float64Array;
  bboxY: Float64Array;
  bboxWidth: Float64Array;
  bboxHeight: Float64Array;
  /** Diameter of the disc of equal area, in unit. */
  equivalentDiameter: Float64Array;
  /** sqrt(major / minor second moment) of the pixel set (pixels as unit squares); NaN if it wraps. */
  elongation: Float64Array;
  /** Major-axis angle in degrees in (-90, 90], counter-clockwise from +x as displayed (rows run down). NaN if it wraps. */
  orientation: Float64Array;
  /** 1 when the domain winds around the periodic x (y) side. */
  wrapsX: Uint8Array;
  wrapsY: Uint8Array;
  /** 1 when the domain touches an open image side (its shape statistics are biased). */
  edge: Uint8Array;
}

const CROFTON = Math.PI / 8; // L = (pi/8) [N0 + N90 + (N45 + N135)/sqrt 2], Ohser & Muecklich 2000

/** Crofton wall length (pixels) from phase-change counts along the four grid directions. */
export function croftonLength(n0: number, n90: number, n45: number, n135: number): number {
  return CROFTON * (n0 + n90 + (n45 + n135) / Math.SQRT2);
}

/** Circular mean position in [0, size) from sums of cos and sin of 2 pi v / size. */
function wrapMean(c: number, sn: number, size: number): number {
  let a = Math.atan2(sn, c);
  if (a < 0) a += 2 * Math.PI;
  const v = (a * size) / (2 * Math.PI);
  return v >= size ? 0 : v;
}

function mod(v: number, size: number): number {
  return ((v % size) + size) % size;
}

export function buildDomainTable(ws: LabelingWorkspace, pixelSize: number): DomainTable {
  const K = ws.domainCount;
  const w = ws.width, h = ws.height;
  const area = ws.i32Column("area"), minX = ws.i32Column("minX"), maxX = ws.i32Column("maxX");
  const minY = ws.i32Column("minY"), maxY = ws.i32Column("maxY"), euler4 = ws.i32Column("euler4");
  const n0 = ws.i32Column("n0"), n90 = ws.i32Column("n90"), n45 = ws.i32Column("n45");
  const n135 = ws.i32Column("n135"), flags = ws.i32Column("flags"), phase = ws.i32Column("phase");
  const sx = ws.f64Column("sx"), sy = ws.f64Column("sy"), sxx = ws.f64Column("sxx");
  const syy = ws.f64Column("syy"), sxy = ws.f64Column("sxy");
  const cxc = ws.f64Column("cxc"), cxs = ws.f64Column("cxs");
  const cyc = ws.f64Column("cyc"), cys = ws.f64Column("cys");
  const s = pixelSize, s2 = s * s;
  // Columns as locals and the helpers at module level: one pass of plain typed-array stores.
  const tPhase = new Uint8Array(K), tArea = new Float64Array(K), tWall = new Float64Array(K);
  const tEuler = new Int32Array(K), tHoles = new Float64Array(K);
  const tCx = new Float64Array(K), tCy = new Float64Array(K);
  const tBx = new Float64Array(K), tBy = new Float64Array(K);
  const tBw = new Float64Array(K), tBh = new Float64Array(K);
  const tDiam = new Float64Array(K), tElong = new Float64Array(K), tOrient = new Float64Array(K);
  const tWx = new Uint8Array(K), tWy = new Uint8Array(K), tEdge = new Uint8Array(K);
  for (let d = 1; d <= K; d++) {
    const i = d - 1;
    const a = area[d]!;
    const f = flags[d]!;
    const wx = (f & 1) !== 0, wy = (f & 2) !== 0;
    tPhase[i] = phase[d]!;
    tArea[i] = a * s2;
    tWall[i] = croftonLength(n0[d]!, n90[d]!, n45[d]!, n135[d]!) * s;
    const e4 = euler4[d]!;
    tEuler[i] = e4 / 4;
    tHoles[i] = wx || wy ? NaN : 1 - e4 / 4;
    tWx[i] = f & 1;
    tWy[i] = (f >> 1) & 1;
    tEdge[i] = (f >> 2) & 1;
    const mx = sx[d]! / a, my = sy[d]! / a;
    // Pixel centres sit at integer coordinates; report centroids in the same convention.
    tCx[i] = (wx ? wrapMean(cxc[d]!, cxs[d]!, w) : mod(mx, w)) * s;
    tCy[i] = (wy ? wrapMean(cyc[d]!, cys[d]!, h) : mod(my, h)) * s;
    tBx[i] = (wx ? 0 : mod(minX[d]!, w)) * s;
    tBw[i] = (wx ? w : maxX[d]! - minX[d]! + 1) * s;
    tBy[i] = (wy ? 0 : mod(minY[d]!, h)) * s;
    tBh[i] = (wy ? h : maxY[d]! - minY[d]! + 1) * s;
    tDiam[i] = Math.sqrt((4 * a) / Math.PI) * s;
    if (wx || wy) {
      tElong[i] = NaN;
      tOrient[i] = NaN;
    } else {
      // Central second moments of the pixel set, each pixel a unit square (adds 1/12).
      const uxx = sxx[d]! / a - mx * mx + 1 / 12;
      const uyy = syy[d]! / a - my * my + 1 / 12;
      const uxy = sxy[d]! / a - mx * my;
      const half = (uxx + uyy) / 2;
      const root = Math.sqrt(((uxx - uyy) / 2) ** 2 + uxy * uxy);
      const major = half + root, minor = Math.max(half - root, 1e-12);
      tElong[i] = Math.sqrt(major / minor);
      let deg = (0.5 * Math.atan2(-2 * uxy, uxx - uyy) * 180) / Math.PI;
      if (deg <= -90) deg += 180;
      tOrient[i] = Math.abs(deg) < 1e-9 ? 0 : deg;
    }
  }
  const t: DomainTable = {
    count: K, phase: tPhase, area: tArea, wallLength: tWall, euler: tEuler, holes: tHoles,
    centroidX: tCx, centroidY: tCy, bboxX: tBx, bboxY: tBy, bboxWidth: tBw, bboxHeight: tBh,
    equivalentDiameter: tDiam, elongation: tElong, orientation: tOrient,
    wrapsX: tWx, wrapsY: tWy, edge: tEdge,
  };
  return t;
}
