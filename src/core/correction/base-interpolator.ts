/**
 * Base field at arbitrary times: `linear` (default; what agency QC uses), natural cubic `spline`
 * (fitted separately on each stretch between too-long gaps) or `nearest` (a tie goes to the
 * earlier sample). Never extrapolates past either end, never bridges a gap longer than maxGapS:
 * such times get NaN and a status saying why. A time equal to a sample gets that sample.
 */
import { evaluateSplineInterval, lastIndexAtOrBefore, naturalSplineSecondDerivatives } from "../series";
import type { BaseSeries } from "./base-series";

export type InterpolationMethod = "linear" | "spline" | "nearest";

export const DEFAULT_MAX_GAP_S = 120;

export const CoverStatus = { Ok: 0, NoBaseCover: 1, BaseGap: 2 } as const;
export type CoverStatus = (typeof CoverStatus)[keyof typeof CoverStatus];

export interface BaseInterpolator {
  /** Base field (nT) at `timeMs`, or NaN; `status` then says why. */
  at(timeMs: number): number;
  /** Status of the last `at` call. */
  status: CoverStatus;
}

export interface BaseInterpolationOptions {
  method?: InterpolationMethod;
  /** Longest base spacing (s) that is interpolated across; default 120. Infinity for looped surveys. */
  maxGapS?: number;
}

export function createBaseInterpolator(base: BaseSeries, options: BaseInterpolationOptions = {}): BaseInterpolator {
  const method = options.method ?? "linear";
  const maxGapS = options.maxGapS ?? DEFAULT_MAX_GAP_S;
  if (!(maxGapS > 0)) throw new RangeError("maxGapS must be a positive number of seconds");
  if (method !== "linear" && method !== "spline" && method !== "nearest") throw new RangeError(`unknown interpolation method "${String(method)}"`);
  const maxGapMs = maxGapS * 1000;
  const t = base.timeMs;
  const f = base.fieldNt;
  const n = t.length;
  for (let i = 1; i < n; i++) if (!(t[i] > t[i - 1])) throw new RangeError("base times must be strictly ascending (use prepareBaseSeries)");

  // spline: second derivatives per stretch (x in seconds from the stretch start, for conditioning)
  let xs: Float64Array | null = null;
  let ms: Float64Array | null = null;
  if (method === "spline" && n > 0) {
    xs = new Float64Array(n);
    ms = new Float64Array(n);
    let start = 0;
    for (let i = 1; i <= n; i++) {
      if (i === n || t[i] - t[i - 1] > maxGapMs) {
        const x = xs.subarray(start, i);
        for (let k = start; k < i; k++) x[k - start] = (t[k] - t[start]) / 1000;
        ms.set(naturalSplineSecondDerivatives(x, f.subarray(start, i)), start);
        start = i;
      }
    }
  }

  let hint = 0;
  const self: BaseInterpolator = {
    status: CoverStatus.Ok,
    at(timeMs: number): number {
      if (n === 0 || timeMs < t[0] || timeMs > t[n - 1] || timeMs !== timeMs) {
        self.status = CoverStatus.NoBaseCover;
        return NaN;
      }
      let i = hint;
      if (!(i < n - 1 && t[i] <= timeMs && timeMs < t[i + 1])) {
        i = lastIndexAtOrBefore(t, timeMs);
        hint = i;
      }
      if (t[i] === timeMs) {
        self.status = CoverStatus.Ok;
        return f[i];
      }
      const t0 = t[i];
      const t1 = t[i + 1];
      if (t1 - t0 > maxGapMs) {
        self.status = CoverStatus.BaseGap;
        return NaN;
      }
      self.status = CoverStatus.Ok;
      if (method === "linear") return f[i] + ((f[i + 1] - f[i]) * (timeMs - t0)) / (t1 - t0);
      if (method === "nearest") return timeMs - t0 <= t1 - timeMs ? f[i] : f[i + 1];
      // spline: x relative to the stretch start is xs[i] + (timeMs − t0)/1000
      return evaluateSplineInterval(xs!, f, ms!, i, xs![i] + (timeMs - t0) / 1000);
    },
  };
  return self;
}
