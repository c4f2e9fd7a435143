// domtopo/node: everything of the library entry plus the Node-only pieces (files, CLI).
export * from "./index";
export { writeFileAtomic, AtomicWriter } from "./node/atomic";
export { main as runCli } from "./cli/main";
export { openFrameFiles, listFrameFiles } from "./io/node-source";
export { runAnalysis, fileSha256 } from "./node/run";
export type { RunConfig, RunSummary } from "./node/run";
