// A plain-TS reference for hexagonal frames (offset rows, odd rows shifted right by half a
// site): six-neighbour components by breadth-first search, each domain's sites, lattice edges
// and triangles, and its phase changes, counted site by site in the most direct way.
export interface HexReference {
  count: number;
  /** Per domain (in raster order of its first site): phase, sites, V - E + F, phase changes, sum of x + (y & 1)/2. */
  phase: number[];
  sites: number[];
  euler: number[];
  changes: number[];
  sumX: number[];
  labels: Int32Array;
}

export function hexNeighbour(x: number, y: number, k: number, w: number, h: number, px: boolean, py: boolean): number {
  const o = y & 1;
  const d = [[1, 0], [o, -1], [o - 1, -1], [-1, 0], [o - 1, 1], [o, 1]][k]!;
  let nx = x + d[0]!, ny = y + d[1]!;
  if (nx < 0 || nx >= w) { if (!px) return -1; nx = (nx + w) % w; }
  if (ny < 0 || ny >= h) { if (!py) return -1; ny = (ny + h) % h; }
  return ny * w + nx;
}

export function hexReference(phase: Uint8Array, w: number, h: number, px: boolean, py: boolean): HexReference {
  const n = w * h;
  const labels = new Int32Array(n);
  const out: HexReference = { count: 0, phase: [], sites: [], euler: [], changes: [], sumX: [], labels };
  for (let s = 0; s < n; s++) {
    if (labels[s]) continue;
    const id = ++out.count;
    labels[s] = id;
    const queue = [s];
    while (queue.length) {
      const i = queue.pop()!;
      const x = i % w, y = (i - x) / w;
      for (let k = 0; k < 6; k++) {
        const j = hexNeighbour(x, y, k, w, h, px, py);
        if (j >= 0 && !labels[j] && phase[j] === phase[s]) { labels[j] = id; queue.push(j); }
      }
    }
    out.phase.push(phase[s]!); out.sites.push(0); out.euler.push(0); out.changes.push(0); out.sumX.push(0);
  }
  for (let i = 0; i < n; i++) {
    const x = i % w, y = (i - x) / w, d = labels[i]! - 1;
    out.sites[d]!++;
    out.sumX[d]! += x + (y & 1) / 2;
    out.euler[d]!++; // the site
    // Forward edges E (k 0), SW (4), SE (5); triangles (site, E, SE) and (site, SW, SE).
    const e = hexNeighbour(x, y, 0, w, h, px, py), sw = hexNeighbour(x, y, 4, w, h, px, py), se = hexNeighbour(x, y, 5, w, h, px, py);
    for (const j of [e, sw, se]) {
      if (j < 0) continue;
      if (phase[j] === phase[i]) out.euler[d]!--;
      else { out.changes[d]!++; out.changes[labels[j]! - 1]!++; }
    }
    const inside = (j: number) => j >= 0 && phase[j] === phase[i];
    if (inside(e) && inside(se)) out.euler[d]!++;
    if (inside(sw) && inside(se)) out.euler[d]!++;
  }
  return out;
}
