// Generated movies for the tracking tests: discs and bars drawn into 0/1 frames, analyzed and
// pushed frame by frame through one analyzer and one tracker.
import { createAnalyzer, type FrameOptions } from "../../src/index";
import type { Frame } from "../../src/types";
import { DomainTracker, type FrameEvents, type TrackingOptions, type TrackRow } from "../../src/sequence/tracking";

export type Canvas = Frame & { data: Uint8Array };

export function canvas(width: number, height: number): Canvas {
  return { width, height, data: new Uint8Array(width * height) };
}

/** Paints the pixels within radius r of (cx, cy) with `value`; wraps around when periodic. */
export function disc(c: Canvas, cx: number, cy: number, r: number, value = 1, periodic = false): Canvas {
  if (r < 0) return c;
  for (let y = 0; y < c.height; y++) {
    for (let x = 0; x < c.width; x++) {
      let dx = x - cx, dy = y - cy;
      if (periodic) {
        dx -= c.width * Math.round(dx / c.width);
        dy -= c.height * Math.round(dy / c.height);
      }
      if (dx * dx + dy * dy <= r * r) c.data[y * c.width + x] = value;
    }
  }
  return c;
}

/** Paints the rectangle [x0, x1] x [y0, y1] (inclusive). */
export function bar(c: Canvas, x0: number, y0: number, x1: number, y1: number, value = 1): Canvas {
  for (let y = y0; y <= y1; y++) for (let x = x0; x <= x1; x++) c.data[y * c.width + x] = value;
  return c;
}

export interface Movie {
  events: FrameEvents[];
  tracks: TrackRow[];
  /** Domain counts of each frame by phase, as analyzed. */
  counts: Array<{ up: number; down: number }>;
  /** Copies of each frame's label image. */
  labels: Int32Array[];
  tracker: DomainTracker;
}

/** Analyzes the frames in order and tracks them; frame numbers 0, 1, ... unless given. */
export function trackMovie(
  frames: Frame[], analysis: FrameOptions = {}, tracking: TrackingOptions = {},
  fields?: number[], frameNumbers?: number[],
): Movie {
  const { width, height } = frames[0]!;
  const analyzer = createAnalyzer(width, height);
  const tracker = new DomainTracker(width, height, { boundary: analysis.boundary ?? "open", ...tracking });
  const events: FrameEvents[] = [];
  const counts: Array<{ up: number; down: number }> = [];
  const labels: Int32Array[] = [];
  frames.forEach((f, k) => {
    const r = analyzer.analyze(f, { threshold: 0.5, ...analysis });
    counts.push({ up: r.up.domains, down: r.down.domains });
    labels.push(analyzer.labels().slice());
    events.push(tracker.push(analyzer.labels(), r.domains, {
      frame: frameNumbers ? frameNumbers[k]! : k,
      ...(fields ? { field: fields[k]! } : {}),
    }));
  });
  analyzer.dispose();
  return { events, tracks: tracker.trackSummary(), counts, labels, tracker };
}

/** The track id of the only domain of `phase` in a frame's events (throws unless exactly one). */
export function onlyTrack(e: FrameEvents, movie: Movie, k: number, phase: "up" | "down"): number {
  const ids = [...e.trackIds].filter((t) => movie.tracks[t - 1]!.phase === phase);
  if (ids.length !== 1) throw new Error(`frame ${k}: expected one ${phase} domain, got ${ids.length}`);
  return ids[0]!;
}

/** The track id of the domain covering pixel (x, y) in frame k. */
export function trackAt(movie: Movie, k: number, x: number, y: number): number {
  const width = movie.tracker.width;
  return movie.events[k]!.trackIds[movie.labels[k]![y * width + x]! - 1]!;
}
