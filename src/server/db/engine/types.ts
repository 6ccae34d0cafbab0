/**
 * What differs between the two database engines, as one interface: the bulk paths (readings in
 * and out by the million), constraint errors and id sequences. Everything else in Fieldtide is
 * plain Knex query building and runs unchanged on both.
 */
export type EngineName = "sqlite" | "postgres";

/** One stored reading, in log_readings column order. Null for a value the reading lacks. */
export type ReadingRow = [
  timeMs: number,
  fieldNt: number,
  latitudeDeg: number | null,
  longitudeDeg: number | null,
  heightM: number | null,
  line: string | null,
  station: string | null,
  sourceLine: number,
];

/** Streams readings of one log into log_readings inside the caller's transaction. */
export interface ReadingsWriter {
  /** Queues one reading; SQLite writes groups of rows at once, PostgreSQL buffers COPY data. */
  add(
    timeMs: number,
    fieldNt: number,
    latitudeDeg: number | null,
    longitudeDeg: number | null,
    heightM: number | null,
    line: string | null,
    station: string | null,
    sourceLine: number,
    localDay: number,
  ): void;
  /** Writes everything queued so far (and waits while the server catches up). */
  flush(): Promise<void>;
  /** Ends the bulk write; every reading added is in the table (inside the transaction) when it resolves. */
  finish(): Promise<void>;
  /** Abandons the bulk write after an error; the caller's transaction is rolled back next. */
  abort(reason: Error): Promise<void>;
}
