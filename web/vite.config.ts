// Builds the browser page (web/) into dist-web/: every module bundled (vega, the library and its
// Wasm kernels), relative paths so any static server or folder can hold it, workers as ES modules.
import { writeFileSync } from "node:fs";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { defineConfig, type Plugin } from "vite";

const root = fileURLToPath(new URL(".", import.meta.url));

const outDir = fileURLToPath(new URL("../dist-web", import.meta.url));

/** The output folder ignores itself in git (like dist/, it is built, never committed). */
const ignoreOutput: Plugin = {
  name: "domtopo-ignore-output",
  apply: "build",
  closeBundle() { writeFileSync(join(outDir, ".gitignore"), "*\n"); },
};

export default defineConfig({
  root,
  base: "./",
  logLevel: "warn",
  publicDir: false,
  build: {
    outDir,
    emptyOutDir: true,
    target: "es2022",
    chunkSizeWarningLimit: 4000,
    reportCompressedSize: false,
    rolldownOptions: { checks: { pluginTimings: false } },
  },
  plugins: [ignoreOutput],
  worker: { format: "es" },
  server: { host: "127.0.0.1" },
  preview: { host: "127.0.0.1" },
});
