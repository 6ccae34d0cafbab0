/**
 * Looped surveys (no continuous base): readings taken at a base point during the rover log form
 * the base series; the base change is interpolated linearly in time between reoccupations
 * (Milsom, Field Geophysics, ch. 3). Use with method "linear" and maxGapS = Infinity.
 */
import { prepareBaseSeries, type PreparedBaseSeries } from "./base-series";

export interface LoopBase {
  base: PreparedBaseSeries;
  /** Indices (into the rover readings) of the base occupations. */
  occupationIndices: Uint32Array;
}

/** Base series from the rover readings for which `isOccupation(i)` is true. */
export function loopBaseFromReadings(
  timeMs: ArrayLike<number>,
  fieldNt: ArrayLike<number>,
  isOccupation: (index: number) => boolean,
): LoopBase {
  const picked: number[] = [];
  for (let i = 0; i < timeMs.length; i++) if (isOccupation(i)) picked.push(i);
  const t = new Float64Array(picked.length);
  const f = new Float64Array(picked.length);
  picked.forEach((idx, k) => {
    t[k] = timeMs[idx];
    f[k] = fieldNt[idx];
  });
  return { base: prepareBaseSeries(t, f), occupationIndices: Uint32Array.from(picked) };
}

/** Base series from readings whose station equals `stationId` (trimmed, case-insensitive). */
export function loopBaseFromStation(
  timeMs: ArrayLike<number>,
  fieldNt: ArrayLike<number>,
  station: readonly string[],
  stationId: string,
): LoopBase {
  const wanted = stationId.trim().toLowerCase();
  return loopBaseFromReadings(timeMs, fieldNt, (i) => (station[i] ?? "").trim().toLowerCase() === wanted);
}
