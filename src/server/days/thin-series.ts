/**
 * Chart series thinned to a point budget by LTTB (src/core/series/lttb.ts), never by striding,
 * with gaps kept as breaks: each y series is split at its missing values and at time gaps, each
 * stretch is thinned on its own (budget shared by length), the kept indices of all y series are
 * united, and a row of nulls marks every break so a line chart does not bridge it. Pure.
 */
import { lttbIndices } from "@/src/core/series/lttb";

export interface ThinnedSeries {
  /** x of each row (ms, or m along a line). */
  x: number[];
  /** One array per y series; null = no value / break. */
  ys: (number | null)[][];
  totalCount: number;
}

const round = (v: number, digits: number) => {
  const f = 10 ** digits;
  return Math.round(v * f) / f;
};

/**
 * `isGapBefore(i)`: true when a break belongs between points i − 1 and i (e.g. a base gap).
 * Values are rounded to `digits` decimals for transport (display only; exports use the full values).
 */
export function thinWithBreaks(
  x: ArrayLike<number>,
  ys: ArrayLike<number>[],
  maxPoints: number,
  isGapBefore: (i: number) => boolean,
  digits = 3,
): ThinnedSeries {
  const n = x.length;
  const kept = new Uint8Array(n);
  const breaks: number[] = [];
  for (let i = 1; i < n; i++) if (isGapBefore(i)) breaks.push(i);
  const gapSet = new Set(breaks);
  const perSeries = Math.max(3, Math.floor(maxPoints / Math.max(1, ys.length)) - 2 * breaks.length);
  for (const y of ys) {
    // stretches of finite values with no gap inside
    const stretches: [number, number][] = [];
    let start = -1;
    let valid = 0;
    for (let i = 0; i <= n; i++) {
      const ok = i < n && y[i] === y[i];
      if (ok && start >= 0 && gapSet.has(i)) {
        stretches.push([start, i]);
        start = i;
      } else if (ok && start < 0) start = i;
      else if (!ok && start >= 0) {
        stretches.push([start, i]);
        if (i < n) kept[i] = 1; // the missing value itself becomes a null row: a break
        start = -1;
      }
      if (ok) valid++;
    }
    for (const [a, b] of stretches) {
      const len = b - a;
      const budget = Math.max(2, Math.round((perSeries * len) / Math.max(1, valid)));
      if (len <= budget) {
        for (let i = a; i < b; i++) kept[i] = 1;
        continue;
      }
      const xs = Array.prototype.slice.call(x, a, b) as number[];
      const yv = Array.prototype.slice.call(y, a, b) as number[];
      for (const k of lttbIndices(xs, yv, budget)) kept[a + k] = 1;
    }
  }
  const outX: number[] = [];
  const outYs: (number | null)[][] = ys.map(() => []);
  for (let i = 0; i < n; i++) {
    if (gapSet.has(i) && outX.length > 0) {
      outX.push((x[i - 1] + x[i]) / 2);
      for (const col of outYs) col.push(null);
    }
    if (!kept[i]) continue;
    outX.push(x[i]);
    ys.forEach((y, k) => outYs[k].push(y[i] === y[i] ? round(y[i], digits) : null));
  }
  return { x: outX, ys: outYs, totalCount: n };
}
