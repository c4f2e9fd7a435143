// Hexagonal frames: topology-preserving thinning of both phases, the distance of skeleton sites
// to the other phase, and the skeleton's site adjacency (the skeleton graph's input).
// Lattice convention as in hex-label.ts (odd rows shifted right by half a site).
//
// Thinning: on the triangular lattice with both phases six-connected, a site p of a set X is
// simple (deleting it changes no component, hole or winding) iff its six neighbours, taken in
// cyclic order, hold exactly one run of X sites and one run of others: crossing number 1 (the
// hexagonal form of Rutovitz 1966, J. R. Stat. Soc. A 129:504; see Deutsch 1972, "Thinning
// algorithms on rectangular, hexagonal and triangular arrays", CACM 15:827; Kong & Rosenfeld
// 1989, CVGIP 48:357). Consecutive ring neighbours are themselves adjacent, so the ring's runs
// are the local components. Directional sweeps over the six border directions delete, one by
// one and against the current state, every simple site with at least two skeleton neighbours
// whose neighbour in the swept direction is outside the skeleton; end sites (one neighbour)
// are kept, so branches keep their length. Repeats until a round of six sweeps deletes nothing.
// Each phase is thinned inside itself (the other phase and the image outside an open side are
// background), so the two phases never interact.
//
// Ring order k = 0..5: E, NE, NW, W, SW, SE (counter-clockwise as displayed, rows run down).
// The adjacency writes the graph direction codes E 0, NE 1, W 2, SW 3, NW 4, SE 6 (opposite
// directions pair as 0/2, 1/3, 4/6, the reversal pairs of the square grid's codes).
import { W, H, PX, PY, PH } from "./common";

let SKB: usize = 0;

@inline function ph(i: i32): i32 {
  return <i32>load<u8>(PH + <usize>i);
}
@inline function sk(i: i32): i32 {
  return <i32>load<u8>(SKB + <usize>i);
}

/** Neighbour k (ring order) of site (x, y): index, or -1 outside an open side. */
@inline function nb(x: i32, y: i32, k: i32): i32 {
  const o = y & 1;
  let nx = x, ny = y;
  if (k == 0) nx = x + 1;
  else if (k == 3) nx = x - 1;
  else {
    ny = k < 3 ? y - 1 : y + 1;
    nx = k == 1 || k == 5 ? x + o : x - 1 + o;
  }
  if (nx < 0) { if (!PX) return -1; nx += W; }
  else if (nx >= W) { if (!PX) return -1; nx -= W; }
  if (ny < 0) { if (!PY) return -1; ny += H; }
  else if (ny >= H) { if (!PY) return -1; ny -= H; }
  return ny * W + nx;
}

/** Ring mask of site (x, y) in the skeleton of phase v: bit k set when neighbour k is in it. */
@inline function ringMask(x: i32, y: i32, v: i32): i32 {
  if (x > 0 && y > 0 && x + 1 < W && y + 1 < H) {
    // Away from the frame's rim: the six neighbours at fixed offsets.
    const i = y * W + x, o = y & 1;
    const up = i - W + o, down = i + W + o;
    return inSet(i + 1, v) | (inSet(up, v) << 1) | (inSet(up - 1, v) << 2) | (inSet(i - 1, v) << 3) |
      (inSet(down - 1, v) << 4) | (inSet(down, v) << 5);
  }
  let m = 0;
  for (let k = 0; k < 6; k++) {
    const j = nb(x, y, k);
    if (j >= 0 && ph(j) == v && sk(j) != 0) m |= 1 << k;
  }
  return m;
}

@inline function inSet(j: i32, v: i32): i32 {
  return <i32>(ph(j) == v) & <i32>(sk(j) != 0);
}

/** Whether a site with ring mask m may be deleted: simple and not an end (at least two neighbours). */
@inline function deletable(m: i32): bool {
  return popcnt(m) >= 2 && simpleRing(m);
}

/** Crossing number test: exactly one run of set bits around the six-ring (and not all six). */
@inline function simpleRing(m: i32): bool {
  if (m == 0 || m == 63) return false;
  const rot = ((m >> 1) | ((m & 1) << 5));
  return popcnt(m ^ rot) == 2;
}

/**
 * Thins both phases of PH into `skel` (u8 per site, 1 = on the skeleton of its own phase);
 * `cand` and `list` are i32 scratch lists of W * H entries. Each sweep marks its candidates on
 * the state at the sweep's start (so one sweep peels one layer from one side), then deletes them
 * one by one after a re-check against the current state. Only sites on the work list are
 * examined: at the start the sites with a neighbour outside the skeleton, later also every
 * skeleton neighbour of a deleted site (nothing else can become deletable). Returns the rounds run.
 */
export function hexThin(skel: usize, cand: usize, list: usize): i32 {
  SKB = skel;
  const w = W, h = H, n = w * h;
  memory.fill(skel, 1, <usize>n);
  let rounds = 0;
  for (let v = 1; v >= 0; v--) {
    // Work list: sites of phase v with a neighbour outside the skeleton (bit 1 marks listed sites).
    let nl = 0;
    for (let y = 0; y < h; y++) {
      for (let x = 0; x < w; x++) {
        const i = y * w + x;
        if (ph(i) != v) continue;
        if (ringMask(x, y, v) == 63) continue;
        store<u8>(SKB + <usize>i, 3);
        store<i32>(list + (<usize>nl << 2), i);
        nl++;
      }
    }
    let changed = true;
    while (changed) {
      changed = false;
      rounds++;
      for (let k = 0; k < 6; k++) {
        let nc = 0;
        for (let t = 0; t < nl; t++) {
          const i = load<i32>(list + (<usize>t << 2));
          if (sk(i) == 0) continue;
          const y = i / w, x = i - y * w;
          const m = ringMask(x, y, v);
          if (((m >> k) & 1) != 0 || !deletable(m)) continue; // not a border site in direction k, or kept
          store<i32>(cand + (<usize>nc << 2), i);
          nc++;
        }
        for (let t = 0; t < nc; t++) {
          const i = load<i32>(cand + (<usize>t << 2));
          const y = i / w, x = i - y * w;
          if (!deletable(ringMask(x, y, v))) continue;
          store<u8>(SKB + <usize>i, 0);
          changed = true;
          for (let q = 0; q < 6; q++) {
            const j = nb(x, y, q);
            if (j < 0 || ph(j) != v || sk(j) != 1) continue; // off the skeleton, or listed already
            store<u8>(SKB + <usize>j, 3);
            store<i32>(list + (<usize>nl << 2), j);
            nl++;
          }
        }
      }
      // Drop deleted sites from the list.
      let kept = 0;
      for (let t = 0; t < nl; t++) {
        const i = load<i32>(list + (<usize>t << 2));
        if (sk(i) != 0) { store<i32>(list + (<usize>kept << 2), i); kept++; }
      }
      nl = kept;
    }
  }
  for (let i = 0; i < n; i++) if (sk(i) != 0) store<u8>(SKB + <usize>i, 1);
  return rounds;
}

/**
 * Distance (lattice units, centre to centre) from every skeleton site to the nearest site of the
 * other phase, exact within the offsets given: `offsets` holds `count` lattice vectors (a, b) as
 * i32 pairs, a along the rows and b rows down (the vector a + b / 2, b sqrt(3) / 2), sorted by
 * length, with their lengths in `lengths` (f64). The first other-phase site along that order is
 * the nearest. Sites with none in reach get `cap`. Off the skeleton `dist` is 0. The image outside
 * an open side is not the other phase.
 */
export function hexSkeletonDistance(skel: usize, dist: usize, offsets: usize, lengths: usize, count: i32, cap: f64): void {
  SKB = skel;
  const w = W, h = H;
  for (let y = 0; y < h; y++) {
    const o = y & 1;
    for (let x = 0; x < w; x++) {
      const i = y * w + x;
      let d = 0.0;
      if (sk(i) != 0) {
        d = cap;
        const v = ph(i);
        for (let t = 0; t < count; t++) {
          const a = load<i32>(offsets + (<usize>t << 3));
          const b = load<i32>(offsets + (<usize>t << 3), 4);
          let ny = y + b;
          let nx = x + a + ((b + o - (ny & 1)) >> 1);
          if (ny < 0 || ny >= h) {
            if (!PY) continue;
            ny = ((ny % h) + h) % h;
          }
          if (nx < 0 || nx >= w) {
            if (!PX) continue;
            nx = ((nx % w) + w) % w;
          }
          if (ph(ny * w + nx) != v) { d = load<f64>(lengths + (<usize>t << 3)); break; }
        }
      }
      store<f32>(dist + (<usize>i << 2), <f32>d);
    }
  }
}

/**
 * Site adjacency of the skeleton `skel` (same phase, six neighbours): for skeleton site i (raster
 * order) its skeleton neighbours as 8 j + direction code (E 0, NE 1, W 2, SW 3, NW 4, SE 6) at
 * nbr[8 i .. 8 i + deg - 1] (i32), deg (u8 per site, 0 off the skeleton), and the skeleton sites in
 * `list`. Returns their count. Periodic axes shorter than 3 sites (x) or 4 rows (y) are rejected in
 * TypeScript, so no site is its own neighbour.
 */
export function hexSkeletonNeighbours(skel: usize, nbr: usize, deg: usize, list: usize): i32 {
  SKB = skel;
  const w = W, h = H;
  let count = 0;
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      const i = y * w + x;
      if (sk(i) == 0) { store<u8>(deg + <usize>i, 0); continue; }
      store<i32>(list + (<usize>count << 2), i);
      count++;
      const v = ph(i);
      const base = nbr + (<usize>i << 5);
      let d = 0;
      for (let k = 0; k < 6; k++) {
        const j = nb(x, y, k);
        if (j < 0 || ph(j) != v || sk(j) == 0) continue;
        const code = k == 0 ? 0 : k == 1 ? 1 : k == 2 ? 4 : k == 3 ? 2 : k == 4 ? 3 : 6;
        store<i32>(base + (<usize>d << 2), (j << 3) | code);
        d++;
      }
      store<u8>(deg + <usize>i, <u8>d);
    }
  }
  return count;
}
