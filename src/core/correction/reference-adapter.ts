/**
 * Adapt a main-field model (src/core/reference-field) to the correction's ReferenceFieldEvaluator:
 * validity bounds computed once, and the fast gridded total-field evaluator over the box and time
 * span of the survey (the readings plus the base position and base record).
 */
import { createTotalFieldGrid, timeMsFromDecimalYear, type FieldModel } from "../reference-field";
import type { RoverReadings } from "./correct-readings";
import type { BasePosition, ReferenceFieldEvaluator } from "./reference-evaluator";

function finiteExtent(values: ArrayLike<number> | null | undefined, extra: readonly number[] = []): [number, number] | null {
  let lo = Infinity;
  let hi = -Infinity;
  const n = values ? values.length : 0;
  for (let i = 0; i < n; i++) {
    const v = values![i]; // NaN never wins a comparison
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  for (const v of extra) {
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return lo <= hi ? [lo, hi] : null;
}

export interface ReferenceEvaluatorContext {
  /** Base record times (ascending), so the datum=reference evaluations fall inside the grid. */
  baseTimeMs?: ArrayLike<number>;
  basePosition?: BasePosition | null;
  /** Height used for readings without one (also inside the grid); default 0. */
  defaultHeightM?: number;
}

export function createReferenceEvaluator(model: FieldModel, rover: RoverReadings, context: ReferenceEvaluatorContext = {}): ReferenceFieldEvaluator {
  const validFromMs = timeMsFromDecimalYear(model.validFromYear);
  const validToMs = timeMsFromDecimalYear(model.validToYear);
  const pos = context.basePosition ?? null;
  const baseTimes = context.baseTimeMs;
  const lat = finiteExtent(rover.latDeg, pos ? [pos.latDeg] : []);
  const lon = finiteExtent(rover.lonDeg, pos ? [pos.lonDeg] : []);
  const height = finiteExtent(rover.heightM, [context.defaultHeightM ?? 0, ...(pos ? [pos.heightM] : [])]);
  const time = finiteExtent(rover.timeMs, baseTimes && baseTimes.length > 0 ? [baseTimes[0], baseTimes[baseTimes.length - 1]] : []);
  let totalNt: ReferenceFieldEvaluator["totalNt"] = () => NaN;
  let totalNtInto: ReferenceFieldEvaluator["totalNtInto"] = (out, _lat, _lon, _height, _time, count) => void out.fill(NaN, 0, count);
  if (lat && lon && height && time) {
    const fromMs = Math.max(time[0], validFromMs);
    const toMs = Math.max(Math.min(time[1], validToMs), fromMs);
    const grid = createTotalFieldGrid(model, {
      minTimeMs: fromMs,
      maxTimeMs: toMs,
      minLatDeg: lat[0],
      maxLatDeg: lat[1],
      minLonDeg: lon[0],
      maxLonDeg: lon[1],
      minHeightM: height[0],
      maxHeightM: height[1],
    });
    totalNt = grid.evaluate;
    totalNtInto = grid.evaluateInto;
  }
  return {
    label: model.name,
    covers: (t) => t >= validFromMs && t <= validToMs,
    totalNt,
    totalNtInto,
  };
}
