// Hexagonal frames against square ones: the same kind of pattern (a thresholded Gaussian random
// field of period 24, seeded) sampled on a hexagonal lattice (offset rows) and on a square grid
// of the same size, analyzed through one FrameAnalyzer each: labels + measures only, + skeleton,
// + spectrum, and everything. Candidates run in interleaved rounds (each once per round, order
// rotated), the hex/square ratio is taken within a round, medians over rounds are quoted.
// Run: npx tsx bench/hex.bench.ts [--quick] [--rounds N]
import { createAnalyzer, gaussianRandomField, hexGaussianRandomField, type FrameOptions } from "../src/index";

const quick = process.argv.includes("--quick");
const roundsArg = process.argv.indexOf("--rounds");
const rounds = roundsArg > 0 ? Number(process.argv[roundsArg + 1]) : quick ? 5 : 15;
const sizes = quick ? [256] : [256, 512];
const median = (a: number[]) => [...a].sort((p, q) => p - q)[a.length >> 1]!;

const passes: Array<[string, FrameOptions]> = [
  ["labels + measures", { skeleton: "off", spectrum: "off" }],
  ["+ skeleton", { spectrum: "off" }],
  ["+ spectrum", { skeleton: "off" }],
  ["everything", {}],
];

for (const n of sizes) {
  const hexField = hexGaussianRandomField({ width: n, height: n, period: 24, seed: 11 });
  const sqField = gaussianRandomField({ width: n, height: n, period: 24, seed: 11 });
  const hexA = createAnalyzer(n, n), sqA = createAnalyzer(n, n);
  console.log(`\n${n} x ${n}, periodic, threshold 0 (ms per frame, median of ${rounds} rounds)`);
  console.log(`${"pass".padEnd(20)} ${"square".padStart(8)} ${"hex".padStart(8)} ${"hex/square".padStart(11)}`);
  for (const [name, extra] of passes) {
    const base: FrameOptions = { threshold: 0, boundary: "periodic", ...extra };
    const run = { square: () => sqA.analyze(sqField, base), hex: () => hexA.analyze(hexField, { ...base, grid: "hex" }) };
    run.square(); run.hex(); // warm-up, workspaces
    const t = { square: [] as number[], hex: [] as number[] }, ratio: number[] = [];
    for (let r = 0; r < rounds; r++) {
      const order = r % 2 === 0 ? (["square", "hex"] as const) : (["hex", "square"] as const);
      const got: Record<string, number> = {};
      for (const c of order) { const t0 = performance.now(); run[c](); got[c] = performance.now() - t0; }
      t.square.push(got.square!); t.hex.push(got.hex!); ratio.push(got.hex! / got.square!);
    }
    console.log(`${name.padEnd(20)} ${median(t.square).toFixed(2).padStart(8)} ${median(t.hex).toFixed(2).padStart(8)} ${median(ratio).toFixed(2).padStart(11)}`);
  }
  hexA.dispose(); sqA.dispose();
}
