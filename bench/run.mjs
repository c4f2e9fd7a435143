// Runs every bench/*.bench.ts in turn, each in its own process (a fresh Wasm instance and heap),
// with tsx. `node bench/run.mjs spectrum` runs only the benches whose name contains "spectrum".
import { readdirSync } from "node:fs";
import { spawnSync } from "node:child_process";
import { createRequire } from "node:module";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";

const here = dirname(fileURLToPath(import.meta.url));
const tsxCli = createRequire(import.meta.url).resolve("tsx/cli");
const filters = process.argv.slice(2);
const benches = readdirSync(here)
  .filter((name) => name.endsWith(".bench.ts"))
  .filter((name) => filters.length === 0 || filters.some((f) => name.includes(f)))
  .sort();
if (benches.length === 0) {
  console.error(`bench: no bench/*.bench.ts matched ${filters.join(", ") || "(any)"}`);
  process.exit(1);
}
let failed = 0;
for (const name of benches) {
  console.log(`\n=== ${name} ===`);
  const run = spawnSync(process.execPath, [tsxCli, join(here, name)], { stdio: "inherit" });
  if (run.status !== 0) {
    failed++;
    console.error(`bench: ${name} failed (${run.signal ?? `exit code ${run.status}`})`);
  }
}
process.exit(failed > 0 ? 1 : 0);
