/** CSV rows written as bytes (pure: Uint8Array and TextEncoder only, no Node Buffer). */
import { csvCell, POW10 } from "./cells";

const UTF8 = new TextEncoder();
const MS_PER_DAY = 86_400_000;
const C_ZERO = 48;
const C_MINUS = 45;
const C_DOT = 46;
const INT32_LIMIT = 2_147_483_647;
/** "000" … "999" as ASCII bytes, three per number. */
const DIGITS3 = (() => {
  const t = new Uint8Array(3000);
  for (let i = 0; i < 1000; i++) {
    t[i * 3] = C_ZERO + Math.floor(i / 100);
    t[i * 3 + 1] = C_ZERO + (Math.floor(i / 10) % 10);
    t[i * 3 + 2] = C_ZERO + (i % 10);
  }
  return t;
})();

/**
 * Where finished bytes go (a file, memory, a response). A sink that returns a promise may keep the
 * bytes until it settles; one that returns nothing must have consumed or copied them.
 */
export interface ByteSink {
  writeBytes(bytes: Uint8Array): void | Promise<void>;
}

/**
 * CSV rows straight into a byte buffer: numbers, ISO times and cells are written as ASCII digits
 * without building strings, so a million-row output makes no garbage. Full buffers go to `sink`
 * (the buffer is reused once the sink is done with it).
 * Numbers: same rounding as createFixedFormatter; NaN writes nothing (an empty cell).
 */
export class CsvByteWriter {
  private buf: Uint8Array;
  private spare: Uint8Array;
  private pos = 0;
  private inFlight: Promise<void> = Promise.resolve();
  private dayCached = NaN;
  private dayPrefix = new Uint8Array(11);
  private secondCached = NaN;
  private readonly secondPrefix = new Uint8Array(20);
  private readonly textCache = new Map<string, Uint8Array>();
  private lastText = "";
  private lastBytes: Uint8Array | undefined = new Uint8Array(0);

  /**
   * `sink` receives full buffers in order. A sink that returns a promise may keep the bytes until
   * it settles: call `handOff()` when `nearlyFull` (double buffering, so writing overlaps
   * formatting) and `finish()` at the end.
   */
  constructor(private readonly sink: (bytes: Uint8Array) => void | Promise<void>, private readonly capacity = 1 << 22) {
    this.buf = new Uint8Array(capacity);
    this.spare = new Uint8Array(capacity);
  }

  /** Make room for n more bytes by growing the buffer (never writes, so order stays with handOff). */
  private room(n: number): void {
    if (this.pos + n > this.buf.length) {
      const bigger = new Uint8Array(Math.max(this.buf.length * 2, this.pos + n));
      bigger.set(this.buf.subarray(0, this.pos));
      this.buf = bigger;
    }
  }

  /** True when less than 64 KiB is left: time to hand the buffer off. */
  get nearlyFull(): boolean {
    return this.pos > this.capacity - 65_536;
  }

  /** Pass the filled part to the sink and continue in the other buffer once its previous write is done. */
  async handOff(): Promise<void> {
    if (this.pos === 0) return;
    const full = this.buf.subarray(0, this.pos);
    const previous = this.inFlight;
    await previous;
    this.inFlight = Promise.resolve(this.sink(full));
    const next = this.spare;
    this.spare = this.buf.length === this.capacity ? this.buf : new Uint8Array(this.capacity);
    // the buffer just handed off is reused only after its write settles (awaited at the next handOff)
    this.buf = next;
    this.pos = 0;
  }

  /** Hand off what is left and wait for every write. */
  async finish(): Promise<void> {
    await this.handOff();
    await this.inFlight;
  }

  byte(c: number): void {
    this.room(1);
    this.buf[this.pos++] = c;
  }

  /** Text written as is (UTF-8), e.g. a header row. */
  text(text: string): void {
    const bytes = UTF8.encode(text);
    this.room(bytes.length);
    this.buf.set(bytes, this.pos);
    this.pos += bytes.length;
  }

  /** A text cell, CSV-quoted when needed; encodings of repeated texts are cached. */
  cell(text: string): void {
    let bytes = text === this.lastText ? this.lastBytes : this.textCache.get(text);
    this.lastText = text;
    if (bytes === undefined) {
      bytes = UTF8.encode(csvCell(text));
      if (this.textCache.size < 100_000) this.textCache.set(text, bytes);
    }
    this.lastBytes = bytes;
    this.room(bytes.length);
    this.buf.set(bytes, this.pos);
    this.pos += bytes.length;
  }

  /** Fixed-point number with `decimals` digits after the point (0–9); NaN writes nothing. */
  fixed(x: number, decimals: number): void {
    if (x !== x) return;
    let negative = x < 0;
    const ax = negative ? -x : x;
    const scaledFloat = ax * POW10[decimals];
    if (!(scaledFloat < INT32_LIMIT)) {
      this.cell(x.toFixed(decimals)); // large magnitudes and ±Infinity: rare, exact
      return;
    }
    const v = Math.round(scaledFloat);
    if (v === 0) negative = false;
    const scale = POW10[decimals];
    const whole = (v / scale) | 0;
    let frac = v - whole * scale;
    const wholeDigits =
      whole < 10 ? 1 : whole < 100 ? 2 : whole < 1e3 ? 3 : whole < 1e4 ? 4 : whole < 1e5 ? 5 : whole < 1e6 ? 6 : whole < 1e7 ? 7 : whole < 1e8 ? 8 : whole < 1e9 ? 9 : 10;
    const total = (negative ? 1 : 0) + wholeDigits + (decimals > 0 ? decimals + 1 : 0);
    this.room(total);
    const b = this.buf;
    let p = this.pos + total;
    // fraction: exactly `decimals` digits, three per division step, from the right
    let d = decimals;
    while (d >= 3) {
      const q = (frac / 1000) | 0;
      const r = (frac - q * 1000) * 3;
      b[--p] = DIGITS3[r + 2];
      b[--p] = DIGITS3[r + 1];
      b[--p] = DIGITS3[r];
      frac = q;
      d -= 3;
    }
    if (d > 0) {
      const r = frac * 3; // frac < 100 here
      b[--p] = DIGITS3[r + 2];
      if (d === 2) b[--p] = DIGITS3[r + 1];
    }
    if (decimals > 0) b[--p] = C_DOT;
    // whole part: wholeDigits digits
    let w = whole;
    let left = wholeDigits;
    while (left >= 3) {
      const q = (w / 1000) | 0;
      const r = (w - q * 1000) * 3;
      b[--p] = DIGITS3[r + 2];
      b[--p] = DIGITS3[r + 1];
      b[--p] = DIGITS3[r];
      w = q;
      left -= 3;
    }
    if (left > 0) {
      const r = w * 3;
      b[--p] = DIGITS3[r + 2];
      if (left === 2) b[--p] = DIGITS3[r + 1];
    }
    if (negative) b[--p] = C_MINUS;
    this.pos += total;
  }

  /** UTC ms as `yyyy-mm-ddThh:mm:ss.sssZ` (years 0–9999); the part up to the second is cached. */
  isoTime(timeMs: number): void {
    this.room(24);
    const b = this.buf;
    const second = Math.floor(timeMs / 1000);
    const ms = timeMs - second * 1000;
    if (second !== this.secondCached) this.cacheSecond(second);
    const prefix = this.secondPrefix;
    let p = this.pos;
    for (let i = 0; i < 20; i++) b[p++] = prefix[i];
    b[p++] = C_ZERO + Math.floor(ms / 100);
    b[p++] = C_ZERO + (Math.floor(ms / 10) % 10);
    b[p++] = C_ZERO + (ms % 10);
    b[p++] = 90; // Z
    this.pos = p;
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
  }
}
