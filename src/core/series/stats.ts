/** Small robust statistics on numeric arrays (NaN values are ignored). */

function finiteCopy(values: ArrayLike<number>): Float64Array {
  let n = 0;
  for (let i = 0; i < values.length; i++) if (values[i] === values[i]) n++;
  const out = new Float64Array(n);
  let k = 0;
  for (let i = 0; i < values.length; i++) if (values[i] === values[i]) out[k++] = values[i];
  return out;
}

/** Median (mean of the two middle values for an even count); NaN when empty. */
export function median(values: ArrayLike<number>): number {
  const a = finiteCopy(values).sort();
  const n = a.length;
  if (n === 0) return NaN;
  const mid = n >> 1;
  return n % 2 === 1 ? a[mid] : (a[mid - 1] + a[mid]) / 2;
}

export function mean(values: ArrayLike<number>): number {
  let sum = 0;
  let n = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (v === v) {
      sum += v;
      n++;
    }
  }
  return n === 0 ? NaN : sum / n;
}

/** Median absolute deviation from the median (unscaled); NaN when empty. */
export function medianAbsoluteDeviation(values: ArrayLike<number>, center = median(values)): number {
  const a = finiteCopy(values);
  for (let i = 0; i < a.length; i++) a[i] = Math.abs(a[i] - center);
  return median(a);
}

/** Minimum and maximum; NaN when empty. */
export function extent(values: ArrayLike<number>): { min: number; max: number } {
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (v < min) min = v;
    if (v > max) max = v;
  }
  return min <= max ? { min, max } : { min: NaN, max: NaN };
}
