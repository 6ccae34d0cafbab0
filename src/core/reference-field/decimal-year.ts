/**
 * Decimal year of a UTC instant: year + (instant − 1 January 00:00 UTC of that year) / (length of that year),
 * so 2024-07-02T00:00Z (leap year, day 184) is 2024 + 183/366.
 */

/** Decimal year of an instant given as milliseconds since the Unix epoch (UTC). */
export function decimalYear(timeMs: number): number {
  if (!Number.isFinite(timeMs)) throw new RangeError(`time ${timeMs} ms is not a finite instant`);
  const year = new Date(timeMs).getUTCFullYear();
  const startMs = Date.UTC(year, 0, 1);
  const lengthMs = Date.UTC(year + 1, 0, 1) - startMs;
  return year + (timeMs - startMs) / lengthMs;
}

/** Inverse of decimalYear: milliseconds since the Unix epoch (not rounded). */
export function timeMsFromDecimalYear(year: number): number {
  if (!Number.isFinite(year)) throw new RangeError(`decimal year ${year} is not finite`);
  const whole = Math.floor(year);
  const startMs = Date.UTC(whole, 0, 1);
  const lengthMs = Date.UTC(whole + 1, 0, 1) - startMs;
  return startMs + (year - whole) * lengthMs;
}

/** Start of the UTC calendar year containing timeMs, and of the next one (ms). */
export function utcYearBoundsMs(timeMs: number): { startMs: number; endMs: number } {
  const year = new Date(timeMs).getUTCFullYear();
  return { startMs: Date.UTC(year, 0, 1), endMs: Date.UTC(year + 1, 0, 1) };
}
