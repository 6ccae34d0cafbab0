/**
 * Naive local wall-clock time in an IANA zone → UTC instant.
 *
 * DST rule (deterministic, the same as JavaScript `Date` and Temporal's "compatible" choice):
 * - a wall time that occurs twice (autumn overlap) is read as the EARLIER instant (the offset in
 *   force before the change, i.e. still summer time);
 * - a wall time that never occurs (spring gap) is read with the offset in force BEFORE the gap,
 *   which lands it that many minutes after the change (02:30 in a 02:00→03:00 gap becomes 03:30).
 *
 * Zone offsets come from the runtime's time-zone data through `@date-fns/tz`; each zone's offset is
 * cached per UTC hour so a million rows cost a few thousand look-ups.
 */
import { tzOffset } from "@date-fns/tz";

const MS_PER_MIN = 60_000;
const MS_PER_HOUR = 3_600_000;
const MS_PER_DAY = 86_400_000;
const UTC_NAMES = new Set(["utc", "etc/utc", "z", "gmt", "etc/gmt", "universal", "etc/universal", "zulu"]);

/** True for a zone name the runtime knows (IANA name, or a UTC alias). */
export function isKnownTimeZone(timeZone: string): boolean {
  if (UTC_NAMES.has(timeZone.toLowerCase())) return true;
  try {
    new Intl.DateTimeFormat("en-US", { timeZone });
    return true;
  } catch {
    return false;
  }
}

export function isUtcZone(timeZone: string): boolean {
  return UTC_NAMES.has(timeZone.toLowerCase());
}

/** Offset (ms, local − UTC) of a zone at UTC instants; hour-cached. */
export function createZoneOffsetLookup(timeZone: string): (utcMs: number) => number {
  if (isUtcZone(timeZone)) return () => 0;
  if (!isKnownTimeZone(timeZone)) throw new RangeError(`unknown time zone "${timeZone}"`);
  const exact = (utcMs: number): number => Math.round(tzOffset(timeZone, new Date(utcMs)) * MS_PER_MIN);
  const byHour = new Map<number, number>();
  let lastHour = NaN;
  let lastOffset = NaN;
  return (utcMs: number): number => {
    const hour = Math.floor(utcMs / MS_PER_HOUR);
    if (hour === lastHour && !Number.isNaN(lastOffset)) return lastOffset;
    let cached = byHour.get(hour);
    if (cached === undefined) {
      const start = hour * MS_PER_HOUR;
      const a = exact(start);
      const b = exact(start + MS_PER_HOUR - 1);
      cached = a === b ? a : NaN; // NaN: a change inside this hour, look up exactly each time
      byHour.set(hour, cached);
    }
    lastHour = hour;
    lastOffset = cached;
    return Number.isNaN(cached) ? exact(utcMs) : cached;
  };
}

/**
 * Build a converter from "local wall-clock ms" (the civil fields packed with Date.UTC) to UTC ms,
 * applying the DST rule stated at the top of this file.
 */
export function createLocalToUtc(timeZone: string): (localMs: number) => number {
  if (isUtcZone(timeZone)) return (localMs) => localMs;
  const offsetAt = createZoneOffsetLookup(timeZone);
  return (localMs: number): number => {
    const before = offsetAt(localMs - MS_PER_DAY);
    const after = offsetAt(localMs + MS_PER_DAY);
    if (before === after) {
      const t = localMs - before;
      if (offsetAt(t) === before) return t;
    }
    const candidates: number[] = [];
    for (const o of before === after ? [before] : [before, after]) {
      const t = localMs - o;
      if (offsetAt(t) === o) candidates.push(t);
    }
    if (candidates.length > 0) return Math.min(...candidates); // overlap → earlier instant
    return localMs - before; // gap → offset in force before the change
  };
}
