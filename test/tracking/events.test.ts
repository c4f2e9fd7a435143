import { describe, it, expect } from "vitest";
import { canvas, disc, bar, trackMovie, onlyTrack, trackAt, type Canvas } from "./movie";
import { grid } from "../helpers/grid";
import { DomainTracker, eventRow } from "../../src/sequence/tracking";
import { createAnalyzer } from "../../src/index";

const W = 64, H = 32;

describe("following single domains", () => {
  it("keeps a disc's id while it moves by less than its radius each frame", () => {
    const frames = Array.from({ length: 8 }, (_, k) => disc(canvas(W, H), 12 + 3 * k, 16, 6));
    const m = trackMovie(frames);
    const ids = m.events.map((e, k) => onlyTrack(e, m, k, "up"));
    expect(new Set(ids).size).toBe(1);
    for (const e of m.events.slice(1)) {
      expect(e.up).toMatchObject({ continued: 1, nucleated: 0, annihilated: 0, split: 0, merged: 0 });
    }
    const row = m.tracks[ids[0]! - 1]!;
    expect(row).toMatchObject({ bornBy: "first-frame", birthFrame: 0, endFrame: 7, lifetime: 8, endedBy: "still-present" });
    expect(row.goneFrame).toBeNaN();
  });

  it("counts a disc that appears in an empty frame as one nucleated up domain", () => {
    const fields = [1, 2, 3, 4];
    const frames = [canvas(W, H), canvas(W, H), disc(canvas(W, H), 30, 16, 3), disc(canvas(W, H), 30, 16, 5)];
    const m = trackMovie(frames, {}, {}, fields);
    expect(m.events[1]!.up.nucleated).toBe(0);
    expect(m.events[2]!.up).toMatchObject({ nucleated: 1, annihilated: 0, domains: 1, previousDomains: 0 });
    expect(m.events[3]!.up).toMatchObject({ nucleated: 0, continued: 1 });
    const id = onlyTrack(m.events[2]!, m, 2, "up");
    expect(m.tracks[id - 1]).toMatchObject({ phase: "up", bornBy: "nucleated", birthFrame: 2, birthField: 3, lifetime: 2 });
  });

  it("reports the collapse field of a shrinking bubble and the field of the frame it is gone in", () => {
    // Radius 7.5 - k: a single pixel at k = 7, nothing at k = 8.
    const fields = Array.from({ length: 10 }, (_, k) => 10 + 2 * k);
    const frames = Array.from({ length: 10 }, (_, k) => disc(canvas(W, H), 20, 16, 7.5 - k));
    const m = trackMovie(frames, {}, {}, fields);
    expect(m.counts.map((c) => c.up)).toEqual([1, 1, 1, 1, 1, 1, 1, 1, 0, 0]);
    expect(m.events[8]!.up).toMatchObject({ annihilated: 1, nucleated: 0, domains: 0, previousDomains: 1 });
    const bubble = m.tracks.find((t) => t.phase === "up")!;
    expect(bubble).toMatchObject({
      endedBy: "annihilated", endFrame: 7, endField: 24, goneFrame: 8, goneField: 26, lifetime: 8,
    });
    expect(bubble.maxArea).toBe(frames[0]!.data.reduce((s, v) => s + v, 0));
  });

  it("counts lifetimes in frames present, whatever the frame numbers", () => {
    const frames = Array.from({ length: 4 }, () => disc(canvas(W, H), 20, 16, 4));
    const m = trackMovie(frames, {}, {}, undefined, [10, 20, 35, 36]);
    expect(m.tracks.find((t) => t.phase === "up")).toMatchObject({ birthFrame: 10, endFrame: 36, lifetime: 4 });
  });
});

describe("merging and splitting", () => {
  // Disc A (radius 6) moves right from x = 16, disc B (radius 4) left from x = 44, one pixel
  // each per frame. Along row 16 the gap between them is 17 - 2k pixels: they touch at k = 9.
  function approaching(n: number): Canvas[] {
    return Array.from({ length: n }, (_, k) => disc(disc(canvas(W, H), 16 + k, 16, 6), 44 - k, 16, 4));
  }

  it("counts two approaching discs as one merge at the frame they first touch", () => {
    const m = trackMovie(approaching(13));
    expect(m.counts.map((c) => c.up)).toEqual([2, 2, 2, 2, 2, 2, 2, 2, 2, 1, 1, 1, 1]);
    m.events.slice(1).forEach((e, i) => {
      const k = i + 1;
      expect(e.up.merged).toBe(k === 9 ? 1 : 0);
      expect(e.up.mergedPredecessors).toBe(k === 9 ? 2 : 0);
      expect(e.up.split + e.up.nucleated + e.up.annihilated).toBe(0);
    });
  });

  it("gives the merged domain the id of the larger disc and ends the smaller one's track as merged", () => {
    const m = trackMovie(approaching(13));
    const a = trackAt(m, 0, 16, 16), b = trackAt(m, 0, 44, 16); // radius 6 and radius 4
    const merged = onlyTrack(m.events[9]!, m, 9, "up");
    expect(merged).toBe(a);
    expect(m.events[9]!.merges).toEqual([{ phase: "up", trackId: a, from: [a!, b!].sort((p, q) => p - q) }]);
    expect(m.tracks[b! - 1]).toMatchObject({ endedBy: "merged", endFrame: 8, goneFrame: 9, lifetime: 9 });
    expect(m.tracks[a! - 1]).toMatchObject({ endedBy: "still-present", lifetime: 13 });
  });

  it("keeps the id of the larger predecessor even when a smaller one shares more pixels with the merger", () => {
    // A disc of radius 8 jumps 13 px onto a still disc of radius 4: the large disc shares only
    // its lens (about 19 px) with the merged domain, the small one all of its ~49 px.
    const prev = disc(disc(canvas(W, H), 20, 16, 8), 40, 16, 4);
    const cur = disc(disc(canvas(W, H), 33, 16, 8), 40, 16, 4);
    const m = trackMovie([prev, cur]);
    expect(m.counts.map((c) => c.up)).toEqual([2, 1]);
    expect(m.events[1]!.up).toMatchObject({ merged: 1, mergedPredecessors: 2 });
    expect(trackAt(m, 1, 33, 16)).toBe(trackAt(m, 0, 20, 16));
    expect(m.tracks[trackAt(m, 0, 40, 16) - 1]).toMatchObject({ endedBy: "merged", goneFrame: 1 });
  });

  it("counts an elongated domain pinching into two as one split into two pieces", () => {
    // Left disc radius 7, right disc radius 5, joined by a bar of 5, 3, 1 rows, then none.
    const frames = Array.from({ length: 5 }, (_, k) => {
      const c = disc(disc(canvas(W, H), 14, 16, 7), 40, 16, 5);
      const half = 2 - k;
      return half >= 0 ? bar(c, 14, 16 - half, 40, 16 + half) : c;
    });
    const m = trackMovie(frames);
    expect(m.counts.map((c) => c.up)).toEqual([1, 1, 1, 2, 2]);
    expect(m.events[3]!.up).toMatchObject({ split: 1, splitPieces: 2, merged: 0, nucleated: 0, annihilated: 0, continued: 0 });
    expect(m.events[4]!.up).toMatchObject({ split: 0, continued: 2 });
    const whole = onlyTrack(m.events[2]!, m, 2, "up");
    const pieces = [...m.events[3]!.trackIds].filter((t) => m.tracks[t - 1]!.phase === "up");
    expect(pieces).toContain(whole);
    const other = pieces.find((t) => t !== whole)!;
    expect(m.events[3]!.splits).toEqual([{ phase: "up", trackId: whole, pieces: [whole, other].sort((p, q) => p - q) }]);
    // The id stays on the larger-overlap piece: the left disc.
    expect(trackAt(m, 3, 14, 16)).toBe(whole);
    expect(trackAt(m, 3, 40, 16)).toBe(other);
    expect(m.tracks[other - 1]).toMatchObject({ bornBy: "split", birthFrame: 3 });
  });

  it("counts a stripe breaking up into three bubbles as one split into three pieces", () => {
    const frames = [
      bar(canvas(W, H), 6, 14, 57, 18),
      bar(bar(bar(canvas(W, H), 6, 14, 20, 18), 25, 14, 38, 18), 43, 14, 57, 18),
    ];
    const m = trackMovie(frames);
    expect(m.events[1]!.up).toMatchObject({ split: 1, splitPieces: 3, domains: 3, previousDomains: 1 });
    expect(m.events[1]!.splits[0]!.pieces).toHaveLength(3);
    // The background (down) surrounds everything before and after: it just continues.
    expect(m.events[1]!.down).toMatchObject({ continued: 1, split: 0, merged: 0 });
  });

  it("counts the same events for the down phase when the frames are inverted", () => {
    const frames = approaching(13);
    const up = trackMovie(frames);
    const down = trackMovie(frames, { invert: true, connectivity: 4 });
    for (let k = 1; k < frames.length; k++) {
      expect(down.events[k]!.down).toEqual(up.events[k]!.up);
    }
  });
});

describe("links across periodic sides and by distance", () => {
  it("keeps a bubble's id as it crosses the right side of a periodic frame", () => {
    const frames = Array.from({ length: 9 }, (_, k) => disc(canvas(48, 24), (36 + 3 * k) % 48, 12, 5, 1, true));
    const m = trackMovie(frames, { boundary: "periodic" });
    expect(m.counts.every((c) => c.up === 1)).toBe(true);
    const ids = m.events.map((e, k) => onlyTrack(e, m, k, "up"));
    expect(new Set(ids).size).toBe(1);
    for (const e of m.events.slice(1)) expect(e.up.continued).toBe(1);
  });

  it("sees the same bubble as two pieces cut by the side of an open frame", () => {
    // Contrast for the test above: open sides cut the bubble, which then splits and merges.
    const frames = Array.from({ length: 9 }, (_, k) => disc(canvas(48, 24), (36 + 3 * k) % 48, 12, 5, 1, true));
    const m = trackMovie(frames, { boundary: "open" });
    expect(m.counts.some((c) => c.up === 2)).toBe(true);
    expect(m.events.some((e) => e.up.split + e.up.merged + e.up.nucleated > 0)).toBe(true);
  });

  // A bubble of radius 2 jumping 7 px per frame never overlaps its previous position.
  const jumping = (periodic: boolean) => Array.from({ length: 5 }, (_, k) =>
    disc(canvas(40, 20), periodic ? (30 + 7 * k) % 40 : 5 + 7 * k, 10, 2, 1, periodic));

  it("counts a fast bubble as annihilated and nucleated each frame when linking by overlap only", () => {
    const m = trackMovie(jumping(false));
    for (const e of m.events.slice(1)) expect(e.up).toMatchObject({ nucleated: 1, annihilated: 1, continued: 0 });
    expect(m.tracks.filter((t) => t.phase === "up")).toHaveLength(5);
  });

  it("keeps a fast bubble's id with a maximum displacement larger than its jump", () => {
    const m = trackMovie(jumping(false), {}, { maxDisplacement: 8 });
    for (const e of m.events.slice(1)) {
      expect(e.up).toMatchObject({ nucleated: 0, annihilated: 0, continued: 1, linkedByDistance: 1 });
    }
    expect(m.tracks.filter((t) => t.phase === "up")).toHaveLength(1);
    const short = trackMovie(jumping(false), {}, { maxDisplacement: 6.9 });
    expect(short.tracks.filter((t) => t.phase === "up")).toHaveLength(5);
  });

  it("measures displacements by the minimum image across a periodic side", () => {
    const m = trackMovie(jumping(true), { boundary: "periodic" }, { maxDisplacement: 8 });
    expect(m.tracks.filter((t) => t.phase === "up")).toHaveLength(1);
    for (const e of m.events.slice(1)) expect(e.up.linkedByDistance).toBe(1);
    // The same frames declared open: the jump across the side is 33 px, too far.
    const open = trackMovie(jumping(true), { boundary: "open" }, { maxDisplacement: 8 });
    expect(open.tracks.filter((t) => t.phase === "up").length).toBeGreaterThan(1);
  });

  it("gives a fast bubble's id to the nearer of two candidates and counts the other as nucleated", () => {
    // One bubble at x = 20; next frame bubbles at x = 12 (8 px away, first in raster order) and
    // x = 26 (6 px away), none overlapping it. Both are within 10 px: the nearer one continues.
    const prev = disc(canvas(40, 20), 20, 10, 1.5);
    const cur = disc(disc(canvas(40, 20), 12, 10, 1.5), 26, 10, 1.5);
    const m = trackMovie([prev, cur], {}, { maxDisplacement: 10 });
    expect(m.events[1]!.up).toMatchObject({ linkedByDistance: 1, continued: 1, nucleated: 1, annihilated: 0 });
    expect(trackAt(m, 1, 26, 10)).toBe(trackAt(m, 0, 20, 10));
    expect(m.tracks[trackAt(m, 1, 12, 10) - 1]).toMatchObject({ bornBy: "nucleated", birthFrame: 1 });
  });
});

describe("the event row and the tracker's input checks", () => {
  it("names the event columns by phase and leaves them empty on the first frame", () => {
    const m = trackMovie([disc(canvas(W, H), 20, 16, 4), canvas(W, H)]);
    const first = eventRow(m.events[0]!), second = eventRow(m.events[1]!);
    expect(first.map(([n]) => n)).toEqual([
      "up_nucleated", "up_annihilated", "up_split", "up_split_pieces", "up_merged", "up_merged_predecessors", "up_continued",
      "down_nucleated", "down_annihilated", "down_split", "down_split_pieces", "down_merged", "down_merged_predecessors", "down_continued",
    ]);
    expect(first.every(([, v]) => v === "")).toBe(true);
    expect(Object.fromEntries(second)).toMatchObject({ up_annihilated: 1, up_nucleated: 0, down_continued: 1, down_merged: 0 });
  });

  it("copies the label image, so the analyzer may reuse its view after a push", () => {
    const f = grid("##..", "##..", "....");
    const analyzer = createAnalyzer(4, 3);
    const tracker = new DomainTracker(4, 3);
    const r = analyzer.analyze(f, { threshold: 0.5 });
    const view = analyzer.labels();
    tracker.push(view, r.domains, { frame: 0 });
    const copy = view.slice();
    view.fill(0); // a caller scribbling over its buffer must not change the tracker's memory
    const e = tracker.push(copy, r.domains, { frame: 1 });
    expect(e.up.continued + e.down.continued).toBe(2);
    analyzer.dispose();
  });

  it("rejects labels of the wrong size, labels beyond the domain count and frames out of order", () => {
    const f = grid("#..", "...");
    const analyzer = createAnalyzer(3, 2);
    const r = analyzer.analyze(f, { threshold: 0.5, keepLabels: true });
    const t = new DomainTracker(3, 2);
    expect(() => t.push(new Int32Array(5), r.domains, { frame: 0 })).toThrow(/expected 3 x 2 = 6 labels, got 5/);
    expect(() => t.push(Array.from(r.labels!) as unknown as Int32Array, r.domains, { frame: 0 })).toThrow(/Int32Array/);
    const bad = r.labels!.slice();
    bad[3] = 7;
    expect(() => t.push(bad, r.domains, { frame: 0 })).toThrow(/labels in 0\.\.2 .*got 7 at pixel 3/);
    t.push(r.labels!, r.domains, { frame: 0 });
    expect(() => t.push(bad, r.domains, { frame: 1 })).toThrow(/labels in 0\.\.2 .*got 7 at pixel 3/);
    expect(() => t.push(r.labels!, r.domains, { frame: 0 })).toThrow(/increasing order, got frame 0 after frame 0/);
    expect(() => t.push(r.labels!, r.domains, { frame: 2, field: NaN })).toThrow(/info\.field/);
    expect(() => t.push(r.labels!, { ...r.domains, area: new Float64Array(1) }, { frame: 2 })).toThrow(/domains\.area with 2 entries, got 1/);
    analyzer.dispose();
  });

  it("rejects unknown and out-of-range options", () => {
    expect(() => new DomainTracker(4, 4, { maxDisplacment: 3 } as never)).toThrow(/unknown option/);
    expect(() => new DomainTracker(4, 4, { maxDisplacement: -1 })).toThrow(/maxDisplacement: expected a finite number >= 0, got -1/);
    expect(() => new DomainTracker(4, 4, { minOverlap: 0 })).toThrow(/minOverlap/);
    expect(() => new DomainTracker(4, 4, { boundary: "torus" as never })).toThrow(/boundary/);
    expect(() => new DomainTracker(0, 4)).toThrow(/tracker width: expected a positive integer, got 0/);
  });
});
