// Power spectrum, radial profile, period, correlation length and orientational order.
// This file only re-exports.
export type { SpectrumOptions, ResolvedSpectrumOptions } from "./options";
export type {
  SpectrumResult, RadialProfile, AngularDistribution, StructureSummary, PowerSpectrum,
} from "./result";
export { analyzeSpectrum } from "./analyze";
export { createSpectrumWorkspace, SPECTRUM_MIN_SIDE, type SpectrumWorkspace } from "./workspace";
export { powerSpectrum } from "./power";
export { renderSpectrum, type RenderSpectrumOptions, type SpectrumImage } from "./render";
export { structureTensor, type StructureTensorOptions, type StructureTensorResult } from "./structure-tensor";
export { periodFromWallLength } from "./wall-period";
export { hannWindow } from "./window";
export { findPeak, peakHalfWidth, type ProfilePeak } from "./peak";
export { ringOrder, type RingOrder } from "./order";
