// End to end on a movie: read an .npy stack of 512 x 512 demo frames, analyze every frame with
// everything on (labeling, Euler, walls, skeletons and kinds, spectrum, tracking), write the
// tables; with 1 and 2 worker threads. Prints frames/s, the scaling ratio and peak memory at two
// movie lengths (peak memory must not grow with the number of frames), and then, for comparison,
// the frame analysis alone in two threads at once against one.
// Usage: npx tsx bench/movie.bench.ts [--frames 400] [--size 512]   (needs `npm run build`)
import { mkdtempSync, rmSync, openSync, writeSync, closeSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { Worker } from "node:worker_threads";
import { execFileSync } from "node:child_process";
import { fileURLToPath } from "node:url";
import { runAnalysis, demoSweep } from "../dist/node.js";

const arg = (name: string, d: number) => {
  const i = process.argv.indexOf(`--${name}`);
  return i >= 0 ? Number(process.argv[i + 1]) : d;
};
const FRAMES = arg("frames", 400), SIZE = arg("size", 512);
const dir = mkdtempSync(join(tmpdir(), "domtopo-movie-bench-"));

// An .npy stack written by hand (format 1.0, |u1, C order), frames from a slow field sweep.
function writeStack(path: string, frames: number) {
  const sweep = demoSweep({ size: SIZE, frames: 61, seed: 9 });
  let header = `{'descr': '|u1', 'fortran_order': False, 'shape': (${frames}, ${SIZE}, ${SIZE}), }`;
  const pad = 64 - ((10 + header.length + 1) % 64);
  header += " ".repeat(pad % 64) + "\n";
  const fd = openSync(path, "w");
  const pre = new Uint8Array(10);
  pre.set([0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59, 1, 0]);
  new DataView(pre.buffer).setUint16(8, header.length, true);
  writeSync(fd, pre);
  writeSync(fd, header);
  for (let k = 0; k < frames; k++) {
    // Back and forth along the sweep, so every frame differs from the last.
    const t = k % 120, j = t < 60 ? t : 120 - t;
    writeSync(fd, sweep.frame(j).data);
  }
  closeSync(fd);
}

async function measure(path: string, workers: number, out: string) {
  // RSS sampled on a timer and after every frame (with one worker the analysis runs in this
  // thread and the timer rarely gets a turn); the peak of each quarter of the run shows whether
  // memory levels off.
  let peakRss = 0;
  const quarters = [0, 0, 0, 0];
  let quarter = 0;
  const sample = () => {
    const r = process.memoryUsage.rss();
    peakRss = Math.max(peakRss, r);
    quarters[quarter] = Math.max(quarters[quarter]!, r);
  };
  const timer = setInterval(sample, 20);
  const t0 = performance.now();
  const s = await runAnalysis({
    inputs: [path], out, workers,
    options: { frame: { threshold: 127.5, minDomainArea: 4 }, domains: true }, tracking: {},
    onProgress: (done, total) => { sample(); quarter = Math.min(3, Math.floor((4 * done) / total)); },
  });
  const seconds = (performance.now() - t0) / 1000;
  clearInterval(timer);
  sample();
  return { fps: s.frames / seconds, seconds, peakRssMB: peakRss / 2 ** 20, quartersMB: quarters.map((q) => q / 2 ** 20) };
}

// For comparison, how this machine shares itself between two threads on this work: the frame
// analysis alone (no reading, writing, messages or tracking), in one thread and then in two
// threads started together, on demo frames. Caches and memory bandwidth shared between the
// cores keep it below 2. (A movie's one-worker run also does the writing thread's work in the
// same thread, so the movie's ratio can come out above this one.)
const ANALYSIS_THREAD = `
(async () => {
  const { parentPort, workerData } = await import("node:worker_threads");
  const m = await import(workerData.url);
  const sweep = m.demoSweep({ size: workerData.size, frames: 61, seed: 9 });
  const frames = Array.from({ length: 8 }, (_, j) => sweep.frame(j * 7));
  const analyzer = m.createAnalyzer(workerData.size, workerData.size);
  const options = { threshold: 127.5, minDomainArea: 4 };
  for (let i = 0; i < 16; i++) analyzer.analyze(frames[i % 8], options);
  parentPort.postMessage("ready");
  await new Promise((go) => parentPort.once("message", go));
  const t0 = performance.now();
  for (let i = 0; i < workerData.frames; i++) analyzer.analyze(frames[i % 8], options);
  parentPort.postMessage(performance.now() - t0);
})();`;

/** Frames per second of `threads` threads each analyzing `frames` demo frames, all started at once. */
async function analysisRate(threads: number, frames: number): Promise<number> {
  const url = new URL("../dist/index.js", import.meta.url).href;
  const ws = Array.from({ length: threads }, () => new Worker(ANALYSIS_THREAD, { eval: true, workerData: { url, size: SIZE, frames } }));
  const next = (w: Worker) => new Promise<unknown>((done, fail) => { w.once("message", done); w.once("error", fail); });
  await Promise.all(ws.map(next));
  const times = ws.map(next);
  for (const w of ws) w.postMessage("go");
  const ms = (await Promise.all(times)) as number[];
  await Promise.all(ws.map((w) => w.terminate()));
  return (threads * frames) / (Math.max(...ms) / 1000);
}

// Each movie runs in a process of its own (this script with --measure), so that its peak memory
// starts from nothing: worker threads of an earlier run leave memory the process keeps.
const measureArg = process.argv.indexOf("--measure");
if (measureArg > 0) {
  const [path, workers, out] = process.argv.slice(measureArg + 1, measureArg + 4) as [string, string, string];
  rmSync(dir, { recursive: true, force: true });
  console.log(JSON.stringify(await measure(path, Number(workers), out)));
  process.exit(0);
}
function measureApart(path: string, workers: number, out: string): Awaited<ReturnType<typeof measure>> {
  const stdout = execFileSync(process.execPath, [...process.execArgv, fileURLToPath(import.meta.url), "--measure", path, String(workers), out],
    { encoding: "utf8", stdio: ["ignore", "pipe", "inherit"] });
  return JSON.parse(stdout.trim().split("\n").pop()!) as Awaited<ReturnType<typeof measure>>;
}

const half = join(dir, "half.npy"), full = join(dir, "full.npy");
writeStack(half, Math.floor(FRAMES / 2));
writeStack(full, FRAMES);
console.log(`movie: ${FRAMES} frames of ${SIZE} x ${SIZE}, everything on (skeleton, spectrum, tracking, domain table)`);
const rows: string[] = [];
const results: Record<string, Awaited<ReturnType<typeof measure>>> = {};
for (const workers of [1, 2]) {
  for (const [name, path] of [["half", half], ["full", full]] as const) {
    const r = measureApart(path, workers, join(dir, `out-${workers}-${name}`));
    results[`${workers}-${name}`] = r;
    rows.push(`workers ${workers}  ${name === "half" ? Math.floor(FRAMES / 2) : FRAMES} frames  ${r.fps.toFixed(1).padStart(6)} frames/s  ` +
      `${r.seconds.toFixed(1).padStart(6)} s  peak RSS (its own process, workers included) ${r.peakRssMB.toFixed(0)} MB ` +
      `(by quarter of the run: ${r.quartersMB.map((q) => q.toFixed(0)).join(", ")})`);
    console.log(rows[rows.length - 1]);
  }
}
const pairRatios: number[] = [];
for (let r = 0; r < 5; r++) {
  // (the order alternates, so that a drift of the machine's speed does not favour one side)
  const [one, two] = r % 2 === 0
    ? [await analysisRate(1, 250), await analysisRate(2, 250)]
    : [await analysisRate(2, 250), await analysisRate(1, 250)].reverse() as [number, number];
  pairRatios.push(two / one);
}
const alone = [...pairRatios].sort((a, b) => a - b)[2]!;
console.log(`frame analysis alone, two threads at once / one thread: ${alone.toFixed(2)}x ` +
  `(median of 5 rounds: ${pairRatios.map((c) => c.toFixed(2)).join(", ")})`);

const scaling = results["2-full"]!.fps / results["1-full"]!.fps;
console.log(`scaling 2 workers / 1 worker: ${scaling.toFixed(2)}x (target >= 1.7; the analysis alone in two threads: ${alone.toFixed(2)}x)`);
console.log(`frames/s per core (1 worker): ${results["1-full"]!.fps.toFixed(1)} (target >= 80)`);
for (const w of [1, 2]) {
  console.log(`peak RSS, ${FRAMES} vs ${Math.floor(FRAMES / 2)} frames, ${w} worker${w > 1 ? "s" : ""}: ` +
    `${results[`${w}-full`]!.peakRssMB.toFixed(0)} vs ${results[`${w}-half`]!.peakRssMB.toFixed(0)} MB`);
}
rmSync(dir, { recursive: true, force: true });
