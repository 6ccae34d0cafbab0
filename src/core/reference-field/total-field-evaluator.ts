/** Placeholder-free first version: direct synthesis per reading (exact); the gridded form replaces it. */
import { synthesizeField } from "./synthesis";
import type { FieldModel } from "./model";

export interface TotalFieldEvaluatorOptions {
  minTimeMs: number;
  maxTimeMs: number;
  minLatDeg: number;
  maxLatDeg: number;
  minLonDeg: number;
  maxLonDeg: number;
  minHeightM: number;
  maxHeightM: number;
}

export type TotalFieldEvaluator = (latDeg: number, lonDeg: number, heightM: number, timeMs: number) => number;

export function createTotalFieldEvaluator(model: FieldModel, _opts: TotalFieldEvaluatorOptions): TotalFieldEvaluator {
  return (latitudeDeg, longitudeDeg, heightM, timeMs) =>
    synthesizeField(model, { latitudeDeg, longitudeDeg, heightM, timeMs }).totalNt;
}
