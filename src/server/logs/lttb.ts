/**
 * Largest-triangle-three-buckets downsampling (S. Steinarsson, "Downsampling Time Series for
 * Visual Representation", MSc thesis, University of Iceland, 2013): keeps the first and last
 * points and, from each of `threshold − 2` equal buckets, the point that makes the largest
 * triangle with the point kept before it and the mean of the next bucket. Pure.
 */
export interface XY {
  x: number;
  y: number;
}

/** Indices of the kept points, ascending; all indices when n ≤ threshold. */
export function lttbIndices(xs: ArrayLike<number>, ys: ArrayLike<number>, threshold: number): number[] {
  const n = xs.length;
  if (ys.length !== n) throw new RangeError("x and y must have the same length");
  if (threshold >= n || threshold <= 2) {
    if (threshold <= 2 && n > 2) return threshold <= 0 ? [] : threshold === 1 ? [0] : [0, n - 1];
    return Array.from({ length: n }, (_, i) => i);
  }
  const kept: number[] = [0];
  const bucketSize = (n - 2) / (threshold - 2);
  let a = 0;
  for (let b = 0; b < threshold - 2; b++) {
    const start = Math.floor(b * bucketSize) + 1;
    const end = Math.min(Math.floor((b + 1) * bucketSize) + 1, n - 1);
    // mean of the next bucket (the last point for the final bucket)
    const nextStart = end;
    const nextEnd = Math.min(Math.floor((b + 2) * bucketSize) + 1, n);
    let meanX = 0;
    let meanY = 0;
    const count = Math.max(1, nextEnd - nextStart);
    for (let j = nextStart; j < nextStart + count && j < n; j++) {
      meanX += xs[j];
      meanY += ys[j];
    }
    meanX /= count;
    meanY /= count;
    let best = start;
    let bestArea = -1;
    const ax = xs[a];
    const ay = ys[a];
    for (let j = start; j < end; j++) {
      const area = Math.abs((ax - meanX) * (ys[j] - ay) - (ax - xs[j]) * (meanY - ay));
      if (area > bestArea) {
        bestArea = area;
        best = j;
      }
    }
    kept.push(best);
    a = best;
  }
  kept.push(n - 1);
  return kept;
}

export function lttb(points: readonly XY[], threshold: number): XY[] {
  const xs = points.map((p) => p.x);
  const ys = points.map((p) => p.y);
  return lttbIndices(xs, ys, threshold).map((i) => points[i]);
}
