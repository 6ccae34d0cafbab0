/** Columnar readings of one log: parallel arrays, NaN where a row has no value. */
export interface LogReadings {
  count: number;
  /** UTC ms since the Unix epoch (after zone, clock offset and time basis). */
  timeMs: Float64Array;
  fieldNt: Float64Array;
  /** null when the log has no such column. */
  latDeg: Float64Array | null;
  lonDeg: Float64Array | null;
  heightM: Float64Array | null;
  line: string[] | null;
  station: string[] | null;
  /** 1-based line of the file each reading came from. */
  sourceLine: Uint32Array;
}

export interface ColumnPresence {
  position: boolean;
  height: boolean;
  line: boolean;
  station: boolean;
}

function grow(a: Float64Array, n: number): Float64Array {
  const b = new Float64Array(n);
  b.set(a);
  return b;
}

/** Slots of the numbers of one reading in the array given to pushRow. */
export const ROW_TIME = 0;
export const ROW_FIELD = 1;
export const ROW_LAT = 2;
export const ROW_LON = 3;
export const ROW_HEIGHT = 4;

/** `values[0, count)` in a new array of `n` entries (the rest ""). */
function roomFor(values: string[], count: number, n: number): string[] {
  const out = new Array<string>(n).fill("");
  for (let i = 0; i < count; i++) out[i] = values[i];
  return out;
}

/** Append-only builder with doubling typed arrays. */
export class ReadingColumnsBuilder {
  count = 0;
  private capacity: number;
  /** Room was set by reserve() (a hint), not by doubling. */
  private reserved = false;
  private readonly scratch = new Float64Array(5);
  timeMs: Float64Array;
  fieldNt: Float64Array;
  latDeg: Float64Array | null;
  lonDeg: Float64Array | null;
  heightM: Float64Array | null;
  line: string[] | null;
  station: string[] | null;
  sourceLine: Uint32Array;

  constructor(readonly presence: ColumnPresence, initialCapacity = 1024) {
    this.capacity = Math.max(16, initialCapacity);
    this.timeMs = new Float64Array(this.capacity);
    this.fieldNt = new Float64Array(this.capacity);
    this.latDeg = presence.position ? new Float64Array(this.capacity) : null;
    this.lonDeg = presence.position ? new Float64Array(this.capacity) : null;
    this.heightM = presence.height ? new Float64Array(this.capacity) : null;
    // holey from the start, as reserve()'s filled arrays are: one array shape, so code optimised
    // before a reserve is not thrown away after it
    this.line = presence.line ? new Array<string>(0) : null;
    this.station = presence.station ? new Array<string>(0) : null;
    this.sourceLine = new Uint32Array(this.capacity);
  }

  /** Make room for `capacity` readings in one step (a size hint: pushing past it still works). */
  reserve(capacity: number): void {
    if (capacity <= this.capacity) return;
    const n = Math.floor(capacity);
    this.resize(n);
    this.reserved = true;
    // text columns too: filling an array once is cheaper than growing it push by push
    if (this.line) this.line = roomFor(this.line, this.count, n);
    if (this.station) this.station = roomFor(this.station, this.count, n);
  }

  private ensure(): void {
    if (this.count < this.capacity) return;
    this.resize(this.capacity * 2);
  }

  private resize(n: number): void {
    this.timeMs = grow(this.timeMs, n);
    this.fieldNt = grow(this.fieldNt, n);
    if (this.latDeg) this.latDeg = grow(this.latDeg, n);
    if (this.lonDeg) this.lonDeg = grow(this.lonDeg, n);
    if (this.heightM) this.heightM = grow(this.heightM, n);
    const s = new Uint32Array(n);
    s.set(this.sourceLine);
    this.sourceLine = s;
    this.capacity = n;
  }

  push(timeMs: number, fieldNt: number, latDeg: number, lonDeg: number, heightM: number, line: string, station: string, sourceLine: number): void {
    const v = this.scratch;
    v[ROW_TIME] = timeMs;
    v[ROW_FIELD] = fieldNt;
    v[ROW_LAT] = latDeg;
    v[ROW_LON] = lonDeg;
    v[ROW_HEIGHT] = heightM;
    this.pushRow(v, line, station, sourceLine);
  }

  /**
   * One reading whose numbers are in `values` at ROW_TIME … ROW_HEIGHT: the same as push, without
   * passing five doubles (each boxed on the heap when the call is not inlined).
   */
  pushRow(values: Float64Array, line: string, station: string, sourceLine: number): void {
    this.ensure();
    const i = this.count++;
    this.timeMs[i] = values[ROW_TIME];
    this.fieldNt[i] = values[ROW_FIELD];
    if (this.latDeg) this.latDeg[i] = values[ROW_LAT];
    if (this.lonDeg) this.lonDeg[i] = values[ROW_LON];
    if (this.heightM) this.heightM[i] = values[ROW_HEIGHT];
    if (this.line) this.line[i] = line;
    if (this.station) this.station[i] = station;
    this.sourceLine[i] = sourceLine;
  }

  /**
   * Trimmed views of what was pushed; copies instead when a reserve() left over half the room unused
   * (a size hint that was too large), so the spare room is not kept alive by the result.
   */
  build(): LogReadings {
    const n = this.count;
    const copy = this.reserved && n < this.capacity / 2;
    if (this.line && this.line.length > n) this.line.length = n; // reserved room not used
    if (this.station && this.station.length > n) this.station.length = n;
    const trim = <T extends Float64Array | Uint32Array>(a: T): T => (copy ? (a.slice(0, n) as T) : (a.subarray(0, n) as T));
    return {
      count: n,
      timeMs: trim(this.timeMs),
      fieldNt: trim(this.fieldNt),
      latDeg: this.latDeg ? trim(this.latDeg) : null,
      lonDeg: this.lonDeg ? trim(this.lonDeg) : null,
      heightM: this.heightM ? trim(this.heightM) : null,
      line: this.line,
      station: this.station,
      sourceLine: trim(this.sourceLine),
    };
  }
}
