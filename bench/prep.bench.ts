// Preprocessing benchmark: Gaussian smoothing (sigma 1.5) and Gaussian high-pass flattening
// (sigma 50) on seeded 512 and 1024 frames, domtopo's plain-TS filters against OpenCV.js
// cv.GaussianBlur (reflect-101 sides) in the same run. No I/O in the timed part; medians printed.
// Run: npx tsx bench/prep.bench.ts [--quick]
import Benchmark from "benchmark";
import cvModule from "@techstark/opencv-js";
import { GaussianPlan } from "../src/prep/gaussian";
import { createPreprocessor } from "../src/prep/preprocess";
import { gaussianRandomField } from "../src/demo/grf";

const quick = process.argv.includes("--quick");
const maxTime = quick ? 0.5 : 1.5;

function loadOpenCv(): Promise<{ cv: any }> {
  const m = cvModule as any;
  if (m.Mat) return Promise.resolve({ cv: m });
  return new Promise((resolve) => { m.onRuntimeInitialized = () => resolve({ cv: m }); });
}

function medianMs(b: Benchmark): number {
  const s = [...b.stats.sample].sort((x, y) => x - y);
  const m = s.length >> 1;
  return 1000 * (s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2);
}

const { cv } = await loadOpenCv();
const rows: { size: number; name: string; ms: number }[] = [];

for (const n of [512, 1024]) {
  // A seeded maze with a tilt and a vignette: the kind of frame the high-pass is for.
  const field = gaussianRandomField({ width: n, height: n, seed: 3, period: 20 });
  const frame = { width: n, height: n, data: new Float32Array(n * n) };
  for (let y = 0; y < n; y++) for (let x = 0; x < n; x++) {
    const r2 = ((x - n / 2) ** 2 + (y - n / 2) ** 2) / (n * n);
    frame.data[y * n + x] = 120 + 30 * Math.sign(field.data[y * n + x]!) + 0.02 * x + 40 * Math.exp(-4 * r2);
  }
  const out = new Float32Array(n * n);
  const smoothDirect = new GaussianPlan(n, n, 1.5, { method: "direct" });
  const smoothBox = new GaussianPlan(n, n, 1.5, { method: "box" });
  const blur50 = new GaussianPlan(n, n, 50, { method: "box" });
  const highpass = createPreprocessor(n, n, { flatten: { mode: "gaussian-highpass", sigma: 50 } });
  const both = createPreprocessor(n, n, { flatten: { mode: "gaussian-highpass", sigma: 50 }, smooth: { sigma: 1.5 } });
  const src = cv.matFromArray(n, n, cv.CV_32F, frame.data), dst = new cv.Mat();

  const suite = new Benchmark.Suite(`${n}x${n}`);
  suite.add("smooth sigma 1.5, direct (TS)", () => smoothDirect.apply(out, frame.data), { maxTime });
  suite.add("smooth sigma 1.5, box cascade (TS)", () => smoothBox.apply(out, frame.data), { maxTime });
  suite.add("smooth sigma 1.5, OpenCV.js GaussianBlur", () => cv.GaussianBlur(src, dst, new cv.Size(13, 13), 1.5, 1.5, cv.BORDER_REFLECT), { maxTime });
  suite.add("blur sigma 50, box cascade (TS)", () => blur50.apply(out, frame.data), { maxTime });
  suite.add("blur sigma 50, OpenCV.js GaussianBlur", () => cv.GaussianBlur(src, dst, new cv.Size(401, 401), 50, 50, cv.BORDER_REFLECT), { maxTime });
  suite.add("high-pass sigma 50 (preprocessor)", () => highpass.process(frame), { maxTime });
  suite.add("high-pass sigma 50 + smooth 1.5 (preprocessor)", () => both.process(frame), { maxTime });
  suite.on("cycle", (e: Benchmark.Event) => {
    const b = e.target as unknown as Benchmark;
    rows.push({ size: n, name: b.name!, ms: medianMs(b) });
  });
  suite.run();
  src.delete(); dst.delete();
}

console.log("size   median ms  ratio to OpenCV  case");
for (const r of rows) {
  const kind = r.name.startsWith("smooth") ? "smooth" : "blur";
  const ref = rows.find((q) => q.size === r.size && q.name.includes("OpenCV") && q.name.startsWith(kind));
  const ratio = ref && !r.name.includes("OpenCV") && !r.name.includes("preprocessor") ? (r.ms / ref.ms).toFixed(2) : "";
  console.log(`${String(r.size).padEnd(6)} ${r.ms.toFixed(2).padStart(9)}  ${ratio.padStart(15)}  ${r.name}`);
}
