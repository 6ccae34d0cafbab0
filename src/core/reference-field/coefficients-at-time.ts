/**
 * Gauss coefficients of a model at one decimal year: linear between bracketing epochs, and the last
 * epoch plus secular variation × (year − last epoch) after it (IGRF-14 and WMM definitions).
 */
import { OutsideModelValidityError } from "./errors";
import { coefficientCount, type CoefficientSet, type FieldModel } from "./model";

/** Whether a decimal year lies in the model's validity interval (both ends included). */
export function isYearWithinValidity(model: FieldModel, year: number): boolean {
  return Number.isFinite(year) && year >= model.validFromYear && year <= model.validToYear;
}

/** Throw OutsideModelValidityError unless the decimal year is within validity. */
export function assertYearWithinValidity(model: FieldModel, year: number): void {
  if (!isYearWithinValidity(model, year)) {
    throw new OutsideModelValidityError(model.name, year, model.validFromYear, model.validToYear);
  }
}

/** Index of the epoch starting the interval that contains `year` (last epoch when year ≥ it). */
export function epochIntervalIndex(model: FieldModel, year: number): number {
  const { epochs } = model;
  let i = 0;
  while (i + 1 < epochs.length && year >= epochs[i + 1].year) i++;
  return i;
}

/**
 * Coefficients at a decimal year. Throws OutsideModelValidityError outside validity; never extrapolates.
 * The returned set's `maxDegree` is the degree synthesis should sum to (see DegreeConvention).
 */
export function coefficientsAtYear(model: FieldModel, year: number): CoefficientSet {
  assertYearWithinValidity(model, year);
  const size = coefficientCount(model.arrayDegree);
  const g = new Float64Array(size);
  const h = new Float64Array(size);
  const i = epochIntervalIndex(model, year);
  const start = model.epochs[i];
  const next = model.epochs[i + 1];
  if (next) {
    const fraction = (year - start.year) / (next.year - start.year);
    for (let k = 0; k < size; k++) {
      g[k] = start.g[k] + fraction * (next.g[k] - start.g[k]);
      h[k] = start.h[k] + fraction * (next.h[k] - start.h[k]);
    }
    const maxDegree =
      model.degreeConvention === "lower-of-bracketing"
        ? Math.min(start.maxDegree, next.maxDegree)
        : Math.max(start.maxDegree, next.maxDegree);
    return { maxDegree, g, h };
  }
  const sv = model.secularVariation;
  const years = year - start.year;
  for (let k = 0; k < size; k++) {
    g[k] = start.g[k] + (sv && years !== 0 ? years * sv.g[k] : 0);
    h[k] = start.h[k] + (sv && years !== 0 ? years * sv.h[k] : 0);
  }
  return { maxDegree: Math.max(start.maxDegree, sv && years !== 0 ? sv.maxDegree : 0), g, h };
}
