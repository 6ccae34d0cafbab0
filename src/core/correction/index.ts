export { CorrectionFlag, flagNames, type CorrectionFlagName } from "./flags";
export { prepareBaseSeries, type BaseSeries, type PreparedBaseSeries } from "./base-series";
export {
  createBaseInterpolator,
  CoverStatus,
  DEFAULT_MAX_GAP_S,
  type BaseInterpolator,
  type BaseInterpolationOptions,
  type InterpolationMethod,
} from "./base-interpolator";
export { resolveNumericDatum, type DatumChoice } from "./datum";
export { mergeFallbackBase, type MergedBase } from "./fallback-base";
export { loopBaseFromReadings, loopBaseFromStation, type LoopBase } from "./loop-base";
export type { ReferenceFieldEvaluator, BasePosition } from "./reference-evaluator";
export {
  createCorrector,
  correctReadings,
  duplicateTimeMarks,
  emptyColumns,
  sliceRoverReadings,
  type Corrector,
  type CorrectionColumns,
  type CorrectionOptions,
  type CorrectionResult,
  type CorrectionSummary,
  type RoverReadings,
} from "./correct-readings";
export { createReferenceEvaluator, type ReferenceEvaluatorContext } from "./reference-adapter";
export { CORRECTED_CSV_COLUMNS, CorrectedCsvStream, writeCorrectedCsv, type CorrectedCsvColumn, type CorrectedCsvRover } from "./corrected-csv";
