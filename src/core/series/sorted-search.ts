/** Index of the last element ≤ x in an ascending array, or −1 when x is before the first. */
export function lastIndexAtOrBefore(sorted: ArrayLike<number>, x: number): number {
  let lo = 0;
  let hi = sorted.length - 1;
  if (hi < 0 || x < sorted[0]) return -1;
  if (x >= sorted[hi]) return hi;
  while (hi - lo > 1) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid] <= x) lo = mid;
    else hi = mid;
  }
  return lo;
}
