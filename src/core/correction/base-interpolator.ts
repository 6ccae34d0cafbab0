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
  /**
   * `at` for times 0…count−1 at once: field into out[i], CoverStatus into status[i] (one call per
   * batch: a double returned from a call that is not inlined is boxed, an allocation per reading).
   */
  fill(out: Float64Array, status: Uint8Array, timeMs: ArrayLike<number>, count: number): void;
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
  const fill: BaseInterpolator["fill"] = (out, status, times, count) => {
    for (let k = 0; k < count; k++) {
      const timeMs = times[k];
      if (n === 0 || timeMs < t[0] || timeMs > t[n - 1] || timeMs !== timeMs) {
        status[k] = CoverStatus.NoBaseCover;
        out[k] = NaN;
        continue;
      }
      let i = hint;
      if (!(i < n - 1 && t[i] <= timeMs && timeMs < t[i + 1])) {
        i = lastIndexAtOrBefore(t, timeMs);
        hint = i;
      }
      if (t[i] === timeMs) {
        status[k] = CoverStatus.Ok;
        out[k] = f[i];
        continue;
      }
      const t0 = t[i];
      const t1 = t[i + 1];
      if (t1 - t0 > maxGapMs) {
        status[k] = CoverStatus.BaseGap;
        out[k] = NaN;
        continue;
      }
      status[k] = CoverStatus.Ok;
      if (method === "linear") out[k] = f[i] + ((f[i + 1] - f[i]) * (timeMs - t0)) / (t1 - t0);
      else if (method === "nearest") out[k] = timeMs - t0 <= t1 - timeMs ? f[i] : f[i + 1];
      // spline: x relative to the stretch start is xs[i] + (timeMs − t0)/1000
      else out[k] = evaluateSplineInterval(xs!, f, ms!, i, xs![i] + (timeMs - t0) / 1000);
    }
  };
  const one = { out: new Float64Array(1), status: new Uint8Array(1), time: new Float64Array(1) };
  const self: BaseInterpolator = {
    status: CoverStatus.Ok,
    at(timeMs: number): number {
      one.time[0] = timeMs;
      fill(one.out, one.status, one.time, 1);
      self.status = one.status[0] as CoverStatus;
      return one.out[0];
    },
    fill,
  };
  return self;
}
