// Preprocessing before thresholding: this file only re-exports.
export { preprocessFrame, createPreprocessor, Preprocessor, resolvePreprocessOptions } from "./preprocess";
export type {
  PreprocessOptions, ResolvedPreprocessOptions, PreprocessResult, CropRect, BackgroundOptions,
  FlattenOptions, HighpassFlatten, PolynomialFlatten, LinesFlatten, SmoothOptions, ResolvedFlatten,
  PrepBoundary, GaussianMethodOption, FlattenOffset,
} from "./preprocess";
export { GaussianPlan, gaussianHalfKernel, extendedBox, BOX_PASSES, BOX_PEAK_ERROR } from "./gaussian";
export type { GaussianPlanOptions, GaussianMethod, EdgeMode } from "./gaussian";
export { PolynomialSurface } from "./flatten";
export { levelFromSaturation, frameMedian } from "./movie-threshold";
export type { SaturationLevel } from "./movie-threshold";
