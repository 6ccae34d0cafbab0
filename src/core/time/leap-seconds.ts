/**
 * GPS − UTC from the leap-second table.
 *
 * Source: IERS leap-second list (Bulletin C; file "Leap_Second.dat"), TAI − UTC = 19 s at the GPS
 * epoch 1980-01-06 and +1 s at each UTC instant below; GPS = TAI − 19 s, so GPS − UTC = (TAI − UTC) − 19.
 * Bulletin C 36 onwards: no leap second after 2017-01-01 (TAI − UTC = 37 s, GPS − UTC = 18 s).
 */
import { TimestampError } from "./timestamp-error";

const MS_PER_S = 1000;

/** UTC instant (ms) of the GPS epoch, 1980-01-06T00:00:00Z, where GPS − UTC = 0. */
export const GPS_EPOCH_MS = Date.UTC(1980, 0, 6);

/** UTC instants (00:00:00 of the day after each inserted leap second) where GPS − UTC grows by 1 s. */
const LEAP_DATES_UTC: ReadonlyArray<readonly [number, number, number]> = [
  [1981, 7, 1], [1982, 7, 1], [1983, 7, 1], [1985, 7, 1], [1988, 1, 1], [1990, 1, 1],
  [1991, 1, 1], [1992, 7, 1], [1993, 7, 1], [1994, 7, 1], [1996, 1, 1], [1997, 7, 1],
  [1999, 1, 1], [2006, 1, 1], [2009, 1, 1], [2012, 7, 1], [2015, 7, 1], [2017, 1, 1],
];

/** Start instants (UTC ms) of each step; GPS − UTC in seconds from that instant is index + 1. */
const STEP_UTC_MS: readonly number[] = LEAP_DATES_UTC.map(([y, m, d]) => Date.UTC(y, m - 1, d));

/** The same steps on the GPS time scale: GPS label at which the new offset begins. */
const STEP_GPS_MS: readonly number[] = STEP_UTC_MS.map((ms, i) => ms + (i + 1) * MS_PER_S);

function countStepsAtOrBefore(steps: readonly number[], ms: number): number {
  let n = steps.length;
  while (n > 0 && ms < steps[n - 1]) n--; // from the latest step: modern times stop at once
  return n;
}

/** GPS − UTC in whole seconds in force at the UTC instant `utcMs` (0 from the GPS epoch, 18 since 2017-01-01). */
export function gpsMinusUtcSecondsAtUtc(utcMs: number): number {
  return countStepsAtOrBefore(STEP_UTC_MS, utcMs);
}

/** GPS − UTC in whole seconds in force at a reading labelled `gpsMs` on the GPS time scale. */
export function gpsMinusUtcSecondsAtGps(gpsMs: number): number {
  return countStepsAtOrBefore(STEP_GPS_MS, gpsMs);
}

/** Convert a GPS-scale time (ms, labelled like Unix ms) to UTC ms by subtracting the offset in force. */
export function gpsToUtcMs(gpsMs: number): number {
  if (gpsMs < GPS_EPOCH_MS) {
    throw new TimestampError("before_gps_epoch", new Date(gpsMs).toISOString(), "GPS time before the GPS epoch 1980-01-06");
  }
  return gpsMs - gpsMinusUtcSecondsAtGps(gpsMs) * MS_PER_S;
}

/** Convert a UTC instant (ms) to its GPS-scale label (ms). */
export function utcToGpsMs(utcMs: number): number {
  if (utcMs < GPS_EPOCH_MS) {
    throw new TimestampError("before_gps_epoch", new Date(utcMs).toISOString(), "GPS time before the GPS epoch 1980-01-06");
  }
  return utcMs + gpsMinusUtcSecondsAtUtc(utcMs) * MS_PER_S;
}
