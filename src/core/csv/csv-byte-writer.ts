/** CSV rows written as bytes (pure: Uint8Array and TextEncoder only, no Node Buffer). */
import { csvCell } from "./cells";

const UTF8 = new TextEncoder();
const MS_PER_DAY = 86_400_000;
const C_ZERO = 48;
const C_MINUS = 45;
const C_DOT = 46;
const INT32_LIMIT = 2_147_483_647;
/**
 * Room putFixedAt needs: sign, Number#toFixed of a magnitude below 1e21 (21 digits), point, 9
 * decimals, and 3 bytes that a digit-group store may touch past the end.
 */
export const MAX_FIXED_BYTES = 35;
/** Bytes of `yyyy-mm-ddThh:mm:ss.sssZ`. */
export const ISO_TIME_BYTES = 24;
/** Full buffers out with the sink at most (4 MiB each by default). */
const MAX_BUFFERS_IN_FLIGHT = 4;

/**
 * Where finished bytes go (a file, memory, a response). A sink that returns a promise may keep the
 * bytes until it settles, and may be handed further buffers before it does: it must put them out
 * in the order given. One that returns nothing must have consumed or copied them.
 */
export interface ByteSink {
  writeBytes(bytes: Uint8Array): void | Promise<void>;
}

/**
 * CSV rows straight into a byte buffer: numbers, ISO times and cells are written as ASCII digits
 * without building strings (putFixedAt, IsoTimeBytes, putBytes into `bytes` / `view` after
 * `reserve`), so a million-row output makes no garbage. Full buffers go to `sink` (each is reused
 * once the sink is done with it).
 */
export class CsvByteWriter {
  private buf: Uint8Array;
  /** The same bytes as `buf`, for the 32-bit stores of putFixedAt and IsoTimeBytes. */
  private bufView: DataView;
  /** Buffers free for reuse (their writes settled). */
  private readonly spare: Uint8Array[] = [];
  /** End of the bytes written so far in the current buffer (see `reserve`). */
  pos = 0;
  /** Buffers handed to the sink whose promise has not been awaited yet, oldest first. */
  private readonly inFlight: { buf: Uint8Array; done: Promise<void> }[] = [];
  private readonly textCache = new Map<string, Uint8Array>();
  private lastText = "";
  private lastBytes: Uint8Array = new Uint8Array(0);

  /**
   * `sink` receives full buffers in order. A sink that returns a promise may keep the bytes until
   * it settles: call `handOff()` when `nearlyFull` (a few buffers may be out at once, so writing
   * overlaps formatting) and `finish()` at the end.
   */
  constructor(private readonly sink: (bytes: Uint8Array) => void | Promise<void>, private readonly capacity = 1 << 22) {
    this.buf = new Uint8Array(capacity);
    this.bufView = new DataView(this.buf.buffer);
  }

  /**
   * Room for n more bytes, to be written from `pos` into `bytes` / `view` (with putFixedAt,
   * IsoTimeBytes, putBytes), after which the caller sets `pos` to the new end: a row written this
   * way keeps its position in a local variable, much faster than a call per cell. Grows the buffer
   * when needed (never writes, so the order stays with handOff).
   */
  reserve(n: number): void {
    if (this.pos + n > this.buf.length) {
      const bigger = new Uint8Array(Math.max(this.buf.length * 2, this.pos + n));
      bigger.set(this.buf.subarray(0, this.pos));
      this.useBuffer(bigger);
    }
  }

  private useBuffer(buf: Uint8Array): void {
    this.buf = buf;
    this.bufView = new DataView(buf.buffer, buf.byteOffset, buf.byteLength);
  }

  /** The current buffer (valid until the next reserve or handOff). */
  get bytes(): Uint8Array {
    return this.buf;
  }

  /** The current buffer as a DataView (valid until the next reserve or handOff). */
  get view(): DataView {
    return this.bufView;
  }

  /** True when less than 64 KiB is left: time to hand the buffer off. */
  get nearlyFull(): boolean {
    return this.pos > this.capacity - 65_536;
  }

  /**
   * Pass the filled part to the sink and continue in a free buffer. Up to MAX_BUFFERS_IN_FLIGHT
   * buffers may be out at once (so a slow write does not hold up formatting); beyond that, the
   * oldest is waited for first. A buffer is reused only after its write settled.
   */
  async handOff(): Promise<void> {
    if (this.pos === 0) return;
    const full = this.buf;
    const done = Promise.resolve(this.sink(full.subarray(0, this.pos)));
    done.catch(() => undefined); // awaited below or in finish(), where a failure is thrown
    this.inFlight.push({ buf: full, done });
    this.pos = 0;
    while (this.inFlight.length >= MAX_BUFFERS_IN_FLIGHT) await this.settleOldest();
    this.useBuffer(this.spare.pop() ?? new Uint8Array(this.capacity));
  }

  private async settleOldest(): Promise<void> {
    const oldest = this.inFlight.shift()!;
    try {
      await oldest.done;
    } catch (err) {
      // every other write ends before the failure is passed on, so none is still running when the
      // caller closes or removes what the sink writes to
      await Promise.allSettled(this.inFlight.splice(0).map((w) => w.done));
      throw err;
    }
    if (oldest.buf.length === this.capacity) this.spare.push(oldest.buf); // a grown buffer is dropped
  }

  /** Hand off what is left and wait for every write. */
  async finish(): Promise<void> {
    await this.handOff();
    while (this.inFlight.length > 0) await this.settleOldest();
  }

  byte(c: number): void {
    this.reserve(1);
    this.buf[this.pos++] = c;
  }

  /** Text written as is (UTF-8), e.g. a header row. */
  text(text: string): void {
    const bytes = UTF8.encode(text);
    this.reserve(bytes.length);
    this.buf.set(bytes, this.pos);
    this.pos += bytes.length;
  }

  /** The UTF-8 bytes of a text cell, CSV-quoted when needed (cached: a survey line repeats for thousands of rows). */
  cellBytes(text: string): Uint8Array {
    if (text === this.lastText) return this.lastBytes;
    let bytes = this.textCache.get(text);
    if (bytes === undefined) {
      bytes = encodeCell(text);
      if (this.textCache.size < 100_000) this.textCache.set(text, bytes);
    }
    this.lastText = text;
    this.lastBytes = bytes;
    return bytes;
  }
}

/** The UTF-8 bytes of one CSV cell, quoted when it needs to be. */
export function encodeCell(text: string): Uint8Array {
  return UTF8.encode(csvCell(text));
}

/**
 * ASCII digit groups as little-endian 32-bit words: FOUR_DIGITS[n] holds n (0–9999) as four digits
 * with leading zeros, first digit in the lowest byte, so one 4-byte store writes four digits, and
 * the word shifted right by 8·k writes its last 4 − k digits (the k high bytes, now 0, are written
 * past the end and overwritten by whatever comes next).
 */
const FOUR_DIGITS = (() => {
  const t = new Uint32Array(10_000);
  for (let n = 0; n < 10_000; n++) {
    const d0 = Math.floor(n / 1000), d1 = Math.floor(n / 100) % 10, d2 = Math.floor(n / 10) % 10, d3 = n % 10;
    t[n] = (C_ZERO + d0) | ((C_ZERO + d1) << 8) | ((C_ZERO + d2) << 16) | ((C_ZERO + d3) << 24);
  }
  return t;
})();

/** Digits of 0 ≤ n < 10 000 without leading zeros. */
function digitsBelow10k(n: number): number {
  return n < 10 ? 1 : n < 100 ? 2 : n < 1000 ? 3 : 4;
}

/** The last `count` (1–4) digits of the four-digit group n at p; returns the new end. */
function putDigitGroup(view: DataView, p: number, n: number, count: number): number {
  view.setUint32(p, FOUR_DIGITS[n] >>> ((4 - count) << 3), true);
  return p + count;
}

/** 0 ≤ n < 2^31 without leading zeros at p; returns the new end. */
function putUnsigned(view: DataView, p: number, n: number): number {
  if (n < 10_000) return putDigitGroup(view, p, n, digitsBelow10k(n));
  if (n < 100_000_000) {
    const high = (n / 10_000) | 0;
    p = putDigitGroup(view, p, high, digitsBelow10k(high));
    return putDigitGroup(view, p, n - high * 10_000, 4);
  }
  const high = (n / 100_000_000) | 0;
  const rest = n - high * 100_000_000;
  const middle = (rest / 10_000) | 0;
  p = putDigitGroup(view, p, high, digitsBelow10k(high));
  p = putDigitGroup(view, p, middle, 4);
  return putDigitGroup(view, p, rest - middle * 10_000, 4);
}

/**
 * Writes values[index] at p with exactly 3 digits after the point (nT, metres) and returns the new
 * end; NaN writes nothing. The caller has made room for MAX_FIXED_BYTES from p (this includes three
 * bytes past the end that digit-group stores may touch). Rounding as createFixedFormatter: x·1000
 * rounded half away from zero in binary arithmetic; magnitudes whose scaled value passes the 32-bit
 * range go through Number#toFixed (rare, exact).
 * The value is read from its column here rather than passed in: a double passed to a call that is
 * not inlined is boxed, an allocation per cell (~10 % of the formatting time, measured). The scale
 * is a literal, one function per number of decimals, so that the divisions are by constants (a
 * multiply in optimised code): ~8 % faster than one function taking the decimals (measured).
 */
export function putFixed3At(view: DataView, p: number, values: Float64Array, index: number): number {
  const x = values[index];
  if (x !== x) return p;
  let negative = x < 0;
  const scaledFloat = (negative ? -x : x) * 1000;
  if (!(scaledFloat < INT32_LIMIT)) return putAscii(view, p, x.toFixed(3));
  // Math.round(scaledFloat) for a value ≥ 0, as int32 (several times faster in V8, and the digit
  // groups below then divide as integers): the fraction scaledFloat − v is exact below 2^31
  let v = scaledFloat | 0;
  if (scaledFloat - v >= 0.5) v++;
  if (v === 0) negative = false;
  if (negative) view.setUint8(p++, C_MINUS);
  const whole = (v / 1000) | 0;
  p = putUnsigned(view, p, whole);
  view.setUint32(p, pointAndThreeDigits(v - whole * 1000), true);
  return p + 4;
}

/** As putFixed3At with 7 digits after the point (degrees: ~1 cm). */
export function putFixed7At(view: DataView, p: number, values: Float64Array, index: number): number {
  const x = values[index];
  if (x !== x) return p;
  let negative = x < 0;
  const scaledFloat = (negative ? -x : x) * 10_000_000;
  if (!(scaledFloat < INT32_LIMIT)) return putAscii(view, p, x.toFixed(7));
  let v = scaledFloat | 0;
  if (scaledFloat - v >= 0.5) v++;
  if (v === 0) negative = false;
  if (negative) view.setUint8(p++, C_MINUS);
  const whole = (v / 10_000_000) | 0;
  p = putUnsigned(view, p, whole);
  const fraction = v - whole * 10_000_000;
  const high = (fraction / 10_000) | 0;
  view.setUint32(p, pointAndThreeDigits(high), true);
  view.setUint32(p + 4, FOUR_DIGITS[fraction - high * 10_000], true);
  return p + 8;
}

/** `.ddd` of 0 ≤ n < 1000 as one little-endian word (the group's leading 0 replaced by the point). */
function pointAndThreeDigits(n: number): number {
  return (FOUR_DIGITS[n] & 0xffffff00) | C_DOT;
}

/** bytes copied into b at p (room made by the caller); returns the new end. */
export function putBytes(b: Uint8Array, p: number, bytes: Uint8Array): number {
  const n = bytes.length;
  if (n < 16) for (let i = 0; i < n; i++) b[p + i] = bytes[i];
  else b.set(bytes, p);
  return p + n;
}

/** ASCII text (no character above U+007F) at p; returns the new end. */
function putAscii(view: DataView, p: number, ascii: string): number {
  for (let i = 0; i < ascii.length; i++) view.setUint8(p++, ascii.charCodeAt(i));
  return p;
}

/** Three digits of ms and `Z` as one little-endian word, per ms 0–999. */
const MS_AND_Z = (() => {
  const t = new Uint32Array(1000);
  for (let ms = 0; ms < 1000; ms++) t[ms] = (FOUR_DIGITS[ms] >>> 8) | (90 << 24);
  return t;
})();

/** `yyyy-mm-ddThh:mm:ss.sssZ` of UTC ms written into bytes; the part up to the second is cached. */
export class IsoTimeBytes {
  private dayCached = NaN;
  private readonly dayPrefix = new Uint8Array(11);
  private secondCached = NaN;
  private readonly secondPrefix = new Uint8Array(20);
  /** `yyyy-mm-ddThh:mm:ss.` of the cached second, as five little-endian words. */
  private readonly secondWords = new Uint32Array(5);

  /** Writes the time at p (room for ISO_TIME_BYTES) and returns the new end. */
  put(view: DataView, p: number, timeMs: number): number {
    const second = Math.floor(timeMs / 1000);
    if (second !== this.secondCached) this.cacheSecond(second);
    const words = this.secondWords;
    view.setUint32(p, words[0], true);
    view.setUint32(p + 4, words[1], true);
    view.setUint32(p + 8, words[2], true);
    view.setUint32(p + 12, words[3], true);
    view.setUint32(p + 16, words[4], true);
    view.setUint32(p + 20, MS_AND_Z[timeMs - second * 1000], true);
    return p + ISO_TIME_BYTES;
  }

  /** `yyyy-mm-ddThh:mm:ss.` of a whole UTC second. */
  private cacheSecond(second: number): void {
    this.secondCached = second;
    const timeMs = second * 1000;
    const day = Math.floor(timeMs / MS_PER_DAY);
    if (day !== this.dayCached) {
      this.dayCached = day;
      const iso = new Date(day * MS_PER_DAY).toISOString(); // ASCII
      for (let i = 0; i < 11; i++) this.dayPrefix[i] = iso.charCodeAt(i);
    }
    const b = this.secondPrefix;
    b.set(this.dayPrefix, 0);
    let rest = timeMs - day * MS_PER_DAY;
    const h = Math.floor(rest / 3_600_000);
    rest -= h * 3_600_000;
    const mi = Math.floor(rest / 60_000);
    rest -= mi * 60_000;
    const sec = Math.floor(rest / 1000);
    b[11] = C_ZERO + Math.floor(h / 10); b[12] = C_ZERO + (h % 10); b[13] = 58;
    b[14] = C_ZERO + Math.floor(mi / 10); b[15] = C_ZERO + (mi % 10); b[16] = 58;
    b[17] = C_ZERO + Math.floor(sec / 10); b[18] = C_ZERO + (sec % 10); b[19] = C_DOT;
    for (let k = 0; k < 5; k++) this.secondWords[k] = b[4 * k] | (b[4 * k + 1] << 8) | (b[4 * k + 2] << 16) | (b[4 * k + 3] << 24);
  }
}
