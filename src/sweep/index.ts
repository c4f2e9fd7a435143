// domtopo sweep layer: loop metrics, FORC distribution, excursions, topology against field.
// Browser-safe (no node:* imports). This file only re-exports.
export type { Outcome } from "./outcome";
export type { Branch, BranchDirection, BranchSplit, SplitBranchesOptions, TurningPoint } from "./branches";
export { branchColumn, splitBranches } from "./branches";
export type { BranchMetrics, LoopMetrics, LoopMetricsOptions, SwitchingFieldDistribution } from "./loop";
export { loopMetrics } from "./loop";
export type {
  ReversalCurve,
  ReversalCurvesFromSweepOptions,
  ReversalGrid,
  ReversalGridOptions,
} from "./reversal-curves";
export { resampleReversalCurves, reversalCurvesFromSweep } from "./reversal-curves";
export type {
  CoercivityInteractionMap,
  ForcDistribution,
  ForcFromSweepOptions,
  ForcOptions,
  ForcPointStatus,
} from "./forc";
export { forcDistribution, forcFromSweep } from "./forc";
export type { Excursion, ExcursionOptions, FieldCurve } from "./excursions";
export { excursion, excursions } from "./excursions";
export type {
  ColumnOnGridOptions,
  GridAxes,
  MajorBranchColumns,
  MajorLoopMatch,
  MajorLoopPoint,
  MatchMajorLoopOptions,
} from "./topology-map";
export { columnCurvesOnReversalGrid, columnOnReversalGrid, matchMajorLoop } from "./topology-map";
export type {
  HysteronEnsemble,
  HysteronEnsembleOptions,
  HysteronMajorLoopOptions,
  ReversalFamilyOptions,
  SyntheticSweep,
  TanhLoopOptions,
} from "./synthetic";
export { hysteronEnsemble, hysteronMajorLoop, hysteronReversalCurves, hysteronSweep, tanhLoop } from "./synthetic";
