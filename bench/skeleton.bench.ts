// Thinning + skeleton graph + classification of both phases of generated mazes, against a
// plain-TS Zhang-Suen thinning (Zhang & Suen 1984, CACM 27:236) of both phases in the same run.
// Run: npx tsx bench/skeleton.bench.ts   (seeded inputs; no I/O in the timed part)
import Benchmark from "benchmark";
import { LabelingWorkspace } from "../src/wasm/labeling";
import { SkeletonWorkspace } from "../src/wasm/skeleton";
import { analyzeSkeletons } from "../src/topology/skeleton-analysis";

/** Seeded maze: white noise, three box blurs (radius r, wrapping), split at the median. */
function maze(n: number, seed: number, r: number): Uint8Array {
  let s = seed >>> 0;
  const rand = () => { s = (Math.imul(s, 1664525) + 1013904223) >>> 0; return s / 4294967296; };
  let a = new Float64Array(n * n), b = new Float64Array(n * n);
  for (let i = 0; i < a.length; i++) a[i] = rand();
  for (let p = 0; p < 3; p++) {
    for (let y = 0; y < n; y++) {
      let acc = 0;
      for (let d = -r; d <= r; d++) acc += a[y * n + ((d + n) % n)]!;
      for (let x = 0; x < n; x++) {
        b[y * n + x] = acc;
        acc += a[y * n + ((x + r + 1) % n)]! - a[y * n + ((x - r + n) % n)]!;
      }
    }
    for (let x = 0; x < n; x++) {
      let acc = 0;
      for (let d = -r; d <= r; d++) acc += b[((d + n) % n) * n + x]!;
      for (let y = 0; y < n; y++) {
        a[y * n + x] = acc;
        acc += b[((y + r + 1) % n) * n + x]! - b[((y - r + n) % n) * n + x]!;
      }
    }
  }
  const sorted = Float64Array.from(a).sort();
  const cut = sorted[sorted.length >> 1]!;
  const out = new Uint8Array(n * n);
  for (let i = 0; i < out.length; i++) out[i] = a[i]! >= cut ? 1 : 0;
  void b;
  return out;
}

/** Plain-TS Zhang-Suen thinning of the pixels equal to v (zero padding outside). */
function zhangSuen(phase: Uint8Array, w: number, h: number, v: number, img: Uint8Array, del: Int32Array): void {
  for (let i = 0; i < img.length; i++) img[i] = phase[i] === v ? 1 : 0;
  const at = (x: number, y: number) => (x < 0 || y < 0 || x >= w || y >= h ? 0 : img[y * w + x]!);
  let changed = true;
  while (changed) {
    changed = false;
    for (let pass = 0; pass < 2; pass++) {
      let nd = 0;
      for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) {
        if (!img[y * w + x]) continue;
        const p2 = at(x, y - 1), p3 = at(x + 1, y - 1), p4 = at(x + 1, y), p5 = at(x + 1, y + 1);
        const p6 = at(x, y + 1), p7 = at(x - 1, y + 1), p8 = at(x - 1, y), p9 = at(x - 1, y - 1);
        const B = p2 + p3 + p4 + p5 + p6 + p7 + p8 + p9;
        if (B < 2 || B > 6) continue;
        const A = (+(!p2 && p3)) + (+(!p3 && p4)) + (+(!p4 && p5)) + (+(!p5 && p6)) +
          (+(!p6 && p7)) + (+(!p7 && p8)) + (+(!p8 && p9)) + (+(!p9 && p2));
        if (A !== 1) continue;
        if (pass === 0 ? p2 * p4 * p6 === 0 && p4 * p6 * p8 === 0 : p2 * p4 * p8 === 0 && p2 * p6 * p8 === 0) del[nd++] = y * w + x;
      }
      for (let k = 0; k < nd; k++) img[del[k]!] = 0;
      if (nd > 0) changed = true;
    }
  }
}

function median(sample: number[]): number {
  const s = [...sample].sort((a, b) => a - b);
  return s.length % 2 ? s[s.length >> 1]! : (s[s.length / 2 - 1]! + s[s.length / 2]!) / 2;
}

const results: Array<{ size: number; name: string; ms: number }> = [];
for (const size of [512, 1024]) {
  const phase = maze(size, 12345 + size, size === 512 ? 4 : 8);
  const lab = new LabelingWorkspace(size, size);
  lab.loadPhase(phase);
  const count = lab.label(0, true, true);
  const labels = lab.labels().slice();
  const sws = new SkeletonWorkspace(size, size);
  const img = new Uint8Array(size * size), del = new Int32Array(size * size);
  const frame = { width: size, height: size, phase, labels, count };
  const first = analyzeSkeletons(frame, { boundary: "periodic" }, sws);
  console.log(`${size} x ${size} maze: ${count} domains; up ${first.up.labyrinth.count} labyrinths, ` +
    `${first.up.stripe.count} stripes, ${first.up.bubble.count} bubbles; ends/area ${(first.up.endsDensity * 1e4).toFixed(2)}e-4`);
  const suite = new Benchmark.Suite();
  suite
    .add(`${size} thinning + distance (Wasm)`, () => { sws.run(phase, { periodicX: true, periodicY: true, rule: 0 }); })
    .add(`${size} thinning + graph + classification`, () => { analyzeSkeletons(frame, { boundary: "periodic" }, sws); })
    .add(`${size} distance-order thinning + distance (Wasm)`, () => { sws.run(phase, { periodicX: true, periodicY: true, rule: 0, order: "distance" }); })
    .add(`${size} distance-order thinning + graph + classification`, () => { analyzeSkeletons(frame, { boundary: "periodic", thinning: "distance" }, sws); })
    .add(`${size} Zhang-Suen plain TS`, () => { zhangSuen(phase, size, size, 1, img, del); zhangSuen(phase, size, size, 0, img, del); })
    .on("cycle", (e: Benchmark.Event) => {
      const b = e.target as unknown as Benchmark & { stats: { sample: number[] } };
      const ms = median(b.stats.sample) * 1e3;
      results.push({ size, name: String(b.name), ms });
      console.log(`  ${b.name}: median ${ms.toFixed(2)} ms (${b.stats.sample.length} samples)`);
    })
    .run({ async: false, maxTime: size === 512 ? 3 : 4 });
  sws.dispose();
  lab.dispose();
  const get = (k: string) => results.find((r) => r.size === size && r.name === `${size} ${k}`)!.ms;
  const zs = get("Zhang-Suen plain TS");
  for (const k of ["thinning + distance (Wasm)", "thinning + graph + classification",
    "distance-order thinning + distance (Wasm)", "distance-order thinning + graph + classification"]) {
    console.log(`  Zhang-Suen / ${k}: ${(zs / get(k)).toFixed(2)}x`);
  }
}
