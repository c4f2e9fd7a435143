// Skeletons of a hexagonal frame: hexagonal thinning (assembly/hex-thin.ts), the site adjacency,
// the skeleton graph with the hexagonal lattice's step lengths and chords, then the same kinds,
// columns and per-phase summaries as a square frame. Lengths are in lattice constants inside,
// in `pixelSize` units (pixelSize = lattice constant) outside; areas in lattice constants squared
// (sites x sqrt(3)/2), so bubble diameters and densities mean what they mean on a square frame.
import type { HexWorkspace } from "../wasm/hex";
import { skeletonGraph, prunedSkeletonLater } from "./skeleton";
import { classifyDomains, summarizePhase } from "./classify";
import { resolveSkeletonOptions, frameMaps, lazyPruned, type LabeledFrame, type SkeletonAnalysis, type SkeletonOptions } from "./skeleton-analysis";
import { HEX_ROW, HEX_SITE_AREA } from "./hex";

/** Unit vectors of the graph direction codes of a hexagonal skeleton (rows run down). */
const HEX_DIRECTIONS: Array<[number, number] | undefined> = [
  [1, 0], [0.5, -HEX_ROW], [-1, 0], [-0.5, HEX_ROW], [-0.5, -HEX_ROW], undefined, [0.5, HEX_ROW], undefined,
];

/** Step lengths (1 lattice constant for each of the six neighbours) and half-chords of two steps. */
export const HEX_DIRECTION_GEOMETRY = (() => {
  const step = new Float64Array(8).fill(1);
  const chord = new Float64Array(64);
  for (let a = 0; a < 8; a++) for (let b = 0; b < 8; b++) {
    const u = HEX_DIRECTIONS[a], v = HEX_DIRECTIONS[b];
    chord[8 * a + b] = u && v ? Math.hypot(u[0] + v[0], u[1] + v[1]) / 2 : 1;
  }
  return { step, chord };
})();

/** Longest distance to the other phase measured exactly (lattice constants); farther sites get this. */
export const HEX_DISTANCE_CAP = 128;

/**
 * Thins both phases of the frame loaded in `ws` (labels from its last labeling), builds and prunes
 * every domain's skeleton graph and classifies each domain as bubble, stripe or labyrinth.
 * `options.connectivity`, `quads` and `thinning` do not apply (six-connected phases, one thinning order).
 */
export function analyzeHexSkeletons(ws: HexWorkspace, frame: LabeledFrame, options: SkeletonOptions = {}): SkeletonAnalysis {
  const o = resolveSkeletonOptions(options);
  const { width, height, count } = frame;
  const { phase, labels, n } = frameMaps(frame, "sites");
  const periodicX = o.boundary === "periodic" || o.boundary === "periodic-x";
  const periodicY = o.boundary === "periodic" || o.boundary === "periodic-y";
  const cap = Math.min(HEX_DISTANCE_CAP, Math.ceil(Math.hypot(width, height * HEX_ROW)) + 1);
  const r = ws.thin(cap);
  const skeleton = r.skeleton.slice(), distance = r.distance.slice();
  const adjacency = ws.neighbours();
  const graph = skeletonGraph(
    {
      width, height, phase, labels, count, skeleton, distance, periodicX, periodicY, rule: 0, adjacency,
      directionGeometry: HEX_DIRECTION_GEOMETRY,
    },
    { spurFactor: o.spurFactor, junctionMergeFactor: o.junctionMergeFactor },
  );
  // Areas in lattice constants squared; the largest distance of each domain over its skeleton
  // sites (the medial points, where the distance to the other phase peaks, lie on the skeleton
  // to within a site).
  const area = new Float64Array(count), maxD = new Float64Array(count), domainPhase = new Uint8Array(count);
  for (let i = 0; i < n; i++) {
    const d = labels[i]! - 1;
    if (d < 0 || d >= count) throw new Error(`frame.labels: expected ids 1..${count}, got ${labels[i]} at site ${i}`);
    area[d]! += HEX_SITE_AREA;
    domainPhase[d] = phase[i]! ? 1 : 0;
    if (skeleton[i] && distance[i]! > maxD[d]!) maxD[d] = distance[i]!;
  }
  const columns = classifyDomains(graph, count, maxD, { bubbleMaxAspect: o.bubbleMaxAspect, pixelSize: o.pixelSize });
  const frameArea = n * HEX_SITE_AREA;
  const out = {
    options: o, columns,
    up: summarizePhase(columns, domainPhase, area, 1, frameArea, o.pixelSize),
    down: summarizePhase(columns, domainPhase, area, 0, frameArea, o.pixelSize),
    skeleton, pruned: undefined as unknown as Uint8Array, distance, graph,
  };
  lazyPruned(out, prunedSkeletonLater(graph)); // as the square grid's: made on first read
  return out;
}
