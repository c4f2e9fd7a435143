// Iso-lines of a sampled surface by marching squares (Lorensen & Cline 1987, SIGGRAPH 21:163, in
// its two-dimensional form), with linear interpolation along the cell edges. A cell with an
// undefined corner (null, NaN) contributes nothing, so lines stop at gaps and at the border of the
// sampled region instead of closing around it. Saddle cells are decided by the mean of the four
// corners (the choice the `saddle` connectivity rule makes). Browser-safe: plain data in and out.

/** Shape of a row-major grid: value (x, y) at `values[y * width + x]`. */
export interface GridSize {
  width: number;
  height: number;
}

/** One iso-line in grid coordinates: x = column (fractional), y = row (fractional). */
export interface IsoLine {
  points: Array<[number, number]>;
  /** True for a ring (its last point repeats the first). */
  closed: boolean;
}

// Corner bits: 1 top-left (x, y), 2 top-right (x + 1, y), 4 bottom-right, 8 bottom-left.
// Edges: 0 top, 1 right, 2 bottom, 3 left. Each case lists the edge pairs its segments join.
const SEGMENTS: ReadonlyArray<ReadonlyArray<readonly [number, number]>> = [
  [], [[3, 0]], [[0, 1]], [[3, 1]], [[1, 2]], [], [[0, 2]], [[3, 2]],
  [[3, 2]], [[0, 2]], [], [[1, 2]], [[3, 1]], [[0, 1]], [[3, 0]], [],
];
// Saddles (5: top-left and bottom-right set; 10: the other diagonal), by whether the cell mean
// is on the set side: then the set corners are joined through the centre.
const SADDLE_JOINED = { 5: [[0, 1], [3, 2]], 10: [[3, 0], [1, 2]] } as const;
const SADDLE_APART = { 5: [[3, 0], [1, 2]], 10: [[0, 1], [3, 2]] } as const;

function defined(v: number | null | undefined): v is number {
  return v !== null && v !== undefined && Number.isFinite(v);
}

/**
 * The iso-lines `value = level` of a grid (a point is inside when its value is >= level). Lines
 * are returned as chains of crossing points: open lines end at undefined cells or the border.
 */
export function isoLines(values: ArrayLike<number | null>, size: GridSize, level: number): IsoLine[] {
  const { width: w, height: h } = size;
  if (!Number.isInteger(w) || !Number.isInteger(h) || w < 1 || h < 1) {
    throw new RangeError(`isoLines: expected a whole width and height >= 1, got ${w} x ${h}`);
  }
  if (values.length !== w * h) {
    throw new RangeError(`isoLines: expected ${w} x ${h} = ${w * h} values, got ${values.length}`);
  }
  if (!Number.isFinite(level)) throw new RangeError(`isoLines: expected a finite level, got ${level}`);
  // Edge ids: horizontal edge (x, y)-(x + 1, y) is y * (w - 1) + x; vertical edge (x, y)-(x, y + 1)
  // is H + y * w + x with H = h * (w - 1).
  const horizontal = h * (w - 1);
  const point = new Map<number, [number, number]>();
  const ends: number[] = []; // two edge ids per segment
  const cross = (a: number, b: number) => (level - a) / (b - a);
  for (let y = 0; y + 1 < h; y++) {
    for (let x = 0; x + 1 < w; x++) {
      const tl = values[y * w + x], tr = values[y * w + x + 1];
      const br = values[(y + 1) * w + x + 1], bl = values[(y + 1) * w + x];
      if (!defined(tl) || !defined(tr) || !defined(br) || !defined(bl)) continue;
      const code = (tl >= level ? 1 : 0) | (tr >= level ? 2 : 0) | (br >= level ? 4 : 0) | (bl >= level ? 8 : 0);
      if (code === 0 || code === 15) continue;
      let pairs: ReadonlyArray<readonly [number, number]> = SEGMENTS[code]!;
      if (code === 5 || code === 10) {
        pairs = (tl + tr + br + bl) / 4 >= level ? SADDLE_JOINED[code] : SADDLE_APART[code];
      }
      const edgeId = (e: number): number => {
        let id: number;
        let p: [number, number];
        switch (e) {
          case 0: id = y * (w - 1) + x; p = [x + cross(tl, tr), y]; break;
          case 1: id = horizontal + y * w + x + 1; p = [x + 1, y + cross(tr, br)]; break;
          case 2: id = (y + 1) * (w - 1) + x; p = [x + cross(bl, br), y + 1]; break;
          default: id = horizontal + y * w + x; p = [x, y + cross(tl, bl)]; break;
        }
        if (!point.has(id)) point.set(id, p);
        return id;
      };
      for (const [a, b] of pairs) ends.push(edgeId(a), edgeId(b));
    }
  }
  // Chain the segments: an edge is shared by at most the two cells on either side of it.
  const segmentsAt = new Map<number, number[]>();
  for (let s = 0; s < ends.length / 2; s++) {
    for (const e of [ends[2 * s]!, ends[2 * s + 1]!]) {
      const list = segmentsAt.get(e);
      if (list) list.push(s); else segmentsAt.set(e, [s]);
    }
  }
  const used = new Uint8Array(ends.length / 2);
  const lines: IsoLine[] = [];
  const walk = (firstSegment: number, firstEdge: number) => {
    const pts: Array<[number, number]> = [point.get(firstEdge)!];
    let s = firstSegment, at = firstEdge;
    for (;;) {
      used[s] = 1;
      const next = ends[2 * s] === at ? ends[2 * s + 1]! : ends[2 * s]!;
      pts.push(point.get(next)!);
      at = next;
      const more = segmentsAt.get(at)!.find((t) => !used[t]);
      if (more === undefined) break;
      s = more;
    }
    lines.push({ points: pts, closed: at === firstEdge && pts.length > 2 });
  };
  // Open lines first (from an edge that only one segment uses), then the rings.
  for (const [e, list] of segmentsAt) if (list.length === 1 && !used[list[0]!]) walk(list[0]!, e);
  for (let s = 0; s < used.length; s++) if (!used[s]) walk(s, ends[2 * s]!);
  return lines;
}

/** Input of {@link forcContours}: a FORC grid, row-major `rho[i * fields.length + j]`. */
export interface ContourGrid {
  /** Ha of each row (ascending). */
  reversalFields: ArrayLike<number>;
  /** Hb of each column (ascending). */
  fields: ArrayLike<number>;
  rho: ArrayLike<number | null>;
}

/** Iso-lines of one level, in field units. */
export interface FieldContour {
  /** Level as a fraction of the peak. */
  fraction: number;
  /** Level in units of rho. */
  level: number;
  /** Each line as Hb and Ha of its points. */
  lines: Array<{ field: number[]; reversalField: number[]; closed: boolean }>;
}

/** Default contour levels, fractions of the peak. */
export const CONTOUR_FRACTIONS: readonly number[] = [0.1, 0.3, 0.5, 0.7, 0.9];

/** A fractional index into `axis`, by linear interpolation between neighbouring entries. */
function along(axis: ArrayLike<number>, t: number): number {
  const k = Math.min(Math.max(Math.floor(t), 0), axis.length - 1);
  if (k + 1 >= axis.length) return axis[k]!;
  return axis[k]! + (t - k) * (axis[k + 1]! - axis[k]!);
}

/**
 * Iso-lines of rho(Ha, Hb) at fractions of its (positive) peak, mapped to field units. Points
 * without rho are left out; a grid whose rho is nowhere positive has no contours.
 */
export function forcContours(grid: ContourGrid, fractions: readonly number[] = CONTOUR_FRACTIONS): FieldContour[] {
  const width = grid.fields.length, height = grid.reversalFields.length;
  if (width * height !== grid.rho.length) {
    throw new RangeError(`forcContours: expected ${height} x ${width} = ${width * height} rho values, got ${grid.rho.length}`);
  }
  for (const f of fractions) {
    if (!(f > 0 && f <= 1)) throw new RangeError(`forcContours: expected fractions in (0, 1], got ${f}`);
  }
  let peak = 0;
  for (let i = 0; i < grid.rho.length; i++) {
    const v = grid.rho[i];
    if (defined(v) && v > peak) peak = v;
  }
  if (peak <= 0 || width < 2 || height < 2) return [];
  return fractions.map((fraction) => ({
    fraction, level: fraction * peak,
    lines: isoLines(grid.rho, { width, height }, fraction * peak).map((l) => ({
      field: l.points.map(([x]) => along(grid.fields, x)),
      reversalField: l.points.map(([, y]) => along(grid.reversalFields, y)),
      closed: l.closed,
    })),
  }));
}
