// Nearest-neighbour linking of domains left without an overlap partner, after Crocker & Grier
// 1996 (J. Colloid Interface Sci. 179:298): candidate pairs closer than a maximum displacement,
// taken greedily in order of increasing distance, each domain linked at most once. Centroids are
// binned into square cells of the maximum displacement, so each domain looks only at the 3 x 3
// cells around its own; on periodic axes distances use the minimum image and the cells wrap.
// Browser-safe: no node:* imports.

export interface DistanceLinkInput {
  width: number;
  height: number;
  periodicX: boolean;
  periodicY: boolean;
  /** Largest centroid displacement in pixels (> 0). */
  maxDisplacement: number;
  /** Unlinked previous domains: label ids, centroids (px), phases. */
  prevIds: ArrayLike<number>;
  prevX: ArrayLike<number>;
  prevY: ArrayLike<number>;
  prevPhase: ArrayLike<number>;
  /** Unlinked current domains, the same columns. */
  curIds: ArrayLike<number>;
  curX: ArrayLike<number>;
  curY: ArrayLike<number>;
  curPhase: ArrayLike<number>;
}

/** Returns the links as [previous id, current id] pairs (entries of prevIds / curIds). */
export function linkByDistance(input: DistanceLinkInput): Array<[number, number]> {
  const { width: w, height: h, periodicX, periodicY, maxDisplacement: r } = input;
  const np = input.prevIds.length, nc = input.curIds.length;
  if (np === 0 || nc === 0) return [];
  const gx = Math.max(1, Math.floor(w / r)), gy = Math.max(1, Math.floor(h / r));
  const cellW = w / gx, cellH = h / gy; // >= r, so a partner is at most one cell away
  const cellOf = (x: number, y: number) => {
    const cx = Math.min(gx - 1, Math.max(0, Math.floor(x / cellW)));
    const cy = Math.min(gy - 1, Math.max(0, Math.floor(y / cellH)));
    return cy * gx + cx;
  };
  // Previous domains bucketed by cell (counting sort: start offsets, then members).
  const start = new Int32Array(gx * gy + 1);
  const cellOfPrev = new Int32Array(np);
  for (let i = 0; i < np; i++) {
    const c = cellOf(input.prevX[i]!, input.prevY[i]!);
    cellOfPrev[i] = c;
    start[c + 1]!++;
  }
  for (let c = 0; c < gx * gy; c++) start[c + 1]! += start[c]!;
  const fill = start.slice(0, gx * gy);
  const members = new Int32Array(np);
  for (let i = 0; i < np; i++) members[fill[cellOfPrev[i]!]!++] = i;

  // Neighbouring cell offsets along one axis, without repeats when the grid is narrow.
  const offsets = (g: number, periodic: boolean, c: number): number[] => {
    const out: number[] = [];
    for (const d of [-1, 0, 1]) {
      let v = c + d;
      if (periodic) v = ((v % g) + g) % g;
      else if (v < 0 || v >= g) continue;
      if (!out.includes(v)) out.push(v);
    }
    return out;
  };
  const cand: Array<[number, number, number]> = []; // distance, prev entry, cur entry
  for (let j = 0; j < nc; j++) {
    const x = input.curX[j]!, y = input.curY[j]!;
    const c = cellOf(x, y);
    const cx = c % gx, cy = (c - cx) / gx;
    for (const yy of offsets(gy, periodicY, cy)) {
      for (const xx of offsets(gx, periodicX, cx)) {
        const cell = yy * gx + xx;
        for (let m = start[cell]!; m < start[cell + 1]!; m++) {
          const i = members[m]!;
          if (input.prevPhase[i] !== input.curPhase[j]) continue;
          let dx = x - input.prevX[i]!, dy = y - input.prevY[i]!;
          // Minimum image on periodic axes.
          if (periodicX) dx -= w * Math.round(dx / w);
          if (periodicY) dy -= h * Math.round(dy / h);
          const d = Math.hypot(dx, dy);
          if (d <= r) cand.push([d, i, j]);
        }
      }
    }
  }
  // Nearest first; ties by the smaller previous, then current id, so the result is deterministic.
  cand.sort((p, q) => p[0] - q[0] || input.prevIds[p[1]]! - input.prevIds[q[1]]! ||
    input.curIds[p[2]]! - input.curIds[q[2]]!);
  const prevTaken = new Uint8Array(np), curTaken = new Uint8Array(nc);
  const links: Array<[number, number]> = [];
  for (const [, i, j] of cand) {
    if (prevTaken[i] || curTaken[j]) continue;
    prevTaken[i] = 1;
    curTaken[j] = 1;
    links.push([input.prevIds[i]!, input.curIds[j]!]);
  }
  return links;
}
