/**
 * A run's per-reading results as typed-array columns, stored one BLOB per column. Float64 keeps
 * every value exactly as the core computed it (exports format from these). Node only.
 */
export type ColumnDtype = "f64" | "i32" | "u8";

export interface RunColumns {
  count: number;
  timeMs: Float64Array;
  rawNt: Float64Array;
  latDeg: Float64Array;
  lonDeg: Float64Array;
  heightM: Float64Array;
  baseNt: Float64Array;
  diurnalNt: Float64Array;
  correctedNt: Float64Array;
  referenceNt: Float64Array;
  residualNt: Float64Array;
  flags: Uint8Array;
  logId: Int32Array;
  sourceLine: Int32Array;
  /** Index into RunDictionaries.lines / stations. */
  lineCode: Int32Array;
  stationCode: Int32Array;
}

export interface RunDictionaries {
  lines: string[];
  stations: string[];
  /** Which optional input columns existed (exports leave absent ones empty, as the CLI does). */
  hasPosition: boolean;
  hasHeight: boolean;
  hasLine: boolean;
  hasStation: boolean;
}

export const COLUMN_DTYPES: Record<Exclude<keyof RunColumns, "count">, ColumnDtype> = {
  timeMs: "f64", rawNt: "f64", latDeg: "f64", lonDeg: "f64", heightM: "f64", baseNt: "f64", diurnalNt: "f64", correctedNt: "f64",
  referenceNt: "f64", residualNt: "f64", flags: "u8", logId: "i32", sourceLine: "i32", lineCode: "i32", stationCode: "i32",
};

export function encodeColumn(a: Float64Array | Int32Array | Uint8Array): Buffer {
  return Buffer.from(a.buffer, a.byteOffset, a.byteLength);
}

export function decodeColumn(dtype: ColumnDtype, data: Buffer): Float64Array | Int32Array | Uint8Array {
  // Copy into a fresh, aligned buffer (SQLite hands back arbitrary offsets).
  const copy = new ArrayBuffer(data.byteLength);
  new Uint8Array(copy).set(data);
  if (dtype === "f64") return new Float64Array(copy);
  if (dtype === "i32") return new Int32Array(copy);
  return new Uint8Array(copy);
}

/** Dictionary-code a text column. */
export function codeStrings(values: readonly string[] | null, n: number): { codes: Int32Array; dictionary: string[] } {
  const codes = new Int32Array(n);
  const dictionary: string[] = [""];
  if (!values) return { codes, dictionary };
  const index = new Map<string, number>([["", 0]]);
  for (let i = 0; i < n; i++) {
    const v = values[i] ?? "";
    let c = index.get(v);
    if (c === undefined) {
      c = dictionary.length;
      dictionary.push(v);
      index.set(v, c);
    }
    codes[i] = c;
  }
  return { codes, dictionary };
}
