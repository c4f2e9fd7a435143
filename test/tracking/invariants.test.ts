import { describe, it, expect } from "vitest";
import { gaussianRandomField } from "../../src/demo/grf";
import type { Boundary } from "../../src/topology/options";
import { wasmAlloc, wasmFree, viewI32 } from "../../src/wasm/heap";
import { OverlapCounter } from "../../src/sequence/tracking-overlap";
import { DomainTracker } from "../../src/sequence/tracking";
import { createAnalyzer } from "../../src/index";
import { trackMovie, type Canvas, type Movie } from "./movie";
import { shift, randomFrame } from "../helpers/grid";

/** A maze thresholded at slowly rising levels: domains shrink, split, vanish and merge. */
/** Each frame's labels (tracked in a row) and each label's phase (index 0 and unused ids: 255). */
function labelsAndPhases(frames: Array<{ data: ArrayLike<number> }>): { labels: Int32Array[]; phases: Uint8Array[] } {
  const labels = trackMovie(frames as never).labels as Int32Array[];
  const phases = labels.map((l, k) => {
    const p = new Uint8Array(Math.max(...l) + 1).fill(255);
    for (let i = 0; i < l.length; i++) p[l[i]!] = frames[k]!.data[i]!;
    return p;
  });
  return { labels, phases };
}

function risingLevels(seed: number, size: number, levels: number[], period = 10): Canvas[] {
  const f = gaussianRandomField({ width: size, height: size, period, seed });
  return levels.map((u) => ({ width: size, height: size, data: f.data.map((v) => (v > u ? 1 : 0)) as unknown as Uint8Array }))
    .map((c) => ({ ...c, data: Uint8Array.from(c.data) }));
}

const levels = Array.from({ length: 12 }, (_, k) => -0.9 + 0.15 * k);

function eventCounts(m: Movie) {
  return m.events.map((e) => [e.up, e.down].map((p) => ({ ...p })));
}

describe("bookkeeping of events", () => {
  const cases: Array<[string, Boundary, 8 | 4, number]> = [
    ["open frames, overlap only", "open", 8, 0],
    ["periodic frames, overlap only", "periodic", 8, 0],
    ["periodic frames, up 4-connected, with a 6 px fallback", "periodic", 4, 6],
    ["open frames with a 6 px fallback", "open", 8, 6],
  ];
  for (const [name, boundary, connectivity, maxDisplacement] of cases) {
    it(`balances domains = previous + nucleated - annihilated + (pieces - splits) - (predecessors - merges) per phase on ${name}`, () => {
      for (const seed of [1, 2, 3]) {
        const m = trackMovie(risingLevels(seed, 64, levels), { boundary, connectivity }, { maxDisplacement });
        let events = 0;
        m.events.slice(1).forEach((e, i) => {
          for (const [p, phase] of [[e.up, "up"], [e.down, "down"]] as const) {
            expect(p.domains).toBe(m.counts[i + 1]![phase]);
            expect(p.previousDomains).toBe(m.counts[i]![phase]);
            // Links E: every current domain has in-degree 0 (nucleated), 1, or >= 2 (merged), so
            // domains = nucleated + E - (predecessors - merges); likewise previous domains =
            // annihilated + E - (pieces - splits). Subtracting removes E.
            expect(p.domains).toBe(p.previousDomains + p.nucleated - p.annihilated +
              (p.splitPieces - p.split) - (p.mergedPredecessors - p.merged));
            expect(p.splitPieces).toBeGreaterThanOrEqual(2 * p.split);
            expect(p.mergedPredecessors).toBeGreaterThanOrEqual(2 * p.merged);
            expect(p.continued).toBeLessThanOrEqual(Math.min(p.domains, p.previousDomains));
            events += p.nucleated + p.annihilated + p.split + p.merged;
          }
        });
        expect(events).toBeGreaterThan(10); // the movie does exercise every kind of event
      }
    });
  }

  it("gives every domain of a frame its own track and every track one row per frame it lived", () => {
    const m = trackMovie(risingLevels(4, 64, levels), { boundary: "periodic" }, { maxDisplacement: 4 });
    let present = 0;
    for (const e of m.events) {
      expect(new Set(e.trackIds).size).toBe(e.trackIds.length);
      present += e.trackIds.length;
    }
    expect(m.tracks.reduce((s, t) => s + t.lifetime, 0)).toBe(present);
    const last = m.events.at(-1)!;
    expect(m.tracks.filter((t) => t.endedBy === "still-present").map((t) => t.trackId).sort((a, b) => a - b))
      .toEqual([...last.trackIds].sort((a, b) => a - b));
    // Tracks opened = first frame + nucleated + split pieces that did not take an id.
    const opened = m.events.slice(1).reduce((s, e) => s + e.up.nucleated + e.down.nucleated, m.events[0]!.trackIds.length);
    const fromSplits = m.tracks.filter((t) => t.bornBy === "split").length;
    expect(m.tracks.length).toBe(opened + fromSplits);
    // Ended tracks: annihilated ones match the annihilation counts; the rest ended in a merge.
    const annihilated = m.events.reduce((s, e) => s + e.up.annihilated + e.down.annihilated, 0);
    expect(m.tracks.filter((t) => t.endedBy === "annihilated")).toHaveLength(annihilated);
    for (const t of m.tracks) {
      if (t.endedBy === "still-present") continue;
      expect(t.goneFrame).toBe(t.endFrame + 1);
      expect(t.lifetime).toBe(t.endFrame - t.birthFrame + 1);
    }
  });

  it("counts the same events when both frames are shifted cyclically together on a torus", () => {
    const frames = risingLevels(5, 64, levels);
    const base = eventCounts(trackMovie(frames, { boundary: "periodic" }, { maxDisplacement: 5 }));
    for (const [dx, dy] of [[17, 0], [0, 29], [40, 51]] as const) {
      const moved = frames.map((f) => shift(f, dx, dy));
      expect(eventCounts(trackMovie(moved, { boundary: "periodic" }, { maxDisplacement: 5 }))).toEqual(base);
    }
  });

  it("finds the events of a reversed movie mirrored: nucleations become annihilations, splits merges", () => {
    const frames = risingLevels(6, 64, levels);
    const fwd = trackMovie(frames, { boundary: "periodic" });
    const back = trackMovie([...frames].reverse(), { boundary: "periodic" });
    const n = frames.length;
    for (let k = 1; k < n; k++) {
      const f = fwd.events[k]!, b = back.events[n - k]!;
      for (const p of ["up", "down"] as const) {
        expect(b[p].annihilated).toBe(f[p].nucleated);
        expect(b[p].nucleated).toBe(f[p].annihilated);
        expect(b[p].merged).toBe(f[p].split);
        expect(b[p].mergedPredecessors).toBe(f[p].splitPieces);
        expect(b[p].split).toBe(f[p].merged);
        expect(b[p].continued).toBe(f[p].continued);
      }
    }
  });
});

describe("overlap counting", () => {
  function plainCount(prev: Int32Array, cur: Int32Array, pp: Uint8Array, cp: Uint8Array) {
    const m = new Map<string, number>();
    for (let i = 0; i < cur.length; i++) {
      const a = prev[i]!, b = cur[i]!;
      if (a === 0 || b === 0 || pp[a] !== cp[b]) continue;
      const k = `${a},${b}`;
      m.set(k, (m.get(k) ?? 0) + 1);
    }
    return [...m].sort();
  }

  it("agrees with a plain per-pixel count on seeded noise with thousands of label pairs", () => {
    for (const seed of [11, 12, 13]) {
      // Unsmoothed noise: many small domains and thousands of pairs.
      const m = trackMovie([randomFrame(seed, 96, 80, 0.5), randomFrame(seed + 100, 96, 80, 0.5)]);
      const [prev, cur] = m.labels as [Int32Array, Int32Array];
      const phaseOf = (k: number, labels: Int32Array) => {
        const p = new Uint8Array(Math.max(...labels) + 1).fill(255);
        const f = k === 0 ? randomFrame(seed, 96, 80, 0.5) : randomFrame(seed + 100, 96, 80, 0.5);
        for (let i = 0; i < labels.length; i++) p[labels[i]!] = f.data[i]!;
        return p;
      };
      const pp = phaseOf(0, prev), cp = phaseOf(1, cur);
      const want = plainCount(prev, cur, pp, cp);
      expect(want.length).toBeGreaterThan(500);
      // The default table, and one started at 64 slots that has to double five times or more.
      for (const hint of [undefined, 1]) {
        const counter = new OverlapCounter();
        const n = counter.count(prev, cur, pp, cp, pp.length - 1, cp.length - 1, "test", hint);
        const got = Array.from({ length: n }, (_, e) =>
          [`${counter.pairPrev[e]},${counter.pairCur[e]}`, counter.pairPixels[e]!] as [string, number]).sort();
        expect(got).toEqual(want);
        expect(counter.capacity()).toBeGreaterThanOrEqual(2 * n);
      }
    }
  });

  it("counts the same pairs with the Wasm run kernel as with the loop in TS, frame after frame", () => {
    // Arrays of the caller's own take the kernel; the same labels as views into Wasm memory take
    // the TS loop (the kernel's buffers could detach them). Three frames in a row, one counter
    // for each path.
    const frames = [21, 22, 23].map((seed) => randomFrame(seed, 97, 61, 0.5));
    const { labels, phases } = labelsAndPhases(frames);
    const kernel = new OverlapCounter(), loop = new OverlapCounter();
    const ptr = wasmAlloc(8 * labels[0]!.length);
    try {
      for (let k = 0; k + 1 < labels.length; k++) {
        const [a, b] = [labels[k]!, labels[k + 1]!];
        const na = kernel.count(a, b, phases[k]!, phases[k + 1]!, phases[k]!.length - 1, phases[k + 1]!.length - 1, "test");
        const va = viewI32(ptr, a.length), vb = viewI32(ptr + 4 * a.length, b.length);
        va.set(a); vb.set(b);
        const nb = loop.count(va, vb, phases[k]!, phases[k + 1]!, phases[k]!.length - 1, phases[k + 1]!.length - 1, "test");
        expect(na).toBe(nb);
        const pairs = (c: OverlapCounter, n: number) => Array.from({ length: n }, (_, e) => `${c.pairPrev[e]},${c.pairCur[e]}:${c.pairPixels[e]}`).sort();
        expect(pairs(kernel, na)).toEqual(pairs(loop, nb));
        expect(na).toBeGreaterThan(100);
      }
    } finally {
      wasmFree(ptr);
    }
    // A label beyond the count is named with its pixel, on both paths.
    const bad = labels[1]!.slice();
    bad[1234] = 99999;
    expect(() => kernel.count(labels[0]!, bad, phases[0]!, phases[1]!, phases[0]!.length - 1, phases[1]!.length - 1, "frame 7"))
      .toThrow("frame 7: expected labels in 0.." + (phases[1]!.length - 1) + " (the domains' count), got 99999 at pixel 1234");
  });

  it("keeps each frame's image for the next count, also through a count that throws", () => {
    // Frame after frame, countNext (the held image as the previous one) against count with the
    // previous image given, on four frames; a frame with a bad label throws and the held image
    // stays the one before it (common practice: a failed step leaves the state as it was).
    const frames = [31, 32, 33, 34].map((seed) => randomFrame(seed, 83, 67, 0.5));
    const { labels, phases } = labelsAndPhases(frames);
    const K = (k: number) => phases[k]!.length - 1;
    const pairs = (c: OverlapCounter, n: number) => Array.from({ length: n }, (_, e) => `${c.pairPrev[e]},${c.pairCur[e]}:${c.pairPixels[e]}`).sort();
    const next = new OverlapCounter(), given = new OverlapCounter();
    expect(next.holds).toBe(false);
    expect(next.hold(labels[0]!)).toBe(true);
    for (let k = 1; k < labels.length; k++) {
      const a = next.countNext(labels[k]!, phases[k - 1]!, phases[k]!, K(k - 1), K(k), "test");
      const b = given.count(labels[k - 1]!, labels[k]!, phases[k - 1]!, phases[k]!, K(k - 1), K(k), "test");
      expect(a).toBe(b);
      expect(a).toBeGreaterThan(50);
      expect(pairs(next, a)).toEqual(pairs(given, b));
      expect(next.holds).toBe(true);
      const copy = new Int32Array(labels[k]!.length);
      next.copyHeld(copy);
      expect(copy).toEqual(labels[k]!);
    }
    const last = labels.length - 1;
    const bad = labels[1]!.slice();
    bad[777] = K(1) + 5;
    expect(() => next.countNext(bad, phases[last]!, phases[1]!, K(last), K(1), "frame 9"))
      .toThrow(`frame 9: expected labels in 0..${K(1)} (the domains' count), got ${K(1) + 5} at pixel 777`);
    expect(next.holds).toBe(true);
    const a = next.countNext(labels[1]!, phases[last]!, phases[1]!, K(last), K(1), "test");
    const b = given.count(labels[last]!, labels[1]!, phases[last]!, phases[1]!, K(last), K(1), "test");
    expect(pairs(next, a)).toEqual(pairs(given, b));
    // A previous image whose labels exceed its count is named too.
    const wrongPrev = labels[0]!.slice();
    wrongPrev[5] = K(0) + 9;
    expect(() => given.count(wrongPrev, labels[1]!, phases[0]!, phases[1]!, K(0), K(1), "frame 2"))
      .toThrow(`frame 2: expected previous labels in 0..${K(0)}, got ${K(0) + 9} at pixel 5`);
    next.dispose();
    given.dispose();
  });

  it("a tracker restored from a snapshot taken mid-movie goes on exactly as the unbroken one", () => {
    // Labels handed over as arrays of their own (as a movie run's workers give them), so the
    // tracker keeps the previous image in the overlap counter and the snapshot copies it out.
    const frames = [41, 42, 43, 44, 45].map((seed) => randomFrame(seed, 64, 48, 0.5));
    const analyzer = createAnalyzer(64, 48);
    const analyzed = frames.map((f) => {
      const r = analyzer.analyze(f, { threshold: 0.5 });
      return { labels: analyzer.labels().slice(), domains: r.domains };
    });
    analyzer.dispose();
    const whole = new DomainTracker(64, 48), head = new DomainTracker(64, 48);
    const events = analyzed.map((a, k) => whole.push(a.labels, a.domains, { frame: k }));
    for (let k = 0; k < 3; k++) head.push(analyzed[k]!.labels, analyzed[k]!.domains, { frame: k });
    const resumed = DomainTracker.fromSnapshot(head.snapshot());
    for (let k = 3; k < frames.length; k++) {
      expect(resumed.push(analyzed[k]!.labels, analyzed[k]!.domains, { frame: k })).toEqual(events[k]);
    }
    expect(resumed.trackSummary()).toEqual(whole.trackSummary());
    expect(events.slice(1).some((e) => e.up.split + e.up.merged + e.down.split + e.down.merged > 0)).toBe(true);
  });

  it("counts nothing between pixels that changed phase", () => {
    const counter = new OverlapCounter();
    const prev = Int32Array.from([1, 1, 2, 2]), cur = Int32Array.from([1, 2, 1, 2]);
    const pp = Uint8Array.from([255, 1, 0]), cp = Uint8Array.from([255, 0, 1]);
    const n = counter.count(prev, cur, pp, cp, 2, 2, "test");
    const pairs = Array.from({ length: n }, (_, e) => [counter.pairPrev[e], counter.pairCur[e], counter.pairPixels[e]]);
    expect(pairs.sort()).toEqual([[1, 2, 1], [2, 1, 1]]);
  });
});
