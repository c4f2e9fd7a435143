// Labeling both phases with per-domain stats (one FrameAnalyzer.analyze call) against OpenCV.js
// connectedComponentsWithStats (@techstark/opencv-js 4.12.0, one phase and both phases) and the
// plain-TS reference labeler, on seeded maze, bubble and white-noise frames; then the Wasm
// memory of a 2048 x 2048 frame and over 1,000 frames in one workspace.
// Run with `npm run bench` (or `npx tsx bench/labeling.bench.ts`). No I/O in the timed part.
import Benchmark from "benchmark";
import { createAnalyzer } from "../src/topology/analyze";
import type { FrameOptions } from "../src/topology/options";
import { wasmMemoryBytes } from "../src/wasm/heap";
import { referenceLabel } from "../test/reference/label-reference";
import { loadOpenCv } from "../test/reference/opencv";
import { patternFrame, type Pattern } from "./fields";

const SIZES = [256, 512, 1024, 2048];
const PATTERNS: Pattern[] = ["maze", "bubble", "noise"];
/** The plain-TS reference is skipped above this size (seconds per frame at 2048). */
const REFERENCE_MAX = 1024;
const OPTIONS: FrameOptions = { threshold: 0.5, connectivity: 8, boundary: "open", spectrum: "off" };
const mb = (bytes: number) => `${(bytes / 2 ** 20).toFixed(1)} MB`;

function median(sample: number[]): number {
  const s = [...sample].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
}

// ---- memory, first, in a fresh instance ---------------------------------------------------

function memoryReport(): void {
  const n = 2048;
  const before = wasmMemoryBytes();
  const maze = { width: n, height: n, data: patternFrame("maze", n, 1) };
  const analyzer = createAnalyzer(n, n);
  analyzer.analyze(maze, OPTIONS);
  console.log(`Wasm memory, ${n} x ${n} maze: workspace ${mb(analyzer.memoryBytes())} ` +
    `(createAnalyzer(${n}, ${n}).memoryBytes()), module memory ${mb(wasmMemoryBytes())} ` +
    `(WebAssembly.Memory buffer; ${mb(before)} before the workspace). Target: within 100 MB.`);
  analyzer.dispose();
  // The workspace grows its domain columns with the number of provisional labels: noise is the worst case.
  for (const pattern of ["bubble", "noise"] as const) {
    const a = createAnalyzer(n, n);
    const domains = a.analyze({ width: n, height: n, data: patternFrame(pattern, n, 1) }, OPTIONS).domains.count;
    console.log(`  ${n} x ${n} ${pattern} (${domains} domains): workspace ${mb(a.memoryBytes())}, module memory now ${mb(wasmMemoryBytes())}`);
    a.dispose();
  }

  // 1,000 frames through one 512 x 512 workspace: mazes, bubbles and noise of 12 seeds in turn.
  const m = 512;
  const frames = PATTERNS.flatMap((p) => [1, 2, 3, 4].map((seed) => ({ width: m, height: m, data: patternFrame(p, m, 100 + seed) })));
  const ws = createAnalyzer(m, m);
  const rows: string[] = [];
  for (let k = 0; k < 1000; k++) {
    ws.analyze(frames[k % frames.length]!, OPTIONS);
    if (k === 0 || k === frames.length - 1 || k === 999) {
      rows.push(`after frame ${k + 1}: workspace ${ws.memoryBytes()} B, module ${wasmMemoryBytes()} B`);
    }
  }
  console.log(`Memory over 1,000 frames of ${m} x ${m} in one workspace (${frames.length} distinct frames cycled):\n  ` + rows.join("\n  "));
  ws.dispose();
}

// ---- timing ----------------------------------------------------------------------------------

interface Row { pattern: Pattern; size: number; domains: number; kernel: number; cvOne: number; cvBoth: number; reference: number }

async function main(): Promise<void> {
  memoryReport();
  const { cv } = await loadOpenCv();
  const rows: Row[] = [];
  for (const size of SIZES) {
    for (const pattern of PATTERNS) {
      // Prepared outside the timed part: the 0/1 frame, both masks as Mats, the output Mats.
      const phase = patternFrame(pattern, size, 1);
      const frame = { width: size, height: size, data: phase };
      const analyzer = createAnalyzer(size, size);
      const domains = analyzer.analyze(frame, OPTIONS).domains.count;
      const up = new cv.Mat(size, size, cv.CV_8UC1);
      const down = new cv.Mat(size, size, cv.CV_8UC1);
      up.data.set(phase);
      down.data.set(phase.map((v) => 1 - v));
      const labels = new cv.Mat(), stats = new cv.Mat(), centroids = new cv.Mat();
      const times: Record<string, number> = {};
      const suite = new Benchmark.Suite(`${pattern} ${size}`);
      const opts = { maxTime: size >= 1024 ? 1.5 : 1, minSamples: 8 };
      suite.add("kernel, both phases", () => { analyzer.analyze(frame, OPTIONS); }, opts);
      suite.add("OpenCV, up phase", () => {
        cv.connectedComponentsWithStats(up, labels, stats, centroids, 8, cv.CV_32S);
      }, opts);
      suite.add("OpenCV, both phases", () => {
        cv.connectedComponentsWithStats(up, labels, stats, centroids, 8, cv.CV_32S);
        cv.connectedComponentsWithStats(down, labels, stats, centroids, 4, cv.CV_32S);
      }, opts);
      if (size <= REFERENCE_MAX) {
        suite.add("plain TS, both phases", () => {
          referenceLabel(phase, size, size, { connectivity: 8, periodicX: false, periodicY: false });
        }, { maxTime: 1, minSamples: 3 });
      }
      suite.on("cycle", (e: Benchmark.Event) => {
        const b = e.target as unknown as Benchmark;
        times[b.name!] = median(b.stats.sample) * 1e3;
      });
      suite.run({ async: false });
      rows.push({
        pattern, size, domains,
        kernel: times["kernel, both phases"]!, cvOne: times["OpenCV, up phase"]!,
        cvBoth: times["OpenCV, both phases"]!, reference: times["plain TS, both phases"] ?? NaN,
      });
      up.delete(); down.delete(); labels.delete(); stats.delete(); centroids.delete();
      analyzer.dispose();
      process.stderr.write(`  measured ${pattern} ${size}\n`);
    }
  }
  const f = (v: number, d = 2) => (Number.isNaN(v) ? "skipped" : v.toFixed(d));
  console.log("\nMedian time per frame (ms). kernel: FrameAnalyzer.analyze, threshold 0.5 on a 0/1 frame, both phases");
  console.log("labeled (up 8, down 4) with per-domain stats and the quad pass. OpenCV: connectedComponentsWithStats");
  console.log(`(@techstark/opencv-js 4.12.0) on the up mask (8) and on both masks (up 8, down 4). plain TS: the`);
  console.log(`test/reference flood fill, both phases; skipped above ${REFERENCE_MAX} x ${REFERENCE_MAX} (seconds per frame there).`);
  const head = ["pattern", "size", "domains", "kernel", "OpenCV 1", "OpenCV 2", "plain TS", "kernel/OpenCV 1", "kernel/plain TS"];
  const table = rows.map((r) => [
    r.pattern, String(r.size), String(r.domains), f(r.kernel), f(r.cvOne), f(r.cvBoth), f(r.reference, 1),
    f(r.kernel / r.cvOne), f(r.kernel / r.reference, 3),
  ]);
  const widths = head.map((h, i) => Math.max(h.length, ...table.map((t) => t[i]!.length)));
  const line = (cells: string[]) => cells.map((c, i) => (i < 1 ? c.padEnd(widths[i]!) : c.padStart(widths[i]!))).join("  ");
  console.log(line(head));
  for (const t of table) console.log(line(t));
  const target = rows.find((r) => r.pattern === "maze" && r.size === 512)!;
  console.log(`\nTarget, 512 x 512 maze: kernel both phases ${f(target.kernel)} ms vs OpenCV one phase ${f(target.cvOne)} ms: ` +
    (target.kernel <= target.cvOne ? "met" : "missed") + ".");
}

await main();
