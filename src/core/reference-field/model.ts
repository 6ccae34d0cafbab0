/**
 * The in-memory shape of a spherical-harmonic main-field model (IGRF, WMM).
 *
 * Coefficients are Schmidt semi-normalised Gauss coefficients in nT (secular variation in nT/year),
 * stored in triangular order: index(n, m) = n(n+1)/2 + m, for 0 <= m <= n <= maxDegree
 * (index 0, degree 0, is always 0).
 */

/** Degree handling when two bracketing epochs have different maximum degree. */
export type DegreeConvention =
  /** Interpolate every coefficient; one missing at the lower-degree epoch counts as 0 (IAGA table as published). */
  | "full"
  /** Use only the degrees both bracketing epochs carry (truncate to the lower maximum degree). */
  | "lower-of-bracketing";

export interface CoefficientSet {
  /** Highest degree n with a non-zero coefficient. */
  maxDegree: number;
  /** g(n, m) in triangular order; length (N+1)(N+2)/2 with N the model's array degree. */
  g: Float64Array;
  /** h(n, m) in triangular order, h(n, 0) = 0. */
  h: Float64Array;
}

export interface CoefficientEpoch extends CoefficientSet {
  /** Epoch as a decimal year, e.g. 1995.0. */
  year: number;
}

export interface FieldModel {
  /** e.g. "IGRF-14" or "WMM2025". */
  name: string;
  /** Generation or release, e.g. "14" or "2025". */
  version: string;
  /** First decimal year the model is defined for (inclusive). */
  validFromYear: number;
  /** Last decimal year the model is defined for (inclusive). */
  validToYear: number;
  /** Degree every coefficient array is sized for. */
  arrayDegree: number;
  /** Main-field epochs in increasing year order. */
  epochs: readonly CoefficientEpoch[];
  /** Secular variation (nT/year) used from the last epoch to validToYear; null when none. */
  secularVariation: CoefficientSet | null;
  degreeConvention: DegreeConvention;
}

/** Triangular index of (n, m). */
export function coefficientIndex(n: number, m: number): number {
  return (n * (n + 1)) / 2 + m;
}

/** Number of triangular slots for degrees 0..maxDegree. */
export function coefficientCount(maxDegree: number): number {
  return ((maxDegree + 1) * (maxDegree + 2)) / 2;
}

/** Highest degree with any non-zero coefficient (0 when all are zero). */
export function highestNonZeroDegree(g: Float64Array, h: Float64Array, arrayDegree: number): number {
  for (let n = arrayDegree; n >= 1; n--) {
    for (let m = 0; m <= n; m++) {
      const i = coefficientIndex(n, m);
      if (g[i] !== 0 || h[i] !== 0) return n;
    }
  }
  return 0;
}

/** A copy of the model using another degree convention (coefficients are shared, not copied). */
export function withDegreeConvention(model: FieldModel, degreeConvention: DegreeConvention): FieldModel {
  return { ...model, degreeConvention };
}
