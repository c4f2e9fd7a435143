// domtopo: the browser-safe library entry. This file only re-exports.
export type { Frame, FrameData } from "./types";
export { init } from "./wasm/instance";
export { analyzeFrame, createAnalyzer, FrameAnalyzer, phaseEulers, frameCrossings } from "./topology/analyze";
export type { FrameResult, PhaseSummary } from "./topology/analyze";
export type { DomainTable } from "./topology/domains";
export { croftonLength } from "./topology/domains";
export type { FrameOptions, ResolvedFrameOptions, Boundary, Connectivity } from "./topology/options";
export type { ThresholdOption, ResolvedLevel } from "./prep/threshold";
export { otsuBin } from "./prep/otsu";
