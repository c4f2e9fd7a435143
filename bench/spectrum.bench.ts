// Spectrum benchmark: domtopo's FFT + radial profile + ring order, before (the `direct`
// reduction path: a radius per spectrum point, structure tensor in TypeScript) and after (the
// annulus-slot table and the Wasm structure-tensor sums), against OpenCV.js cv.dft and fft.js
// (row-column, plain JS), on seeded frames, in one run. No I/O in the timed part.
//
// The machine this runs on is usually shared, so the candidates are timed in interleaved
// rounds: each round times every candidate of every size once (in a rotated order), and each
// ratio is taken within a round before its median over rounds is quoted.
// Run: npx tsx bench/spectrum.bench.ts [--quick] [--rounds N]
import FFT from "fft.js";
import cvModule from "@techstark/opencv-js";
import { RealFFT2D } from "../src/wasm/fft";
import { createSpectrumWorkspace, type SpectrumOptions } from "../src/spectrum";
import { createReferenceSpectrumWorkspace } from "../src/spectrum/workspace";
import { mazeFrame } from "../test/spectrum/patterns";

const quick = process.argv.includes("--quick");
const roundsArg = process.argv.indexOf("--rounds");
const rounds = roundsArg > 0 ? Number(process.argv[roundsArg + 1]) : quick ? 7 : 21;
/** Target milliseconds of one timed batch (a candidate repeats until a batch lasts this long). */
const batchMs = quick ? 10 : 25;

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

interface Candidate {
  size: string;
  name: string;
  run: () => void;
  reps: number;
  ms: number[];
}

const REF = "OpenCV.js dft (real, CCS)";
const { cv } = await loadOpenCv();
const candidates: Candidate[] = [];
const cleanup: (() => void)[] = [];
const add = (size: string, name: string, run: () => void) => candidates.push({ size, name, run, reps: 1, ms: [] });

const periodic: SpectrumOptions = { boundary: "periodic", structureTensor: "off" };
const hann: SpectrumOptions = { structureTensor: "off" };
const sizes = [[512, 512], [1024, 1024], [1000, 1000]] as const;

for (const [w, h] of sizes) {
  const size = `${w}x${h}`;
  const frame = mazeFrame(w, h, 16, 0.2, 42); // seeded maze phase map
  const grey = new Float32Array(frame.data.length);
  for (let i = 0; i < grey.length; i++) grey[i] = frame.data[i] ? 1 : -1;

  const plan = new RealFFT2D(w, h);
  const ws = createSpectrumWorkspace(w, h);
  const ref = createReferenceSpectrumWorkspace(w, h);
  cleanup.push(() => { plan.dispose(); ws.dispose(); ref.dispose(); });

  const src = new cv.Mat(h, w, cv.CV_32F);
  src.data32F.set(grey);
  const dst = new cv.Mat();
  cleanup.push(() => { src.delete(); dst.delete(); });
  add(size, REF, () => { cv.dft(src, dst, 0); });
  add(size, "OpenCV.js dft (complex output)", () => { cv.dft(src, dst, cv.DFT_COMPLEX_OUTPUT); });

  add(size, "domtopo FFT", () => { plan.setInput(grey); plan.forward(); });
  add(size, "before: FFT+profile+order", () => { ref.analyze(frame, periodic); });
  add(size, "after:  FFT+profile+order", () => { ws.analyze(frame, periodic); });
  add(size, "before: FFT+profile+order, hann", () => { ref.analyze(frame, hann); });
  add(size, "after:  FFT+profile+order, hann", () => { ws.analyze(frame, hann); });
  add(size, "before: analyze (default, + global tensor)", () => { ref.analyze(frame); });
  add(size, "after:  analyze (default, + global tensor)", () => { ws.analyze(frame); });

  const pow2 = (w & (w - 1)) === 0 && (h & (h - 1)) === 0;
  if (pow2 && !quick) {
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
    add(size, "fft.js row-column + profile", () => { fftJs(); radialProfileJs(spec, w, h, sums, counts); });
  }
}

// warm-up (JIT tiers, workspace tables) and batch sizes
for (const c of candidates) {
  for (let i = 0; i < 3; i++) c.run();
  const t0 = performance.now();
  c.run();
  const once = Math.max(1e-3, performance.now() - t0);
  c.reps = Math.max(1, Math.min(200, Math.round(batchMs / once)));
}

for (let r = 0; r < rounds; r++) {
  for (let i = 0; i < candidates.length; i++) {
    const c = candidates[(i + r * 5) % candidates.length]!;
    const t0 = performance.now();
    for (let k = 0; k < c.reps; k++) c.run();
    c.ms.push((performance.now() - t0) / c.reps);
  }
}
for (const f of cleanup) f();

const find = (size: string, name: string) => candidates.find((c) => c.size === size && c.name === name);
/** Median over rounds of a.ms[r] / b.ms[r]. */
const ratio = (a: Candidate, b: Candidate) => median(a.ms.map((v, i) => v / b.ms[i]!));

console.log(`\n${rounds} interleaved rounds; median ms per frame; xCV = median per-round ratio to ${REF};`);
console.log("after/before = median per-round ratio of the table path to the direct path\n");
for (const [w, h] of sizes) {
  const size = `${w}x${h}`;
  const cvc = find(size, REF)!;
  for (const c of candidates.filter((k) => k.size === size)) {
    let line = `${size.padEnd(10)} ${c.name.padEnd(44)} ${median(c.ms).toFixed(3).padStart(9)} ms  x${ratio(c, cvc).toFixed(2)} CV`;
    if (c.name.startsWith("after:")) {
      const before = find(size, c.name.replace("after: ", "before:"))!;
      line += `   after/before ${ratio(c, before).toFixed(2)}`;
    }
    console.log(line);
  }
  console.log("");
}
for (const name of ["domtopo FFT", "before: FFT+profile+order", "after:  FFT+profile+order", REF]) {
  const a = find("1000x1000", name)!, b = find("1024x1024", name)!;
  console.log(`${name.padEnd(44)} 1000x1000 / 1024x1024 = ${ratio(a, b).toFixed(2)}`);
}
const target = find("512x512", "after:  FFT+profile+order")!;
console.log(`\ntarget 1: 512x512 FFT+profile+order / cv.dft = ${ratio(target, find("512x512", REF)!).toFixed(2)} (<= 1)`);
console.log(`target 2: 1000x1000 / 1024x1024 FFT+profile+order = ${ratio(find("1000x1000", "after:  FFT+profile+order")!, find("1024x1024", "after:  FFT+profile+order")!).toFixed(2)} (<= 2)`);
