/**
 * Fast CSV cell formatting for large outputs, and an atomic file writer (no partial writes).
 * Node only.
 */
import fs from "node:fs";

const POW10 = [1, 10, 100, 1000, 10_000, 100_000, 1_000_000, 10_000_000, 100_000_000, 1_000_000_000];

/**
 * `x` with exactly `decimals` digits (0–9) after the point, "" for NaN. Rounds x·10^d half away
 * from zero in binary arithmetic, so a value lying exactly on a decimal tie may differ from
 * Number#toFixed in the last digit; magnitudes beyond 2^53 / 10^d fall back to toFixed.
 */
export function createFixedFormatter(decimals: number): (x: number) => string {
  if (!Number.isInteger(decimals) || decimals < 0 || decimals >= POW10.length) throw new RangeError("decimals must be 0–9");
  const scale = POW10[decimals];
  const limit = Number.MAX_SAFE_INTEGER / scale;
  const zeros = "0".repeat(decimals);
  return (x: number): string => {
    if (x !== x) return "";
    const ax = x < 0 ? -x : x;
    if (ax >= limit) return x.toFixed(decimals);
    const scaled = Math.round(ax * scale);
    if (decimals === 0) return (x < 0 && scaled !== 0 ? "-" : "") + scaled;
    const whole = Math.floor(scaled / scale);
    const frac = scaled - whole * scale;
    const fracText = String(frac);
    const sign = x < 0 && scaled !== 0 ? "-" : "";
    return sign + whole + "." + (fracText.length < decimals ? zeros.slice(fracText.length) + fracText : fracText);
  };
}

/** RFC 4180 quoting of one text cell when it holds a comma, quote or line break. */
export function csvCell(text: string): string {
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/**
 * Write a file atomically: chunks go to a temporary file beside the target, renamed into place on
 * `commit()`; `abort()` removes it. Nothing appears at the target unless the whole write succeeds.
 */
export class AtomicFileWriter {
  private readonly temporary: string;
  private fd: number | null;
  private pending: string[] = [];
  private pendingChars = 0;

  constructor(private readonly target: string, private readonly flushChars = 1 << 20) {
    this.temporary = `${target}.${process.pid}.tmp`;
    this.fd = fs.openSync(this.temporary, "w");
  }

  /** Raw bytes, written in order after any pending text. */
  writeBytes(bytes: Uint8Array): void {
    this.flush();
    if (this.fd !== null) fs.writeSync(this.fd, bytes);
  }

  /** Raw bytes written by the thread pool; the caller keeps `bytes` untouched until it settles. */
  writeBytesAsync(bytes: Uint8Array): Promise<void> {
    this.flush();
    const fd = this.fd;
    if (fd === null) return Promise.reject(new Error("writer already closed"));
    return new Promise((resolve, reject) => {
      const step = (offset: number) =>
        fs.write(fd, bytes, offset, bytes.length - offset, null, (err, written) => {
          if (err) reject(err);
          else if (offset + written < bytes.length) step(offset + written);
          else resolve();
        });
      step(0);
    });
  }

  write(text: string): void {
    this.pending.push(text);
    this.pendingChars += text.length;
    if (this.pendingChars >= this.flushChars) this.flush();
  }

  private flush(): void {
    if (this.fd === null || this.pending.length === 0) return;
    fs.writeSync(this.fd, this.pending.join(""));
    this.pending = [];
    this.pendingChars = 0;
  }

  commit(): void {
    this.flush();
    if (this.fd !== null) fs.closeSync(this.fd);
    this.fd = null;
    fs.renameSync(this.temporary, this.target);
  }

  abort(): void {
    if (this.fd !== null) fs.closeSync(this.fd);
    this.fd = null;
    fs.rmSync(this.temporary, { force: true });
  }
}

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
 * CSV rows straight into a byte buffer: numbers, ISO times and cells are written as ASCII digits
 * without building strings, so a million-row output makes no garbage. Full buffers go to `sink`
 * (which must consume the bytes before returning; the buffer is reused).
 * Numbers: same rounding as createFixedFormatter; NaN writes nothing (an empty cell).
 */
export class CsvByteWriter {
  private buf: Buffer;
  private spare: Buffer;
  private pos = 0;
  private inFlight: Promise<void> = Promise.resolve();
  private dayCached = NaN;
  private dayPrefix = Buffer.alloc(11);
  private secondCached = NaN;
  private readonly secondPrefix = new Uint8Array(20);
  private readonly textCache = new Map<string, Buffer>();
  private lastText = "";
  private lastBytes: Buffer | undefined = Buffer.alloc(0);

  /**
   * `sink` receives full buffers in order. A sink that returns a promise may keep the bytes until
   * it settles: call `handOff()` when `nearlyFull` (double buffering, so writing overlaps
   * formatting) and `finish()` at the end.
   */
  constructor(private readonly sink: (bytes: Uint8Array) => void | Promise<void>, private readonly capacity = 1 << 22) {
    this.buf = Buffer.allocUnsafe(capacity);
    this.spare = Buffer.allocUnsafe(capacity);
  }

  /** Make room for n more bytes by growing the buffer (never writes, so order stays with handOff). */
  private room(n: number): void {
    if (this.pos + n > this.buf.length) {
      const bigger = Buffer.allocUnsafe(Math.max(this.buf.length * 2, this.pos + n));
      this.buf.copy(bigger, 0, 0, this.pos);
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
    this.spare = this.buf.length === this.capacity ? this.buf : Buffer.allocUnsafe(this.capacity);
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
    const bytes = Buffer.from(text, "utf8");
    this.room(bytes.length);
    this.buf.set(bytes, this.pos);
    this.pos += bytes.length;
  }

  /** A text cell, CSV-quoted when needed; encodings of repeated texts are cached. */
  cell(text: string): void {
    let bytes = text === this.lastText ? this.lastBytes : this.textCache.get(text);
    this.lastText = text;
    if (bytes === undefined) {
      bytes = Buffer.from(csvCell(text), "utf8");
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
      this.dayPrefix = Buffer.from(new Date(day * MS_PER_DAY).toISOString().slice(0, 11), "latin1");
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
