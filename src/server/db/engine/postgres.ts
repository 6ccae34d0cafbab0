/**
 * PostgreSQL (node-postgres) side of the engine adapter. Readings go in through COPY … FROM
 * STDIN (text format) on the transaction's own connection, and come out as arrays
 * (rowMode "array"), never as row objects.
 */
import { once } from "node:events";
import type { Knex } from "knex";
import type { PoolClient as PgClient } from "pg";
import { from as copyFrom } from "pg-copy-streams";
import type { ReadingRow, ReadingsWriter } from "./types";

type KnexPool = { acquireConnection(): Promise<PgClient>; releaseConnection(c: PgClient): Promise<unknown> };

async function withConnection<T>(db: Knex, fn: (conn: PgClient) => Promise<T>): Promise<T> {
  const client = db.client as unknown as KnexPool;
  const conn = await client.acquireConnection();
  try {
    return await fn(conn);
  } finally {
    await client.releaseConnection(conn);
  }
}

/** PostgreSQL's unique_violation SQLSTATE. */
const PG_UNIQUE_VIOLATION = "23505";
/** COPY data is handed to the socket in pieces of about this size. */
const COPY_CHUNK_CHARS = 1 << 20;

/** A text value in COPY's text format: backslash, tab, newline and carriage return escaped. */
function copyText(value: string): string {
  return /[\\\t\n\r]/.test(value) ? value.replace(/[\\\t\n\r]/g, (c) => (c === "\\" ? "\\\\" : c === "\t" ? "\\t" : c === "\n" ? "\\n" : "\\r")) : value;
}

const copyNumber = (v: number | null) => (v === null ? "\\N" : String(v));

const quoteIdent = (name: string) => `"${name.replace(/"/g, '""')}"`;

/** One COPY … FROM STDIN on the transaction's own connection, fed text in COPY's text format. */
interface CopyIn {
  /** Sends rows (lines ending in \n); waits while the socket is full. Rejects once the COPY has failed. */
  write(text: string): Promise<void>;
  /** Ends the COPY; resolves when the server has taken every row. */
  end(): Promise<void>;
  /** Abandons the COPY (CopyFail); the caller's transaction is rolled back next. */
  abort(reason: Error): Promise<void>;
}

async function openCopyIn(trx: Knex.Transaction, table: string, columns: readonly string[]): Promise<CopyIn> {
  // A transaction's client hands out the transaction's own connection, so COPY is part of it.
  const conn = await (trx.client as unknown as KnexPool).acquireConnection();
  const stream = conn.query(copyFrom(`COPY ${quoteIdent(table)} (${columns.map(quoteIdent).join(", ")}) FROM STDIN`));
  let failure: Error | null = null;
  const failed = new Promise<never>((_, reject) => {
    stream.on("error", (err: Error) => {
      failure ??= err;
      reject(failure);
    });
  });
  failed.catch(() => undefined); // read through `failure` and the races below, never left unhandled
  return {
    async write(text) {
      if (failure) throw failure;
      if (!stream.write(text)) await Promise.race([once(stream, "drain"), failed]);
    },
    async end() {
      if (failure) throw failure;
      const finished = once(stream, "finish");
      stream.end();
      await Promise.race([finished, failed]);
    },
    async abort(reason) {
      // destroying a COPY FROM stream sends CopyFail: the server ends the COPY with an error
      if (!stream.destroyed) {
        const closed = once(stream, "close").catch(() => undefined);
        stream.destroy(reason);
        await closed;
      }
    },
  };
}

const READING_COPY_COLUMNS = ["log_id", "time_ms", "field_nt", "latitude_deg", "longitude_deg", "height_m", "line", "station", "source_line", "local_day"];

export async function openPostgresReadingsWriter(trx: Knex.Transaction, logId: number): Promise<ReadingsWriter> {
  const copy = await openCopyIn(trx, "log_readings", READING_COPY_COLUMNS);
  const prefix = `${logId}\t`;
  let pending = "";
  return {
    add(timeMs, fieldNt, latitudeDeg, longitudeDeg, heightM, line, station, sourceLine, localDay) {
      pending +=
        prefix +
        timeMs +
        "\t" +
        fieldNt +
        "\t" +
        copyNumber(latitudeDeg) +
        "\t" +
        copyNumber(longitudeDeg) +
        "\t" +
        copyNumber(heightM) +
        "\t" +
        (line === null ? "\\N" : copyText(line)) +
        "\t" +
        (station === null ? "\\N" : copyText(station)) +
        "\t" +
        sourceLine +
        "\t" +
        localDay +
        "\n";
    },
    async flush() {
      if (pending.length < COPY_CHUNK_CHARS) return;
      const text = pending;
      pending = "";
      await copy.write(text);
    },
    async finish() {
      if (pending.length > 0) await copy.write(pending);
      pending = "";
      await copy.end();
    },
    async abort(reason) {
      pending = "";
      await copy.abort(reason);
    },
  };
}

const SELECT_COLUMNS = "time_ms, field_nt, latitude_deg, longitude_deg, height_m, line, station, source_line";

/** Readings of a log in file order (source_line: the file's own line numbers), optionally of one local day. */
export function selectPostgresReadingRows(db: Knex, logId: number, localDay?: number): Promise<ReadingRow[]> {
  return withConnection(db, async (conn) => {
    const where = localDay === undefined ? "log_id = $1" : "log_id = $1 AND local_day = $2";
    const values = localDay === undefined ? [logId] : [logId, localDay];
    const r = await conn.query<ReadingRow>({ text: `SELECT ${SELECT_COLUMNS} FROM log_readings WHERE ${where} ORDER BY source_line`, values, rowMode: "array" });
    return r.rows;
  });
}

/** Time and field of a log's readings in time order, written into the given arrays; returns how many. */
export function selectPostgresTimeField(db: Knex, logId: number, timeMs: Float64Array, fieldNt: Float64Array): Promise<number> {
  return withConnection(db, async (conn) => {
    const r = await conn.query<[number, number]>({ text: "SELECT time_ms, field_nt FROM log_readings WHERE log_id = $1 ORDER BY time_ms", values: [logId], rowMode: "array" });
    const n = Math.min(r.rows.length, timeMs.length);
    for (let k = 0; k < n; k++) {
      timeMs[k] = r.rows[k][0];
      fieldNt[k] = r.rows[k][1];
    }
    return n;
  });
}

export function isPostgresUniqueViolation(err: unknown): boolean {
  return err instanceof Error && "code" in err && (err as { code?: string }).code === PG_UNIQUE_VIOLATION;
}

/**
 * After rows were copied in with their ids (the SQLite → PostgreSQL migration), moves each
 * table's serial `id` sequence past the largest id so new rows do not collide. Tables whose id
 * is not serial (text ids) are left alone.
 */
export async function resetPostgresSequences(db: Knex, tables: readonly string[]): Promise<void> {
  for (const table of tables) {
    const r = await db.raw("SELECT pg_get_serial_sequence(?, 'id') AS seq", [table]);
    const seq = (r.rows as { seq: string | null }[])[0]?.seq;
    if (seq) await db.raw("SELECT setval(?, COALESCE((SELECT MAX(id) FROM ??), 0) + 1, false)", [seq, table]);
  }
}

/** Holds a transaction-scoped advisory lock on `key` (released at COMMIT or ROLLBACK). */
export async function postgresTransactionLock(trx: Knex.Transaction, key: string): Promise<void> {
  await trx.raw("SELECT pg_advisory_xact_lock(hashtextextended(?, 0))", [key]);
}

/** Drops every table of the current schema (a development reset of the database). */
export async function dropPostgresTables(db: Knex): Promise<number> {
  const r = await db.raw("SELECT tablename FROM pg_tables WHERE schemaname = current_schema()");
  const names = (r.rows as { tablename: string }[]).map((t) => t.tablename);
  for (const name of names) await db.raw("DROP TABLE IF EXISTS ?? CASCADE", [name]);
  return names.length;
}

/** One value in COPY's text format: NULL as \\N, bytea in hex form, text escaped. */
function copyCell(value: unknown): string {
  if (value === null || value === undefined) return "\\N";
  if (typeof value === "number" || typeof value === "bigint") return String(value);
  if (Buffer.isBuffer(value)) return "\\\\x" + value.toString("hex");
  return copyText(String(value));
}

/** Inserts rows (values in `columns` order) into `table` with one COPY on the transaction's connection. */
export async function copyRowsIntoPostgres(trx: Knex.Transaction, table: string, columns: string[], rows: unknown[][]): Promise<void> {
  if (rows.length === 0) return;
  const copy = await openCopyIn(trx, table, columns);
  try {
    let text = "";
    for (const row of rows) {
      text += row.map(copyCell).join("\t") + "\n";
      if (text.length >= COPY_CHUNK_CHARS) {
        await copy.write(text);
        text = "";
      }
    }
    if (text.length > 0) await copy.write(text);
    await copy.end();
  } catch (err) {
    await copy.abort(err as Error);
    throw err;
  }
}
