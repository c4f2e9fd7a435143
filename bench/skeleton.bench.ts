// Thinning + skeleton graph + classification of both phases of generated mazes: this tree
// ("after") against an earlier revision ("before", the same sources at git revision
// SKELETON_BEFORE, default dc1b092, the list-based thinning and the graph in TS, built once into the temp folder outside the timed part) and
// a plain-TS Zhang-Suen thinning (Zhang & Suen 1984, CACM 27:236) of both phases, in one run.
// Per pass: the distance map alone, thinning + distance (the Wasm workspace run), the thinning
// alone (that run minus the distance map of the same round), the skeleton graph (from a thinned
// frame), the whole analyzeSkeletons call (the total: labels as a plain array, skeleton and
// distance map copied out), the same call as the frame analysis makes it (labels in Wasm memory
// where the labeling left them, the maps as views), and analyzeSkeletons without the run
// (on the last run's buffers: adjacency, graph, classification, summaries).
//
// The machine is usually shared: candidates are timed in interleaved rounds (every candidate
// once per round, rotated order), each ratio is taken within a round, and medians over rounds
// are quoted. Run: npx tsx bench/skeleton.bench.ts [--quick] [--rounds N]
// (seeded inputs; no I/O in the timed part)
import { execSync } from "node:child_process";
import { existsSync, mkdirSync, symlinkSync } from "node:fs";
import { tmpdir } from "node:os";
import { dirname, join } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { LabelingWorkspace } from "../src/wasm/labeling";
import * as afterWasm from "../src/wasm/skeleton";
import * as afterInstance from "../src/wasm/instance";
import * as afterGraph from "../src/topology/skeleton";
import * as afterAnalysis from "../src/topology/skeleton-analysis";

const quick = process.argv.includes("--quick");
const roundsArg = process.argv.indexOf("--rounds");
const rounds = roundsArg > 0 ? Number(process.argv[roundsArg + 1]) : quick ? 7 : 21;
const root = join(dirname(fileURLToPath(import.meta.url)), "..");
const beforeRev = process.env.SKELETON_BEFORE ?? "dc1b092";

/** The sources of `rev` with their kernels built, in a temp folder (made once per revision). */
function beforeTree(rev: string): string {
  const dir = join(tmpdir(), `domtopo-skeleton-before-${rev}`);
  if (existsSync(join(dir, "src/wasm/kernel-binary.ts"))) return dir;
  mkdirSync(dir, { recursive: true });
  execSync(`git archive ${rev} assembly src scripts asconfig.json package.json | tar -x -C "${dir}"`, { cwd: root, stdio: "inherit" });
  if (!existsSync(join(dir, "node_modules"))) symlinkSync(join(root, "node_modules"), join(dir, "node_modules"));
  execSync(`node "${join(root, "node_modules/assemblyscript/bin/asc.js")}" assembly/index.ts --target release`, { cwd: dir, stdio: "inherit" });
  execSync("node scripts/embed-wasm.mjs", { cwd: dir, stdio: "inherit" });
  return dir;
}
const bdir = beforeTree(beforeRev);
const load = (p: string) => import(pathToFileURL(join(bdir, p)).href);
const beforeWasm: typeof afterWasm = await load("src/wasm/skeleton.ts");
const beforeInstance: typeof afterInstance = await load("src/wasm/instance.ts");
const beforeGraph: typeof afterGraph = await load("src/topology/skeleton.ts");
const beforeAnalysis: typeof afterAnalysis = await load("src/topology/skeleton-analysis.ts");
const beforeLabeling: { LabelingWorkspace: typeof LabelingWorkspace } = await load("src/wasm/labeling.ts");

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

interface Candidate { name: string; run: () => void; ms: number[]; reps: number }
interface Side {
  wasm: typeof afterWasm; instance: typeof afterInstance; graph: typeof afterGraph; analysis: typeof afterAnalysis;
  labeling: { LabelingWorkspace: typeof LabelingWorkspace };
}
const sides: Array<[string, Side]> = [
  ["before", { wasm: beforeWasm, instance: beforeInstance, graph: beforeGraph, analysis: beforeAnalysis, labeling: beforeLabeling }],
  ["after", { wasm: afterWasm, instance: afterInstance, graph: afterGraph, analysis: afterAnalysis, labeling: { LabelingWorkspace } }],
];
const PASSES = [
  "distance", "thinning + distance", "graph", "thinning + graph + classification", "as the frame analysis calls it",
  "analyzeSkeletons without the run",
] as const;

const sizes = quick ? [512] : [512, 1024];
const candidates: Candidate[] = [];
const add = (name: string, run: () => void) => candidates.push({ name, run, ms: [], reps: 1 });
for (const size of sizes) {
  const phase = maze(size, 12345 + size, size === 512 ? 4 : 8);
  const lab = new LabelingWorkspace(size, size);
  lab.loadPhase(phase);
  const count = lab.label(0, true, true);
  const labels = lab.labels().slice();
  lab.dispose();
  const frame = { width: size, height: size, phase, labels, count };
  const geometry = { periodicX: true, periodicY: true, rule: 0 as const };
  const summary: string[] = [];
  for (const [side, m] of sides) {
    const ws = new m.wasm.SkeletonWorkspace(size, size);
    const first = m.analysis.analyzeSkeletons(frame, { boundary: "periodic" }, ws);
    summary.push(`${side}: up ${first.up.labyrinth.count} labyrinths, ${first.up.stripe.count} stripes, ` +
      `${first.up.bubble.count} bubbles, ends/area ${(first.up.endsDensity * 1e4).toFixed(2)}e-4`);
    const r = ws.run(phase, geometry);
    const input = { ...frame, skeleton: r.skeleton.slice(), distance: r.distance.slice(), ...geometry };
    // The distance pass alone, on the workspace's buffers (its fields: bench only), after its
    // own geometry is bound (workspaces of other sizes share the instance).
    const k = m.instance.kernels() as unknown as {
      setGeometry(w: number, h: number, px: number, py: number, rule: number): void;
      setBuffers(ph: number, lb: number, pa: number, qm: number): void;
      distancePhases(o: number, g: number, s: number, cap: number): void;
    };
    const p = ws as unknown as { ph: number; qm: number; dist: number; vert: number; scratch: number };
    add(`${size} ${side} distance`, () => {
      k.setGeometry(size, size, 1, 1, 0);
      k.setBuffers(p.ph, 0, 0, p.qm);
      k.distancePhases(p.dist, p.vert, p.scratch, 2 * size);
    });
    add(`${size} ${side} thinning + distance`, () => { ws.run(phase, geometry); });
    add(`${size} ${side} graph`, () => { m.graph.skeletonGraph(input, { spurFactor: 3, junctionMergeFactor: 1 }); });
    add(`${size} ${side} thinning + graph + classification`, () => { m.analysis.analyzeSkeletons(frame, { boundary: "periodic" }, ws); });
    // The same call as the frame analysis makes it: the labels where the side's own labeling
    // left them in its Wasm memory (a fresh view per call), the skeleton and distance map left
    // in the workspace (views; a revision without them copies).
    const own = new m.labeling.LabelingWorkspace(size, size);
    own.loadPhase(phase);
    own.label(0, true, true);
    add(`${size} ${side} as the frame analysis calls it`, () => {
      m.analysis.analyzeSkeletons({ ...frame, labels: own.labels() }, { boundary: "periodic" }, ws, "views");
    });
    // analyzeSkeletons on a workspace whose run hands back the last run's buffers: everything
    // the call does besides thinning (adjacency, graph, classification, summaries, copies).
    const q = ws as unknown as { sk: number; dist: number };
    const rerun = Object.create(ws, {
      run: {
        value: () => {
          const mem = m.instance.kernels().memory.buffer;
          return { skeleton: new Uint8Array(mem, q.sk, size * size), distance: new Float32Array(mem, q.dist, size * size), blocksLeft: 0 };
        },
      },
    }) as typeof ws;
    ws.run(phase, geometry);
    add(`${size} ${side} analyzeSkeletons without the run`, () => { m.analysis.analyzeSkeletons(frame, { boundary: "periodic" }, rerun); });
  }
  console.log(`${size} x ${size} periodic maze, ${count} domains; ${summary.join("; ")}`);
  const img = new Uint8Array(size * size), del = new Int32Array(size * size);
  add(`${size} Zhang-Suen plain TS`, () => { zhangSuen(phase, size, size, 1, img, del); zhangSuen(phase, size, size, 0, img, del); });
}
// Warm up, and pick repetitions so that a timed batch lasts at least ~20 ms.
for (const c of candidates) {
  c.run();
  const t0 = performance.now();
  c.run();
  const once = Math.max(0.01, performance.now() - t0);
  c.reps = Math.max(1, Math.min(100, Math.round(20 / once)));
}
for (let r = 0; r < rounds; r++) {
  for (let j = 0; j < candidates.length; j++) {
    const c = candidates[(j + r) % candidates.length]!;
    const t0 = performance.now();
    for (let q = 0; q < c.reps; q++) c.run();
    c.ms.push((performance.now() - t0) / c.reps);
  }
}
const byName = new Map(candidates.map((c) => [c.name, c]));
/** Median over rounds of a.ms[r] / b.ms[r]. */
const ratio = (a: Candidate, b: Candidate) => median(a.ms.map((v, r) => v / b.ms[r]!));
console.log(`\n${rounds} interleaved rounds; median ms per frame (both phases); before/after and Zhang-Suen/after = median per-round ratios`);
for (const size of sizes) {
  const zs = byName.get(`${size} Zhang-Suen plain TS`)!;
  console.log(`\n${size} x ${size}`);
  console.log(`  ${"pass".padEnd(44)}${"before".padStart(10)}${"after".padStart(10)}${"before/after".padStart(14)}${"ZS/after".padStart(10)}`);
  const row = (pass: string, b: Candidate, a: Candidate) =>
    console.log(`  ${pass.padEnd(44)}${median(b.ms).toFixed(2).padStart(10)}${median(a.ms).toFixed(2).padStart(10)}` +
      `${(ratio(b, a).toFixed(2) + "x").padStart(14)}${(ratio(zs, a).toFixed(2) + "x").padStart(10)}`);
  /** Per round: the workspace run minus the distance map timed in the same round. */
  const thinOnly = (side: string): Candidate => {
    const run = byName.get(`${size} ${side} thinning + distance`)!, dist = byName.get(`${size} ${side} distance`)!;
    return { name: `${size} ${side} thinning`, run: () => {}, reps: 1, ms: run.ms.map((v, r) => Math.max(1e-3, v - dist.ms[r]!)) };
  };
  for (const pass of PASSES) {
    const b = byName.get(`${size} before ${pass}`)!, a = byName.get(`${size} after ${pass}`)!;
    row(pass === PASSES[3] ? `${pass} (total)` : pass === PASSES[4] ? `  ${pass}` : pass, b, a);
    if (pass === "thinning + distance") row("  thinning (run - distance)", thinOnly("before"), thinOnly("after"));
  }
  console.log(`  ${"Zhang-Suen plain TS (reference)".padEnd(44)}${median(zs.ms).toFixed(2).padStart(20)}`);
}
