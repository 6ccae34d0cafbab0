/**
 * Largest-triangle-three-buckets downsampling (S. Steinarsson, "Downsampling Time Series for
 * Visual Representation", MSc thesis, University of Iceland, 2013, ch. 4.2): keeps the first and
 * the last point; the points in between are split into `threshold − 2` buckets of equal count, and
 * from each bucket the point is kept that forms the largest triangle with the point kept from the
 * bucket before and the average point of the bucket after. Shape-preserving (peaks survive), unlike
 * striding. Pure; x must be ascending; y must be finite (split a series at gaps before calling).
 */

/** Indices of the kept points, ascending. All indices when n ≤ threshold; threshold < 3 keeps the ends. */
export function lttbIndices(x: ArrayLike<number>, y: ArrayLike<number>, threshold: number): Uint32Array {
  const n = x.length;
  if (y.length !== n) throw new RangeError("x and y must have the same length");
  if (!Number.isInteger(threshold) || threshold < 0) throw new RangeError("threshold must be a whole number ≥ 0");
  if (threshold >= n) return Uint32Array.from({ length: n }, (_, i) => i);
  if (threshold === 0) return new Uint32Array(0);
  if (threshold === 1) return Uint32Array.of(0);
  if (threshold === 2) return Uint32Array.of(0, n - 1);
  const kept = new Uint32Array(threshold);
  const every = (n - 2) / (threshold - 2);
  let a = 0;
  kept[0] = 0;
  for (let i = 0; i < threshold - 2; i++) {
    // average of the next bucket (the last point, for the last bucket)
    let avgStart = Math.floor((i + 1) * every) + 1;
    let avgEnd = Math.min(Math.floor((i + 2) * every) + 1, n);
    if (avgStart >= n - 1) {
      avgStart = n - 1;
      avgEnd = n;
    }
    let avgX = 0;
    let avgY = 0;
    for (let j = avgStart; j < avgEnd; j++) {
      avgX += x[j];
      avgY += y[j];
    }
    const count = avgEnd - avgStart;
    avgX /= count;
    avgY /= count;
    // this bucket
    const from = Math.floor(i * every) + 1;
    const to = Math.min(Math.floor((i + 1) * every) + 1, n - 1);
    const ax = x[a];
    const ay = y[a];
    let best = from;
    let bestArea = -1;
    for (let j = from; j < to; j++) {
      // twice the triangle area; the factor does not change which point wins
      const area = Math.abs((ax - avgX) * (y[j] - ay) - (ax - x[j]) * (avgY - ay));
      if (area > bestArea) {
        bestArea = area;
        best = j;
      }
    }
    kept[i + 1] = best;
    a = best;
  }
  kept[threshold - 1] = n - 1;
  return kept;
}
