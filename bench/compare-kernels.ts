// Before/after timing of two builds of the kernel module in one process (not a *.bench.ts: run
// by hand, `npx tsx bench/compare-kernels.ts before.wasm after.wasm`). Drives the raw exports as
// LabelingWorkspace does (open boundary, up 8-connected), times labelScan, measureRuns and
// measureQuads by process CPU time, interleaving the two builds, and checks that both give the
// same labels, domain columns and quad statistics.
import { readFileSync } from "node:fs";
import { patternFrame, type Pattern } from "./fields";

interface Driver { name: string; run(): void; pass: Record<string, () => void>; digest(): string }

function driver(path: string, phase: Uint8Array, n: number): Driver {
  const inst = new WebAssembly.Instance(new WebAssembly.Module(readFileSync(path)), {});
  const k = inst.exports as Record<string, CallableFunction> & { memory: WebAssembly.Memory };
  const px = n * n, cap = px + 1;
  const alloc = (bytes: number) => k.heapAlloc(bytes) as number;
  const ph = alloc(px), lb = alloc(4 * px), pa = alloc(4 * (px + 1));
  const table = alloc(128), stats = alloc(128), trig = alloc(8 * (2 * (n + 1) + 2 * n));
  const cols = alloc(cap * (17 * 4 + 9 * 8 + 16));
  const t = new Uint32Array(k.memory.buffer, table, 32);
  let p = cols, s = 0;
  for (let c = 0; c < 12; c++) { t[s++] = p; p += 4 * cap; }
  for (let c = 0; c < 9; c++) { t[s++] = p; p += 8 * cap; }
  for (let c = 0; c < 5; c++) { t[s++] = p; p += 4 * cap; }
  t[s++] = trig; t[s++] = trig + 8 * (n + 1); t[s++] = trig + 16 * (n + 1); t[s++] = trig + 16 * (n + 1) + 8 * n;
  t[s++] = stats; t[s++] = stats + 72;
  new Uint8Array(k.memory.buffer, ph, px).set(phase);
  k.setGeometry(n, n, 0, 0, 0);
  k.setBuffers(ph, lb, pa, 0);
  k.bindDomains(table);
  if (k.bindQuadAccumulators) k.bindQuadAccumulators(p); // builds with the side-by-side quad sums
  k.fillTrigTables();
  let K = 0;
  const pass = {
    scan: () => { K = k.labelScan() as number; },
    runs: () => { k.measureRuns(K, 0); },
    quads: () => { k.measureQuads(); },
  };
  return {
    name: path, pass,
    run: () => { pass.scan(); pass.runs(); pass.quads(); },
    digest: () => {
      const m = k.memory.buffer;
      let h = 0;
      const mix = (a: ArrayLike<number>) => { for (let i = 0; i < a.length; i++) h = (Math.imul(h, 31) + (a[i]! | 0)) | 0; };
      mix(new Int32Array(m, lb, px));
      for (let c = 0; c < 12; c++) mix(new Int32Array(m, t[c]!, K + 1));
      for (let c = 12; c < 17; c++) mix(new Float64Array(m, t[c]!, K + 1).map((v) => Math.round(v)));
      mix(new Int32Array(m, stats, 23));
      return `${K} domains, digest ${h}`;
    },
  };
}

const [before, after] = process.argv.slice(2);
const n = 512;
const reps = 300;
for (const pattern of ["maze", "bubble", "noise"] as Pattern[]) {
  const phase = patternFrame(pattern, n, 1);
  const ds = [driver(before!, phase, n), driver(after!, phase, n)];
  for (const d of ds) for (let r = 0; r < 10; r++) d.run(); // warm up
  const cpu: number[][] = ds.map(() => [0, 0, 0]);
  for (let r = 0; r < reps; r++) {
    for (const [j, d] of ds.entries()) {
      for (const [q, name] of ["scan", "runs", "quads"].entries()) {
        const c0 = process.cpuUsage();
        d.pass[name]!();
        const c = process.cpuUsage(c0);
        cpu[j]![q]! += c.user + c.system;
      }
    }
  }
  const digests = ds.map((d) => d.digest());
  console.log(`${pattern} ${n} x ${n}: outputs ${digests[0] === digests[1] ? "identical" : "DIFFER"} (${digests.join(" / ")})`);
  for (const [j, d] of ds.entries()) {
    const [sc, ru, qu] = cpu[j]!.map((v) => v / 1e3 / reps);
    console.log(`  ${(j === 0 ? "before" : "after").padEnd(7)} scan ${sc!.toFixed(3)}  runs ${ru!.toFixed(3)}  quads ${qu!.toFixed(3)}  total ${(sc! + ru! + qu!).toFixed(3)} ms cpu  (${d.name})`);
  }
}
