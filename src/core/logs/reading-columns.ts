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

/** Append-only builder with doubling typed arrays. */
export class ReadingColumnsBuilder {
  count = 0;
  private capacity: number;
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
    this.line = presence.line ? [] : null;
    this.station = presence.station ? [] : null;
    this.sourceLine = new Uint32Array(this.capacity);
  }

  private ensure(): void {
    if (this.count < this.capacity) return;
    const n = this.capacity * 2;
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
    this.ensure();
    const i = this.count++;
    this.timeMs[i] = timeMs;
    this.fieldNt[i] = fieldNt;
    if (this.latDeg) this.latDeg[i] = latDeg;
    if (this.lonDeg) this.lonDeg[i] = lonDeg;
    if (this.heightM) this.heightM[i] = heightM;
    if (this.line) this.line.push(line);
    if (this.station) this.station.push(station);
    this.sourceLine[i] = sourceLine;
  }

  /** Trimmed views of what was pushed. */
  build(): LogReadings {
    const n = this.count;
    return {
      count: n,
      timeMs: this.timeMs.subarray(0, n),
      fieldNt: this.fieldNt.subarray(0, n),
      latDeg: this.latDeg ? this.latDeg.subarray(0, n) : null,
      lonDeg: this.lonDeg ? this.lonDeg.subarray(0, n) : null,
      heightM: this.heightM ? this.heightM.subarray(0, n) : null,
      line: this.line,
      station: this.station,
      sourceLine: this.sourceLine.subarray(0, n),
    };
  }
}
