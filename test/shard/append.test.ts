import { describe, it, expect } from "vitest";
import { createAnalyzer } from "../../src/index";
import { DomainTracker, eventRow, type TrackedDomains } from "../../src/sequence/tracking";
import { MOVIE_FRAMES, SIZE, shardMovieFrame } from "./movies";

// Every frame of the shard movie analyzed once: labels and the domain columns the tracker reads.
const analyzer = createAnalyzer(SIZE, SIZE);
const frames = Array.from({ length: MOVIE_FRAMES }, (_, k) => {
  const r = analyzer.analyze(shardMovieFrame(k), { threshold: 0.5, keepLabels: true });
  const d = r.domains;
  const domains: TrackedDomains = { count: d.count, phase: d.phase.slice(), area: d.area.slice(), centroidX: d.centroidX.slice(), centroidY: d.centroidY.slice() };
  return { labels: r.labels!, domains, info: { frame: k, field: 5 - 0.5 * k } };
});
analyzer.dispose();

function tracked(from: number, to: number, options = {}): DomainTracker {
  const t = new DomainTracker(SIZE, SIZE, options);
  for (let k = from; k < to; k++) t.push(frames[k]!.labels, frames[k]!.domains, frames[k]!.info);
  return t;
}

describe("DomainTracker.append", () => {
  for (const options of [{}, { maxDisplacement: 6 }]) {
    it(`continues across a cut at every frame as one unbroken tracker would (${JSON.stringify(options)})`, () => {
      const whole = new DomainTracker(SIZE, SIZE, options);
      const events = frames.map((f) => eventRow(whole.push(f.labels, f.domains, f.info)));
      for (let cut = 1; cut < MOVIE_FRAMES; cut++) {
        const before = tracked(0, cut, options), after = tracked(cut, MOVIE_FRAMES, options);
        // The later tracker alone starts over: blank events, every domain a 'first-frame' track.
        expect(after.trackSummary()[0]!.bornBy).toBe("first-frame");
        const e = before.append(after, frames[cut]!);
        expect(eventRow(e), `cut ${cut}`).toEqual(events[cut]);
        expect(before.trackSummary(), `cut ${cut}`).toEqual(whole.trackSummary());
        expect(before.frameCount).toBe(MOVIE_FRAMES);
      }
    });
  }

  it("chains over several cuts, including shards of one frame, and keeps tracking afterwards", () => {
    const whole = tracked(0, MOVIE_FRAMES);
    const cuts = [0, 3, 4, 5, 9, 13, MOVIE_FRAMES - 1];
    const stitched = tracked(0, 3);
    for (let i = 1; i < cuts.length - 1; i++) stitched.append(tracked(cuts[i]!, cuts[i + 1]!), frames[cuts[i]!]!);
    // the last frame pushed after the stitching, as a resumed tracker would
    const last = frames[MOVIE_FRAMES - 1]!;
    stitched.push(last.labels, last.domains, last.info);
    expect(stitched.trackSummary()).toEqual(whole.trackSummary());
  });

  it("refuses a later tracker that did not begin on the given frame, or of another shape or options", () => {
    const before = tracked(0, 4);
    expect(() => before.append(tracked(5, 8), frames[4]!)).toThrow(/did not begin on frame 4/);
    expect(() => tracked(0, 4).append(tracked(4, 8, { minOverlap: 2 }), frames[4]!)).toThrow(/same options/);
    expect(() => tracked(0, 4).append(new DomainTracker(SIZE, SIZE), frames[4]!)).toThrow(/seen no frame/);
  });
});
