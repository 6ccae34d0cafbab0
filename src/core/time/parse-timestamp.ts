/**
 * Fast timestamp reading: ISO 8601 and common log forms → integer ms since the Unix epoch, UTC.
 *
 * Accepted: `yyyy-mm-dd` or `yyyy/mm/dd`, then `T` or spaces, then `hh:mm[:ss[.fff…]]`, then an
 * optional offset `Z`, `UTC`, `GMT`, `±hh`, `±hh:mm`, `±hhmm`; the ISO basic form
 * `yyyymmddThhmmss[.fff][Z|±hhmm]`; a date alone (midnight); or, with `defaultDate`, a time of day
 * alone. Fractional seconds keep ms; finer digits are rounded half up to the ms.
 *
 * Order of operations for one logged time:
 *   1. civil fields are checked (month 13, 30 February, 25:00 → TimestampError);
 *   2. an offset written in the text wins; otherwise the fields are wall-clock time in `timeZone`
 *      (default UTC; DST rule in ./zone.ts: overlap → earlier instant, gap → offset before the gap);
 *   3. the per-log clock offset is added: corrected = logged + clockOffsetS (a clock running 2 s
 *      slow needs clockOffsetS = +2);
 *   4. a GPS-basis time is turned to UTC by subtracting GPS − UTC in force then (./leap-seconds.ts).
 */
import { assertCivilFields, daysFromCivil, daysInMonth } from "./civil";
import { gpsToUtcMs } from "./leap-seconds";
import { TimestampError } from "./timestamp-error";
import { createLocalToUtc, isKnownTimeZone, isUtcZone } from "./zone";

export type TimeBasis = "utc" | "gps";

export interface TimeReadOptions {
  /** IANA zone for times written without an offset; default "UTC". */
  timeZone?: string;
  /** Time scale of the log's clock; default "utc". A GPS basis needs timeZone UTC. */
  timeBasis?: TimeBasis;
  /** Seconds ADDED to every logged time: corrected = logged + clockOffsetS. Default 0. */
  clockOffsetS?: number;
  /** `yyyy-mm-dd` used when the text holds a time of day only. */
  defaultDate?: string;
  /**
   * How to read a date written day or month first (`04/05/2026`, `04.05.2026`, `04-05-2026`):
   * "dmy" or "mdy". Without it such dates are refused as ambiguous; year-first dates never need it.
   */
  dateOrder?: DateOrder;
}

export type DateOrder = "dmy" | "mdy";

export interface TimestampReader {
  /** One timestamp text → UTC ms; throws TimestampError. */
  parse(text: string): number;
  /** The timestamp in bytes[start, end) (UTF-8) without building a string first; throws TimestampError. */
  parseBytes(bytes: Uint8Array, start: number, end: number): number;
  /**
   * The fast path of parseBytes alone: when bytes[start, end) is exactly the fixed layout
   * `yyyy-mm-ddThh:mm:ss[.f…][Z]` (every byte checked, so the span holds no delimiter), its instant
   * goes to out[outAt] and the result is true (the value parseBytes gives); false otherwise, nothing thrown.
   */
  readFixedBytes(bytes: Uint8Array, start: number, end: number, out: Float64Array, outAt: number): boolean;
  /** Separate date and time columns → UTC ms; throws TimestampError. */
  parseDateAndTime(dateText: string, timeText: string): number;
}

const MS_PER_MIN = 60_000;
const MS_PER_DAY = 86_400_000;
const UTF8 = new TextDecoder("utf-8");
/**
 * Longest timestamp text read (after trimming): `2026-05-04T09:15:00.123456789+05:30` has 35
 * characters, so 64 leaves room for any spelling accepted here. A longer cell is refused before any
 * pattern runs, which keeps the time per cell bounded whatever a file holds.
 */
export const MAX_TIMESTAMP_CHARS = 64;
// The patterns run on trimmed text, so none starts or ends with `\s*`: two blank runs side by side
// (`\s*(offset)?\s*$`) backtrack quadratically on a long run of blanks that does not end the text.
const EXTENDED_RE =
  /^(\d{4})[-/](\d{1,2})[-/](\d{1,2})(?:(?:T|t|\s+)(\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d+))?)?)?\s*(Z|z|UTC|GMT|[+-]\d{2}(?::?\d{2})?)?$/;
const BASIC_RE = /^(\d{4})(\d{2})(\d{2})[Tt](\d{2})(\d{2})(\d{2})?(?:[.,](\d+))?\s*(Z|z|[+-]\d{2}(?:\d{2})?)?$/;
const TIME_ONLY_RE = /^(\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d+))?)?\s*(Z|z|UTC|GMT|[+-]\d{2}(?::?\d{2})?)?$/;
const DATE_ONLY_RE = /^(\d{4})[-/](\d{1,2})[-/](\d{1,2})$/;
/** Day- or month-first date, optionally with a time: groups 1–3 date, 4–7 time, 8 offset. */
const YEAR_LAST_RE =
  /^(\d{1,2})([./-])(\d{1,2})\2(\d{4})(?:(?:T|t|\s+)(\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d+))?)?)?\s*(Z|z|UTC|GMT|[+-]\d{2}(?::?\d{2})?)?$/;
/** Characters of an over-long text shown in its error message. */
const SHOWN_CHARS = 40;

/** Trimmed text, or a TimestampError when it is longer than any timestamp. */
function trimmedTimestamp(raw: string): string {
  const text = raw.trim();
  if (text.length > MAX_TIMESTAMP_CHARS) {
    const shown = JSON.stringify(text.slice(0, SHOWN_CHARS)).slice(1, -1);
    throw new TimestampError(
      "unrecognised_format",
      text,
      `unreadable timestamp "${shown}…" (${text.length} characters; a timestamp has at most ${MAX_TIMESTAMP_CHARS})`,
    );
  }
  return text;
}

/** Fraction digits → ms, rounded half up on the fourth digit. */
function fractionToMs(frac: string | undefined): number {
  if (!frac) return 0;
  if (frac.length === 3) return +frac;
  const four = +(frac.length >= 4 ? frac.slice(0, 4) : frac.padEnd(4, "0"));
  return Math.floor(four / 10) + (four % 10 >= 5 ? 1 : 0);
}

/** Non-negative integer from `len` ASCII digit bytes at `at`, or −1. */
function digits(bytes: Uint8Array, at: number, len: number): number {
  let v = 0;
  for (let i = at; i < at + len; i++) {
    const c = bytes[i] - 48;
    if (c < 0 || c > 9) return -1;
    v = v * 10 + c;
  }
  return v;
}

const SCRATCH_BYTES = 64;

/** Offset text → ms (local − UTC); null when absent. */
function offsetToMs(text: string, offset: string | undefined): number | null {
  if (offset === undefined) return null;
  const c = offset.charCodeAt(0);
  if (c !== 43 && c !== 45) return 0; // Z, UTC, GMT
  const digits = offset.slice(1).replace(":", "");
  const hours = +digits.slice(0, 2);
  const minutes = digits.length > 2 ? +digits.slice(2, 4) : 0;
  if (hours > 18 || minutes > 59) throw new TimestampError("bad_offset", text, `impossible UTC offset "${offset}" in "${text}"`);
  const ms = (hours * 60 + minutes) * MS_PER_MIN;
  return c === 45 ? -ms : ms;
}

/** Check options and build a reader; throws RangeError on bad options. */
export function createTimestampReader(options: TimeReadOptions = {}): TimestampReader {
  const timeZone = options.timeZone ?? "UTC";
  const timeBasis = options.timeBasis ?? "utc";
  const clockOffsetS = options.clockOffsetS ?? 0;
  if (!isKnownTimeZone(timeZone)) throw new RangeError(`unknown time zone "${timeZone}" (expected an IANA name such as Europe/Berlin)`);
  if (timeBasis !== "utc" && timeBasis !== "gps") throw new RangeError(`unknown time basis "${String(timeBasis)}" (expected utc or gps)`);
  if (timeBasis === "gps" && !isUtcZone(timeZone)) {
    throw new RangeError("GPS time has no time zone: use a GPS time basis with time zone UTC");
  }
  if (!Number.isFinite(clockOffsetS)) throw new RangeError("clock offset must be a finite number of seconds");
  const dateOrder = options.dateOrder;
  if (dateOrder !== undefined && dateOrder !== "dmy" && dateOrder !== "mdy") {
    throw new RangeError(`unknown date order "${String(dateOrder)}" (expected dmy or mdy)`);
  }
  const clockOffsetMs = Math.round(clockOffsetS * 1000);
  const gpsBasis = timeBasis === "gps";
  const localToUtc = createLocalToUtc(timeZone);
  let defaultDate: [number, number, number] | null = null;
  if (options.defaultDate !== undefined) {
    const m = DATE_ONLY_RE.exec(options.defaultDate.trim());
    if (!m) throw new RangeError(`default date "${options.defaultDate}" is not yyyy-mm-dd`);
    defaultDate = [+m[1], +m[2], +m[3]];
    assertCivilFields(options.defaultDate, defaultDate[0], defaultDate[1], defaultDate[2], 0, 0, 0);
  }

  function finish(text: string, y: number, mo: number, d: number, h: number, mi: number, s: number, ms: number, off: string | undefined): number {
    assertCivilFields(text, y, mo, d, h, mi, s);
    return instantOf(y, mo, d, h, mi, s, ms, offsetToMs(text, off));
  }

  /** Fields already checked → UTC ms (zone or written offset, clock offset, time basis). */
  function instantOf(y: number, mo: number, d: number, h: number, mi: number, s: number, ms: number, offsetMs: number | null): number {
    const packed = daysFromCivil(y, mo, d) * MS_PER_DAY + ((h * 60 + mi) * 60 + s) * 1000 + ms;
    let t = offsetMs === null ? localToUtc(packed) : packed - offsetMs;
    t += clockOffsetMs;
    if (timeBasis === "gps") t = gpsToUtcMs(t);
    return t;
  }

  // Minute cache for the fixed layout: logs run in time order, so consecutive rows share
  // `yyyy-mm-ddThh:mm`; the zone offset is looked up once per minute (kept only when the offset is the
  // same at both ends of that minute). The minute's 16 bytes are kept as four little-endian words,
  // read and compared through a view of the row's bytes.
  const cachedWords = new Int32Array(4);
  let viewBytes: Uint8Array | null = null;
  let view: DataView<ArrayBufferLike> = new DataView(new ArrayBuffer(0));
  let cacheValid = false;
  let cachedZulu = false;
  let cachedMinuteUtcMs = NaN; // UTC of hh:mm:00 before clock offset and time basis
  const scratch = new Uint8Array(SCRATCH_BYTES);
  // readFixedLayout's result: a typed slot, since a double returned from a call that is not inlined
  // is boxed on the heap (one allocation per row)
  const fixedResult = new Float64Array(1);

  /**
   * Fixed layout `yyyy-mm-ddThh:mm:ss[.f…][Z]` (or `/`, or a space for T) in bytes[at, end) (ASCII),
   * read without building a string, into fixedResult[0]; false when the span is not that layout or
   * its fields are impossible (the general path then reads it and reports why).
   */
  function readFixedLayout(bytes: Uint8Array, at: number, end: number): boolean {
    if (end - at < 19) return false;
    let stop = end;
    const zulu = bytes[end - 1] === 90;
    if (zulu) stop = end - 1;
    // seconds and fraction first: they change every row, the minute rarely
    const s1 = bytes[at + 17] - 48, s0 = bytes[at + 18] - 48;
    if (bytes[at + 16] !== 58 || s1 < 0 || s1 > 5 || s0 < 0 || s0 > 9) return false;
    let ms = 0;
    if (stop > at + 19) {
      if (bytes[at + 19] !== 46 || stop === at + 20) return false;
      let four = 0;
      let i = at + 20;
      const fourEnd = stop < at + 24 ? stop : at + 24;
      for (; i < fourEnd; i++) {
        const c = bytes[i] - 48;
        if (c < 0 || c > 9) return false;
        four = four * 10 + c;
      }
      for (; i < stop; i++) {
        const c = bytes[i] - 48;
        if (c < 0 || c > 9) return false;
      }
      for (let k = fourEnd - (at + 20); k < 4; k++) four *= 10;
      ms = (four - (four % 10)) / 10 + (four % 10 >= 5 ? 1 : 0);
    }
    const secondMs = (s1 * 10 + s0) * 1000 + ms;
    // the minute `yyyy-mm-ddThh:mm`: the one of the previous row (already checked), or read now
    if (bytes !== viewBytes) {
      viewBytes = bytes;
      view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
    }
    let same = cacheValid && zulu === cachedZulu;
    if (same) {
      const w = cachedWords;
      same = view.getInt32(at + 12, true) === w[3] && view.getInt32(at + 8, true) === w[2] && view.getInt32(at + 4, true) === w[1] && view.getInt32(at, true) === w[0];
    }
    let minuteUtcMs: number;
    if (same) {
      minuteUtcMs = cachedMinuteUtcMs;
    } else {
      const c4 = bytes[at + 4];
      const c10 = bytes[at + 10];
      if ((c4 !== 45 && c4 !== 47) || bytes[at + 7] !== c4 || (c10 !== 84 && c10 !== 32) || bytes[at + 13] !== 58) return false;
      const y = digits(bytes, at, 4), mo = digits(bytes, at + 5, 2), d = digits(bytes, at + 8, 2);
      const h = digits(bytes, at + 11, 2), mi = digits(bytes, at + 14, 2);
      if (y < 0 || mo < 0 || d < 0 || h < 0 || mi < 0) return false;
      if (mo < 1 || mo > 12 || d < 1 || d > daysInMonth(y, mo) || h > 23 || mi > 59) return false;
      const packed = daysFromCivil(y, mo, d) * MS_PER_DAY + (h * 60 + mi) * 60_000;
      minuteUtcMs = zulu ? packed : localToUtc(packed);
      cacheValid = zulu || localToUtc(packed + 59_999) - minuteUtcMs === 59_999;
      for (let k = 0; k < 4; k++) cachedWords[k] = view.getInt32(at + 4 * k, true);
      cachedZulu = zulu;
      cachedMinuteUtcMs = minuteUtcMs;
      if (!cacheValid) {
        fixedResult[0] = instantOf(y, mo, d, h, mi, s1 * 10 + s0, ms, zulu ? 0 : null);
        return true;
      }
    }
    let t = minuteUtcMs + secondMs + clockOffsetMs;
    if (gpsBasis) t = gpsToUtcMs(t);
    fixedResult[0] = t;
    return true;
  }

  /** A short ASCII string into the scratch bytes; false when it does not fit or is not ASCII. */
  function toScratch(text: string): boolean {
    const n = text.length;
    if (n > SCRATCH_BYTES) return false;
    for (let i = 0; i < n; i++) {
      const c = text.charCodeAt(i);
      if (c > 127) return false;
      scratch[i] = c;
    }
    return true;
  }

  /** The timestamp in bytes[at, end) (ASCII/UTF-8 cell of a larger chunk) → UTC ms; throws TimestampError. */
  function parseBytes(bytes: Uint8Array, at: number, end: number): number {
    return readFixedLayout(bytes, at, end) ? fixedResult[0] : parse(UTF8.decode(bytes.subarray(at, end)));
  }

  function parse(raw: string): number {
    if (toScratch(raw)) {
      if (readFixedLayout(scratch, 0, raw.length)) return fixedResult[0];
    }
    const text = trimmedTimestamp(raw);
    let m = EXTENDED_RE.exec(text);
    if (m) {
      return finish(text, +m[1], +m[2], +m[3], m[4] ? +m[4] : 0, m[5] ? +m[5] : 0, m[6] ? +m[6] : 0, fractionToMs(m[7]), m[8]);
    }
    m = BASIC_RE.exec(text);
    if (m) return finish(text, +m[1], +m[2], +m[3], +m[4], +m[5], m[6] ? +m[6] : 0, fractionToMs(m[7]), m[8]);
    if (defaultDate) {
      m = TIME_ONLY_RE.exec(text);
      if (m) {
        return finish(text, defaultDate[0], defaultDate[1], defaultDate[2], +m[1], +m[2], m[3] ? +m[3] : 0, fractionToMs(m[4]), m[5]);
      }
    }
    m = YEAR_LAST_RE.exec(text);
    if (m) {
      const [a, b] = yearLastDayMonth(text, +m[1], +m[3]);
      return finish(text, +m[4], b, a, m[5] ? +m[5] : 0, m[6] ? +m[6] : 0, m[7] ? +m[7] : 0, fractionToMs(m[8]), m[9]);
    }
    if (!defaultDate && TIME_ONLY_RE.test(text)) {
      throw new TimestampError("missing_date", text, `"${text}" is a time of day without a date: give the log's date (CLI --date)`);
    }
    throw new TimestampError("unrecognised_format", text, `unreadable timestamp "${text}" (expected e.g. 2026-05-04T09:15:00Z)`);
  }

  /** [day, month] of a day- or month-first date, by the date order option. */
  function yearLastDayMonth(text: string, first: number, second: number): [number, number] {
    if (dateOrder === "dmy") return [first, second];
    if (dateOrder === "mdy") return [second, first];
    throw new TimestampError(
      "ambiguous_date_order",
      text,
      `"${text}" puts the year last: say whether it is day/month/year or month/day/year (CLI --date-order dmy|mdy)`,
    );
  }

  function parseDateAndTime(rawDate: string, rawTime: string): number {
    const dateText = trimmedTimestamp(rawDate);
    const timeText = trimmedTimestamp(rawTime);
    const t = TIME_ONLY_RE.exec(timeText);
    const both = `${dateText} ${timeText}`;
    const d = DATE_ONLY_RE.exec(dateText);
    if (d && t) return finish(both, +d[1], +d[2], +d[3], +t[1], +t[2], t[3] ? +t[3] : 0, fractionToMs(t[4]), t[5]);
    const e = YEAR_LAST_RE.exec(dateText);
    if (e && !e[5] && t) {
      const [day, month] = yearLastDayMonth(both, +e[1], +e[3]);
      return finish(both, +e[4], month, day, +t[1], +t[2], t[3] ? +t[3] : 0, fractionToMs(t[4]), t[5]);
    }
    throw new TimestampError("unrecognised_format", both, `unreadable date and time "${both}" (expected e.g. 2026-05-04 and 09:15:00)`);
  }

  function readFixedBytes(bytes: Uint8Array, at: number, end: number, out: Float64Array, outAt: number): boolean {
    if (!readFixedLayout(bytes, at, end)) return false;
    out[outAt] = fixedResult[0];
    return true;
  }

  return { parse, parseBytes, readFixedBytes, parseDateAndTime };
}

/** One-off convenience; build a reader with createTimestampReader for many rows. */
export function parseTimestamp(text: string, options: TimeReadOptions = {}): number {
  return createTimestampReader(options).parse(text);
}
