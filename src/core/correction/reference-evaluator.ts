/**
 * What the correction needs from a main-field model, injected by the caller (the CLI or a service
 * adapts src/core/reference-field to it), so the correction stays pure and testable.
 */
import type { TotalFieldBatchEvaluator } from "../reference-field";

export interface ReferenceFieldEvaluator {
  /** Model name and generation recorded with results, e.g. "IGRF-14". */
  label: string;
  /** True when the model is valid at this UTC instant. */
  covers(timeMs: number): boolean;
  /** Total field (nT) at a geodetic position (WGS84; height above the ellipsoid in m) and time. */
  totalNt(latDeg: number, lonDeg: number, heightM: number, timeMs: number): number;
  /**
   * Optional batch form with the same values: out[i] for readings 0…count−1, NaN where latitude
   * or longitude is NaN or the model does not cover the time; a NaN height counts as defaultHeightM.
   */
  totalNtInto?: TotalFieldBatchEvaluator;
}

/** Geodetic position of a base station. */
export interface BasePosition {
  latDeg: number;
  lonDeg: number;
  heightM: number;
}
