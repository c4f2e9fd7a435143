// Spectrum benchmark: domtopo's Wasm FFT (+ radial profile + ring order) against fft.js
// (row-column, plain JS) and OpenCV.js cv.dft, on seeded frames, in one run. No I/O in the timed
// part. Run: npx tsx bench/spectrum.bench.ts [--quick]
import Benchmark from "benchmark";
import FFT from "fft.js";
import cvModule from "@techstark/opencv-js";
import { RealFFT2D } from "../src/wasm/fft";
import { createSpectrumWorkspace } from "../src/spectrum";
import { mazeFrame } from "../test/spectrum/patterns";

const quick = process.argv.includes("--quick");
const maxTime = quick ? 0.5 : 1.5;

/** OpenCV.js's module is a thenable: wait for onRuntimeInitialized, resolve with a wrapper. */
function loadOpenCv(): Promise<{ cv: any }> {
  const m = cvModule as any;
  if (m.Mat) return Promise.resolve({ cv: m });
  return new Promise((resolve) => {
    m.onRuntimeInitialized = () => resolve({ cv: m });
  });
}

/** Plain-JS radial profile of a full complex spectrum (interleaved rows of w complex). */
function radialProfileJs(spec: Float64Array, w: number, h: number, sums: Float64Array, counts: Float64Array): void {
  sums.fill(0); counts.fill(0);
  const side = Math.max(w, h), sx = side / w, sy = side / h;
  for (let ky = 0; ky < h; ky++) {
    const kys = ky <= h / 2 ? ky : ky - h;
    for (let kx = 0; kx < w; kx++) {
      const kxs = kx <= w / 2 ? kx : kx - w;
      const o = 2 * (ky * w + kx);
      const p = spec[o]! * spec[o]! + spec[o + 1]! * spec[o + 1]!;
      const b = Math.round(Math.hypot(kxs * sx, kys * sy));
      if (b < sums.length) { sums[b]! += p; counts[b]! += 1; }
    }
  }
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
}

const { cv } = await loadOpenCv();
const rows: { size: string; name: string; ms: number }[] = [];

for (const [w, h] of [[512, 512], [1024, 1024], [1000, 1000]] as const) {
  const frame = mazeFrame(w, h, 16, 0.2, 42); // seeded maze phase map
  const grey = new Float32Array(frame.data.length);
  for (let i = 0; i < grey.length; i++) grey[i] = frame.data[i] ? 1 : -1;

  const plan = new RealFFT2D(w, h);
  const ws = createSpectrumWorkspace(w, h);
  const suite = new Benchmark.Suite(`${w}x${h}`);
  suite.add("domtopo FFT", () => { plan.setInput(grey); plan.forward(); }, { maxTime });
  suite.add("domtopo FFT+profile+order", () => { ws.analyze(frame, { boundary: "periodic", structureTensor: "off" }); }, { maxTime });
  suite.add("domtopo FFT+profile+order, hann", () => { ws.analyze(frame, { structureTensor: "off" }); }, { maxTime });
  suite.add("domtopo analyze (default, + structure tensor)", () => { ws.analyze(frame); }, { maxTime });

  const pow2 = (w & (w - 1)) === 0 && (h & (h - 1)) === 0;
  if (pow2) {
    const fr = new FFT(w), fc = new FFT(h);
    const rowIn = new Array<number>(w).fill(0);
    const rowOut = fr.createComplexArray() as number[];
    const spec = new Float64Array(2 * w * h);
    const col = fc.createComplexArray() as number[], colOut = fc.createComplexArray() as number[];
    const sums = new Float64Array(Math.ceil(Math.max(w, h) * Math.SQRT1_2) + 2), counts = new Float64Array(sums.length);
    const fftJs = () => {
      for (let y = 0; y < h; y++) {
        for (let x = 0; x < w; x++) rowIn[x] = grey[y * w + x]!;
        fr.realTransform(rowOut, rowIn);
        fr.completeSpectrum(rowOut);
        for (let i = 0; i < 2 * w; i++) spec[2 * y * w + i] = rowOut[i]!;
      }
      for (let x = 0; x < w; x++) {
        for (let y = 0; y < h; y++) { col[2 * y] = spec[2 * (y * w + x)]!; col[2 * y + 1] = spec[2 * (y * w + x) + 1]!; }
        fc.transform(colOut, col);
        for (let y = 0; y < h; y++) { spec[2 * (y * w + x)] = colOut[2 * y]!; spec[2 * (y * w + x) + 1] = colOut[2 * y + 1]!; }
      }
    };
    suite.add("fft.js row-column", fftJs, { maxTime });
    suite.add("fft.js row-column + profile", () => { fftJs(); radialProfileJs(spec, w, h, sums, counts); }, { maxTime });
  }

  const src = new cv.Mat(h, w, cv.CV_32F);
  src.data32F.set(grey);
  const dst = new cv.Mat();
  suite.add("OpenCV.js dft (real, CCS)", () => { cv.dft(src, dst, 0); }, { maxTime });
  suite.add("OpenCV.js dft (complex output)", () => { cv.dft(src, dst, cv.DFT_COMPLEX_OUTPUT); }, { maxTime });

  suite.on("cycle", (e: any) => {
    const b = e.target as Benchmark;
    rows.push({ size: `${w}x${h}`, name: b.name!, ms: median(b.stats.sample) * 1000 });
  });
  suite.run({ async: false });
  src.delete(); dst.delete();
  plan.dispose(); ws.dispose();
}

const get = (size: string, name: string) => rows.find((r) => r.size === size && r.name === name)?.ms;
console.log("\nmedian time per frame (ms), ratio = time / OpenCV.js dft (real, CCS)");
for (const r of rows) {
  const ref = get(r.size, "OpenCV.js dft (real, CCS)")!;
  console.log(`${r.size.padEnd(10)} ${r.name.padEnd(48)} ${r.ms.toFixed(3).padStart(9)}  x${(r.ms / ref).toFixed(2)}`);
}
for (const name of ["domtopo FFT", "domtopo FFT+profile+order"]) {
  const a = get("1000x1000", name)!, b = get("1024x1024", name)!;
  console.log(`${name}: 1000x1000 / 1024x1024 = ${(a / b).toFixed(2)}`);
}
