// domtopo: the browser-safe library entry. This file only re-exports.
export type { Frame, FrameData } from "./types";
export { VERSION } from "./version";
export { init } from "./wasm/instance";
export { analyzeFrame, createAnalyzer, FrameAnalyzer, phaseEulers, frameCrossings } from "./topology/analyze";
export type { FrameResult, PhaseSummary } from "./topology/analyze";
export type { DomainTable } from "./topology/domains";
export { croftonLength } from "./topology/domains";
export type { FrameOptions, ResolvedFrameOptions, Boundary, Connectivity } from "./topology/options";
export { frameRow, domainHeader, domainRows, csvLine, csvCell } from "./topology/rows";
export type { Cell } from "./topology/rows";
export type { ThresholdOption, ResolvedLevel } from "./prep/threshold";
export { otsuBin } from "./prep/otsu";
export { gaussianRandomField, derivativeVariances } from "./demo/grf";
export type { RandomField, RandomFieldOptions } from "./demo/grf";
export { demoSweep } from "./demo/sweep";
export type { DemoSweep, DemoSweepOptions } from "./demo/sweep";
export * from "./sweep/index";
export * from "./spectrum/index";
