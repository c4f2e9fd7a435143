// Per-pass cost of the labeling kernel on one frame (not a *.bench.ts: run it by hand with
// `npx tsx bench/profile-labeling.ts [pattern] [size]`). Each pass is repeated on its own and
// timed by process CPU time (robust on a shared machine) and by wall time, per frame.
import { LabelingWorkspace } from "../src/wasm/labeling";
import { kernels } from "../src/wasm/instance";
import { buildDomainTable } from "../src/topology/domains";
import { createAnalyzer } from "../src/topology/analyze";
import { loadOpenCv } from "../test/reference/opencv";
import { patternFrame, type Pattern } from "./fields";

const pattern = (process.argv[2] ?? "maze") as Pattern;
const n = Number(process.argv[3] ?? 512);
const phase = patternFrame(pattern, n, 1);
const reps = Math.max(20, Math.round(1e8 / (n * n)));
const ws = new LabelingWorkspace(n, n);
const k = kernels();
ws.loadSamples(phase);
ws.threshold(0, 1, false);
const K = ws.label(0, false, false); // binds the domain columns for the passes below

function cost(name: string, fn: () => void): void {
  for (let r = 0; r < 5; r++) fn(); // warm up (lets V8 tier the Wasm functions up)
  const c0 = process.cpuUsage(), w0 = performance.now();
  for (let r = 0; r < reps; r++) fn();
  const cpu = process.cpuUsage(c0), wall = performance.now() - w0;
  console.log(`  ${name.padEnd(40)} cpu ${((cpu.user + cpu.system) / 1e3 / reps).toFixed(3)} ms  wall ${(wall / reps).toFixed(3)} ms`);
}

console.log(`${pattern} ${n} x ${n}, ${K} domains, ${reps} repetitions per pass, per frame:`);
cost("load + threshold", () => { ws.loadSamples(phase); ws.threshold(0, 1, false); });
cost("scan + flatten (labelScan)", () => { k.setGeometry(n, n, 0, 0, 0); k.labelScan(); });
cost("scan + flatten + runs (label)", () => { ws.label(0, false, false); });
cost("quads (measureQuads)", () => { ws.measureQuads(); });
cost("domain table (JS)", () => { buildDomainTable(ws, 1); });
const an = createAnalyzer(n, n);
const frame = { width: n, height: n, data: phase };
cost("whole FrameAnalyzer.analyze", () => { an.analyze(frame, { threshold: 0.5, spectrum: "off" }); });
const { cv } = await loadOpenCv();
const up = new cv.Mat(n, n, cv.CV_8UC1);
up.data.set(phase);
const labels = new cv.Mat(), stats = new cv.Mat(), centroids = new cv.Mat();
cost("OpenCV connectedComponentsWithStats, up", () => {
  cv.connectedComponentsWithStats(up, labels, stats, centroids, 8, cv.CV_32S);
});
up.delete(); labels.delete(); stats.delete(); centroids.delete();
