/**
 * SQLite (better-sqlite3) side of the engine adapter. Knex holds ONE better-sqlite3
 * connection; the bulk paths use it directly with prepared statements (no row objects).
 */
import type Database from "better-sqlite3";
import type { Knex } from "knex";
import type { ReadingRow, ReadingsWriter } from "./types";

type PoolClient = { acquireConnection(): Promise<Database.Database>; releaseConnection(c: Database.Database): Promise<unknown> };

/** Runs `fn` with the raw better-sqlite3 connection behind Knex's pool (or a transaction's). */
async function withConnection<T>(db: Knex, fn: (conn: Database.Database) => T): Promise<T> {
  const client = db.client as unknown as PoolClient;
  const conn = await client.acquireConnection();
  try {
    return fn(conn);
  } finally {
    await client.releaseConnection(conn);
  }
}

const READING_COLUMNS = 10;
/** Rows per multi-row INSERT: fewer calls into SQLite per reading (640 parameters, far below SQLite's limit). */
const ROWS_PER_INSERT = 64;
const insertSql = (rows: number) =>
  "INSERT INTO log_readings (log_id, time_ms, field_nt, latitude_deg, longitude_deg, height_m, line, station, source_line, local_day) VALUES " +
  Array.from({ length: rows }, () => "(?, ?, ?, ?, ?, ?, ?, ?, ?, ?)").join(", ");

export async function openSqliteReadingsWriter(trx: Knex.Transaction, logId: number): Promise<ReadingsWriter> {
  // A transaction's client hands out the transaction's own connection: same transaction, prepared inserts.
  const conn = await (trx.client as unknown as PoolClient).acquireConnection();
  const insertOne = conn.prepare(insertSql(1));
  const insertMany = conn.prepare(insertSql(ROWS_PER_INSERT));
  const params: (number | string | null)[] = new Array(READING_COLUMNS * ROWS_PER_INSERT);
  let queued = 0;
  const flushLeftovers = () => {
    // rows left over go in one by one, so the table holds exactly what was added
    for (let k = 0; k < queued; k++) insertOne.run(params.slice(k * READING_COLUMNS, (k + 1) * READING_COLUMNS));
    queued = 0;
  };
  return {
    add(timeMs, fieldNt, latitudeDeg, longitudeDeg, heightM, line, station, sourceLine, localDay) {
      const at = queued * READING_COLUMNS;
      params[at] = logId;
      params[at + 1] = timeMs;
      params[at + 2] = fieldNt;
      params[at + 3] = latitudeDeg;
      params[at + 4] = longitudeDeg;
      params[at + 5] = heightM;
      params[at + 6] = line;
      params[at + 7] = station;
      params[at + 8] = sourceLine;
      params[at + 9] = localDay;
      if (++queued === ROWS_PER_INSERT) {
        insertMany.run(params);
        queued = 0;
      }
    },
    async flush() {
      flushLeftovers();
    },
    async finish() {
      flushLeftovers();
    },
    async abort() {
      queued = 0;
    },
  };
}

const SELECT_COLUMNS = "time_ms, field_nt, latitude_deg, longitude_deg, height_m, line, station, source_line";

/** Readings of a log in file order (insertion order = rowid), optionally of one local day. */
export function selectSqliteReadingRows(db: Knex, logId: number, localDay?: number): Promise<ReadingRow[]> {
  return withConnection(db, (conn) => {
    const where = localDay === undefined ? "log_id = ?" : "log_id = ? AND local_day = ?";
    const stmt = conn.prepare(`SELECT ${SELECT_COLUMNS} FROM log_readings WHERE ${where} ORDER BY rowid`).raw(true);
    return (localDay === undefined ? stmt.all(logId) : stmt.all(logId, localDay)) as ReadingRow[];
  });
}

/** Time and field of a log's readings in time order, written into the given arrays; returns how many. */
export function selectSqliteTimeField(db: Knex, logId: number, timeMs: Float64Array, fieldNt: Float64Array): Promise<number> {
  return withConnection(db, (conn) => {
    const stmt = conn.prepare("SELECT time_ms, field_nt FROM log_readings WHERE log_id = ? ORDER BY time_ms").raw(true);
    let k = 0;
    for (const r of stmt.iterate(logId) as IterableIterator<[number, number]>) {
      if (k >= timeMs.length) break;
      timeMs[k] = r[0];
      fieldNt[k] = r[1];
      k++;
    }
    return k;
  });
}

export function isSqliteUniqueViolation(err: unknown): boolean {
  return err instanceof Error && "code" in err && (err as { code?: string }).code === "SQLITE_CONSTRAINT_UNIQUE";
}
