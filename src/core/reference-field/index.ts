/**
 * Reference (main) field: IGRF / WMM coefficient models and their synthesis at geodetic points.
 * Pure TypeScript, no I/O; src/lib/reference-model.ts loads the files.
 */
export type { FieldModel, CoefficientSet, CoefficientEpoch, DegreeConvention } from "./model";
export { withDegreeConvention } from "./model";
export type { GeodeticPoint, FieldVector } from "./synthesis";
export { synthesizeField, synthesizeFieldAtYear, isWithinValidity } from "./synthesis";
export { parseIagaCoefficients } from "./iaga-parser";
export { modelFromWmmJson } from "./wmm-json";
export { createTotalFieldEvaluator, createTotalFieldGrid, type TotalFieldBatchEvaluator, type TotalFieldGrid } from "./total-field-evaluator";
export type { TotalFieldEvaluator, TotalFieldEvaluatorOptions } from "./total-field-evaluator";
export { decimalYear, timeMsFromDecimalYear } from "./decimal-year";
export { CoefficientTableError, OutsideModelValidityError, ModelFormatError } from "./errors";
export { REFERENCE_RADIUS_KM, WGS84_SEMI_MAJOR_AXIS_KM, WGS84_FLATTENING } from "./constants";
