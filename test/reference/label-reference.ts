// A plain-TypeScript reference labeler for checking the Wasm kernels: breadth-first flood fill
// of both phases of a 0/1 phase map, written to be obviously correct rather than fast.
//
// The up phase is 8- or 4-connected and the down phase gets the complement. Each axis is open or
// periodic on its own. Wrap detection is exact: the flood fill carries unwrapped coordinates
// (the "lift" of every pixel into the plane). Every edge of a domain that is not used to reach a
// new pixel closes a cycle, and the cycles so closed generate all cycles of the domain; the
// domain winds around the torus along an axis exactly when one of them has a non-zero
// displacement along that axis, i.e. when a pixel is reached again at a different unwrapped
// position.

export interface ReferenceOptions {
  /** Connectivity of the up phase (1); the down phase (0) gets the other one. */
  connectivity: 8 | 4;
  periodicX: boolean;
  periodicY: boolean;
}

export interface ReferenceLabeling {
  width: number;
  height: number;
  /** Domain ids 1..count, numbered in raster order of each domain's first pixel. */
  labels: Int32Array;
  count: number;
  /** Per domain (index id - 1): 1 up, 0 down. */
  phase: Uint8Array;
  area: Int32Array;
  /** Bounding box and centroid of the pixels as they lie in the frame (open-boundary convention;
   * pixel centres at integer coordinates). */
  bboxX: Int32Array;
  bboxY: Int32Array;
  bboxWidth: Int32Array;
  bboxHeight: Int32Array;
  centroidX: Float64Array;
  centroidY: Float64Array;
  /** The same from the unwrapped coordinates, brought back into the frame: the box's start and
   * the centroid taken modulo the size along an axis the domain does not wind around (they do not
   * depend on which copy of the domain the flood fill started in). NaN along a winding axis. */
  liftedBboxX: Float64Array;
  liftedBboxY: Float64Array;
  liftedBboxWidth: Float64Array;
  liftedBboxHeight: Float64Array;
  liftedCentroidX: Float64Array;
  liftedCentroidY: Float64Array;
  /** 1 when the domain winds around the periodic x (y) side. */
  wrapsX: Uint8Array;
  wrapsY: Uint8Array;
  /** 1 when the domain has a pixel on an open side of the frame. */
  edge: Uint8Array;
}

const ORTHOGONAL: ReadonlyArray<readonly [number, number]> = [[1, 0], [-1, 0], [0, 1], [0, -1]];
const DIAGONAL: ReadonlyArray<readonly [number, number]> = [[1, 1], [-1, 1], [1, -1], [-1, -1]];

const mod = (v: number, n: number) => ((v % n) + n) % n;

/** Labels both phases of `phase` (row-major, 1 up / 0 down, `width * height` entries). */
export function referenceLabel(
  phase: Uint8Array, width: number, height: number, options: ReferenceOptions,
): ReferenceLabeling {
  if (phase.length !== width * height) {
    throw new Error(`referenceLabel: expected ${width * height} pixels, got ${phase.length}`);
  }
  const { connectivity, periodicX, periodicY } = options;
  const n = width * height;
  const labels = new Int32Array(n);
  const liftX = new Float64Array(n);
  const liftY = new Float64Array(n);
  const rows: {
    phase: number; area: number; minX: number; maxX: number; minY: number; maxY: number;
    sumX: number; sumY: number; liftMinX: number; liftMaxX: number; liftMinY: number;
    liftMaxY: number; liftSumX: number; liftSumY: number; wrapsX: boolean; wrapsY: boolean;
    edge: boolean;
  }[] = [];

  for (let start = 0; start < n; start++) {
    if (labels[start] !== 0) continue;
    const id = rows.length + 1;
    const v = phase[start]!;
    const steps = v === 1 && connectivity === 8 || v === 0 && connectivity === 4
      ? [...ORTHOGONAL, ...DIAGONAL] : ORTHOGONAL;
    const row = {
      phase: v, area: 0, minX: Infinity, maxX: -Infinity, minY: Infinity, maxY: -Infinity,
      sumX: 0, sumY: 0, liftMinX: Infinity, liftMaxX: -Infinity, liftMinY: Infinity,
      liftMaxY: -Infinity, liftSumX: 0, liftSumY: 0, wrapsX: false, wrapsY: false, edge: false,
    };
    rows.push(row);
    labels[start] = id;
    liftX[start] = start % width;
    liftY[start] = Math.floor(start / width);
    const queue = [start];
    for (let head = 0; head < queue.length; head++) {
      const i = queue[head]!;
      const x = i % width, y = Math.floor(i / width);
      const ux = liftX[i]!, uy = liftY[i]!;
      row.area++;
      row.minX = Math.min(row.minX, x); row.maxX = Math.max(row.maxX, x);
      row.minY = Math.min(row.minY, y); row.maxY = Math.max(row.maxY, y);
      row.sumX += x; row.sumY += y;
      row.liftMinX = Math.min(row.liftMinX, ux); row.liftMaxX = Math.max(row.liftMaxX, ux);
      row.liftMinY = Math.min(row.liftMinY, uy); row.liftMaxY = Math.max(row.liftMaxY, uy);
      row.liftSumX += ux; row.liftSumY += uy;
      if (!periodicX && (x === 0 || x === width - 1)) row.edge = true;
      if (!periodicY && (y === 0 || y === height - 1)) row.edge = true;
      for (const [dx, dy] of steps) {
        const nx = x + dx, ny = y + dy;
        if (!periodicX && (nx < 0 || nx >= width)) continue;
        if (!periodicY && (ny < 0 || ny >= height)) continue;
        const j = mod(ny, height) * width + mod(nx, width);
        if (phase[j] !== v) continue;
        const jx = ux + dx, jy = uy + dy; // where j lies when reached from i
        if (labels[j] === 0) {
          labels[j] = id;
          liftX[j] = jx;
          liftY[j] = jy;
          queue.push(j);
        } else {
          // Same phase and adjacent, so the same domain: a cycle closes here.
          if (liftX[j] !== jx) row.wrapsX = true;
          if (liftY[j] !== jy) row.wrapsY = true;
        }
      }
    }
  }

  const K = rows.length;
  const out: ReferenceLabeling = {
    width, height, labels, count: K,
    phase: new Uint8Array(K), area: new Int32Array(K),
    bboxX: new Int32Array(K), bboxY: new Int32Array(K),
    bboxWidth: new Int32Array(K), bboxHeight: new Int32Array(K),
    centroidX: new Float64Array(K), centroidY: new Float64Array(K),
    liftedBboxX: new Float64Array(K), liftedBboxY: new Float64Array(K),
    liftedBboxWidth: new Float64Array(K), liftedBboxHeight: new Float64Array(K),
    liftedCentroidX: new Float64Array(K), liftedCentroidY: new Float64Array(K),
    wrapsX: new Uint8Array(K), wrapsY: new Uint8Array(K), edge: new Uint8Array(K),
  };
  rows.forEach((r, i) => {
    out.phase[i] = r.phase;
    out.area[i] = r.area;
    out.bboxX[i] = r.minX;
    out.bboxY[i] = r.minY;
    out.bboxWidth[i] = r.maxX - r.minX + 1;
    out.bboxHeight[i] = r.maxY - r.minY + 1;
    out.centroidX[i] = r.sumX / r.area;
    out.centroidY[i] = r.sumY / r.area;
    out.liftedBboxX[i] = r.wrapsX ? NaN : mod(r.liftMinX, width);
    out.liftedBboxY[i] = r.wrapsY ? NaN : mod(r.liftMinY, height);
    out.liftedBboxWidth[i] = r.wrapsX ? NaN : r.liftMaxX - r.liftMinX + 1;
    out.liftedBboxHeight[i] = r.wrapsY ? NaN : r.liftMaxY - r.liftMinY + 1;
    out.liftedCentroidX[i] = r.wrapsX ? NaN : mod(r.liftSumX / r.area, width);
    out.liftedCentroidY[i] = r.wrapsY ? NaN : mod(r.liftSumY / r.area, height);
    out.wrapsX[i] = r.wrapsX ? 1 : 0;
    out.wrapsY[i] = r.wrapsY ? 1 : 0;
    out.edge[i] = r.edge ? 1 : 0;
  });
  return out;
}
