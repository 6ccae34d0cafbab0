/** A base record ready for interpolation: strictly ascending times, duplicate times averaged. */
export interface BaseSeries {
  /** UTC ms, strictly ascending. */
  timeMs: Float64Array;
  fieldNt: Float64Array;
}

export interface PreparedBaseSeries extends BaseSeries {
  /** Samples dropped by averaging readings that share a time. */
  duplicateSamplesMerged: number;
  /** True when the input was not in time order (it has been sorted). */
  wasUnsorted: boolean;
}

/**
 * Sort by time (stable) and average readings with the same time: one value per instant, so
 * interpolation is well defined. NaN times or fields are dropped.
 */
export function prepareBaseSeries(timeMs: ArrayLike<number>, fieldNt: ArrayLike<number>): PreparedBaseSeries {
  if (timeMs.length !== fieldNt.length) throw new RangeError("base times and fields differ in length");
  const n = timeMs.length;
  let sorted = true;
  for (let i = 1; i < n; i++) {
    if (timeMs[i] < timeMs[i - 1]) {
      sorted = false;
      break;
    }
  }
  let order: Uint32Array | null = null;
  if (!sorted) {
    order = new Uint32Array(n);
    for (let i = 0; i < n; i++) order[i] = i;
    order.sort((a, b) => timeMs[a] - timeMs[b] || a - b);
  }
  const t = new Float64Array(n);
  const f = new Float64Array(n);
  let k = 0;
  let merged = 0;
  let runCount = 0;
  for (let j = 0; j < n; j++) {
    const i = order ? order[j] : j;
    const ti = timeMs[i];
    const fi = fieldNt[i];
    if (ti !== ti || fi !== fi) continue;
    if (k > 0 && t[k - 1] === ti) {
      runCount++;
      f[k - 1] += (fi - f[k - 1]) / runCount; // running mean
      merged++;
    } else {
      t[k] = ti;
      f[k] = fi;
      k++;
      runCount = 1;
    }
  }
  return { timeMs: t.subarray(0, k), fieldNt: f.subarray(0, k), duplicateSamplesMerged: merged, wasUnsorted: !sorted };
}
