/**
 * A second base station filling the gaps of the first: fallback samples are used only where the
 * first base cannot be interpolated (a gap longer than maxGapS, or before/after its record), after
 * shifting them by the median simultaneous difference first − second (the two sites sit at
 * different field levels; the difference is what a datum tie between bases removes: Milsom, Field
 * Geophysics, ch. 3, sub-bases). With no simultaneous readings the shift is the difference of the
 * two medians.
 */
import { createBaseInterpolator } from "./base-interpolator";
import { prepareBaseSeries, type BaseSeries } from "./base-series";
import { median } from "../series";

export interface MergedBase {
  base: BaseSeries;
  /** Added to the fallback's readings, nT. */
  levelShiftNt: number;
  /** How the shift was found. */
  shiftFrom: "simultaneous" | "medians";
  /** Fallback samples inserted. */
  fallbackSampleCount: number;
}

export function mergeFallbackBase(primary: BaseSeries, fallback: BaseSeries, maxGapS: number): MergedBase {
  const interp = createBaseInterpolator(primary, { method: "linear", maxGapS });
  const diffs: number[] = [];
  const uncovered: number[] = [];
  for (let i = 0; i < fallback.timeMs.length; i++) {
    const b = interp.at(fallback.timeMs[i]);
    if (b === b) diffs.push(b - fallback.fieldNt[i]);
    else uncovered.push(i);
  }
  const shiftFrom = diffs.length > 0 ? "simultaneous" : "medians";
  const levelShiftNt = diffs.length > 0 ? median(diffs) : median(primary.fieldNt) - median(fallback.fieldNt);
  if (uncovered.length === 0 || !Number.isFinite(levelShiftNt)) {
    return { base: primary, levelShiftNt: Number.isFinite(levelShiftNt) ? levelShiftNt : 0, shiftFrom, fallbackSampleCount: 0 };
  }
  const n = primary.timeMs.length + uncovered.length;
  const t = new Float64Array(n);
  const f = new Float64Array(n);
  t.set(primary.timeMs);
  f.set(primary.fieldNt);
  uncovered.forEach((idx, k) => {
    t[primary.timeMs.length + k] = fallback.timeMs[idx];
    f[primary.timeMs.length + k] = fallback.fieldNt[idx] + levelShiftNt;
  });
  const merged = prepareBaseSeries(t, f);
  return { base: { timeMs: merged.timeMs, fieldNt: merged.fieldNt }, levelShiftNt, shiftFrom, fallbackSampleCount: uncovered.length };
}
