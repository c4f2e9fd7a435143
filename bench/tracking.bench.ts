// Tracking cost per frame against the analysis cost of the same frame, on demo-like mazes: one
// seeded ring-spectrum Gaussian random field thresholded at slowly rising levels (period 24 px),
// periodic sides. Frames are analyzed before the timed part; the tracker is fed their labels in
// a forward-and-back order so every push links two neighbouring levels.
// Rows: the tracker (overlap only, and with a 5 px nearest-neighbour fallback), a plain-TS
// overlap count with a Map as the baseline for the typed table, and the frame analysis itself.
// There is no reference library for this step. Run: npx tsx bench/tracking.bench.ts
import Benchmark from "benchmark";
import { createAnalyzer, type FrameOptions, type FrameResult } from "../src/index";
import { gaussianRandomField } from "../src/demo/grf";
import { DomainTracker } from "../src/sequence/tracking";

const FRAMES = 24;
const options: FrameOptions = { threshold: 0, boundary: "periodic" };

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
}

/** Same-phase overlap pairs counted with a Map keyed by prev * (Kcur + 1) + cur. */
function plainOverlap(prev: Int32Array, cur: Int32Array, prevPhase: Uint8Array, curPhase: Uint8Array, kCur: number): number {
  const m = new Map<number, number>();
  for (let i = 0; i < cur.length; i++) {
    const a = prev[i]!, b = cur[i]!;
    if (prevPhase[a - 1] !== curPhase[b - 1]) continue;
    const key = a * (kCur + 1) + b;
    m.set(key, (m.get(key) ?? 0) + 1);
  }
  return m.size;
}

function ladderStep(size: number): void {
  const field = gaussianRandomField({ width: size, height: size, period: 24, bandwidth: 0.12, seed: 7 });
  const analyzer = createAnalyzer(size, size);
  const results: FrameResult[] = [];
  const frames = Array.from({ length: FRAMES }, (_, k) => {
    const level = -0.4 + (0.8 * k) / (FRAMES - 1); // about 0.035 standard deviations per frame
    const data = new Float32Array(field.data.length);
    for (let i = 0; i < data.length; i++) data[i] = field.data[i]! - level;
    return { width: size, height: size, data };
  });
  for (const f of frames) results.push(analyzer.analyze(f, { ...options, keepLabels: true }));
  const order = [...Array(FRAMES).keys(), ...[...Array(FRAMES).keys()].reverse().slice(1, -1)];
  const domains = results.map((r) => r.domains.count);
  console.log(`\n${size} x ${size}: ${FRAMES} frames, ${Math.min(...domains)}..${Math.max(...domains)} domains per frame`);

  const feeder = (maxDisplacement: number) => {
    const tracker = new DomainTracker(size, size, { boundary: "periodic", maxDisplacement });
    let n = 0;
    return () => {
      const r = results[order[n % order.length]!]!;
      tracker.push(r.labels!, r.domains, { frame: n++ });
    };
  };
  const overlapOnly = feeder(0), withFallback = feeder(5);
  overlapOnly(); withFallback(); // the first push links nothing
  let p = 0;
  const plain = () => {
    const a = results[order[p % order.length]!]!, b = results[order[(p + 1) % order.length]!]!;
    p++;
    return plainOverlap(a.labels!, b.labels!, a.domains.phase, b.domains.phase, b.domains.count);
  };
  let q = 0;
  const analyze = () => analyzer.analyze(frames[q++ % FRAMES]!, options);

  const medians = new Map<string, number>();
  const suite = new Benchmark.Suite();
  suite
    .add("track (overlap)", overlapOnly)
    .add("track (overlap + 5 px fallback)", withFallback)
    .add("plain-TS Map overlap count", plain)
    .add("analyze frame", analyze)
    .on("cycle", (ev: Benchmark.Event) => {
      const b = ev.target as unknown as Benchmark;
      const ms = median(b.stats.sample) * 1e3;
      medians.set(b.name!, ms);
      console.log(`  ${b.name!.padEnd(34)} median ${ms.toFixed(3)} ms  (±${b.stats.rme.toFixed(1)}%, ${b.stats.sample.length} samples)`);
    })
    .run({ async: false });
  const a = medians.get("analyze frame")!;
  const t = medians.get("track (overlap)")!;
  console.log(`  tracking / analysis: ${(t / a).toFixed(3)} (overlap), ` +
    `${(medians.get("track (overlap + 5 px fallback)")! / a).toFixed(3)} (with fallback); ` +
    `plain Map count / tracker: ${(medians.get("plain-TS Map overlap count")! / t).toFixed(1)}x`);
  analyzer.dispose();
}

for (const size of [256, 512]) ladderStep(size);
