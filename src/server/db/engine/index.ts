/**
 * The engine adapter: the one module with engine-specific SQL. Callers pass their Knex (or a
 * transaction) and get the engine's fast path; everything else in Fieldtide is plain Knex.
 */
import fs from "node:fs";
import type { Knex } from "knex";
import type { DatabaseConfig } from "../../env";
import { createDb } from "../create-db";
import { dropPostgresTables, isPostgresUniqueViolation, openPostgresReadingsWriter, postgresTransactionLock, selectPostgresReadingRows, selectPostgresTimeField } from "./postgres";
import { isSqliteUniqueViolation, openSqliteReadingsWriter, selectSqliteReadingRows, selectSqliteTimeField } from "./sqlite";
import { engineOf } from "./engine-of";
import type { ReadingRow, ReadingsWriter } from "./types";

export { engineOf } from "./engine-of";

export type { EngineName, ReadingRow, ReadingsWriter } from "./types";

/** Bulk insert of one log's readings inside `trx`: prepared multi-row inserts on SQLite, COPY on PostgreSQL. */
export function openReadingsWriter(trx: Knex.Transaction, logId: number): Promise<ReadingsWriter> {
  return engineOf(trx) === "postgres" ? openPostgresReadingsWriter(trx, logId) : openSqliteReadingsWriter(trx, logId);
}

/** A log's readings in file order as arrays, optionally only those of one local day (days since 1970-01-01). */
export function selectReadingRows(db: Knex, logId: number, localDay?: number): Promise<ReadingRow[]> {
  return engineOf(db) === "postgres" ? selectPostgresReadingRows(db, logId, localDay) : selectSqliteReadingRows(db, logId, localDay);
}

/** Time and field of a log's readings in time order into the given arrays (at most their length); returns how many. */
export function selectTimeField(db: Knex, logId: number, timeMs: Float64Array, fieldNt: Float64Array): Promise<number> {
  return engineOf(db) === "postgres" ? selectPostgresTimeField(db, logId, timeMs, fieldNt) : selectSqliteTimeField(db, logId, timeMs, fieldNt);
}

/** A unique or primary-key constraint refused the write. */
export function isUniqueViolation(err: unknown): boolean {
  return isSqliteUniqueViolation(err) || isPostgresUniqueViolation(err);
}

/**
 * Makes transactions that check then write the same thing (the next run number of a day, a log's
 * SHA-256 in a survey) take turns: the second waits for the first to commit, then sees its row.
 * SQLite needs nothing: its one connection runs one transaction at a time.
 */
export async function serializeOn(trx: Knex.Transaction, key: string): Promise<void> {
  if (engineOf(trx) === "postgres") await postgresTransactionLock(trx, key);
}

/** Where the database is, for messages: the SQLite file, or the PostgreSQL URL without its password. */
export function describeDatabase(config: DatabaseConfig): string {
  if (config.engine === "sqlite") return config.file;
  const u = new URL(config.url);
  if (u.password) u.password = "***";
  return u.toString();
}

/**
 * Empties the database for `npm run db:reset`: the SQLite file and its WAL/SHM side files are
 * deleted; on PostgreSQL every table of the current schema is dropped.
 */
export async function resetDatabase(config: DatabaseConfig): Promise<void> {
  if (config.engine === "sqlite") {
    for (const suffix of ["", "-wal", "-shm"]) fs.rmSync(config.file + suffix, { force: true });
    return;
  }
  const db = createDb(config);
  try {
    await dropPostgresTables(db);
  } finally {
    await db.destroy();
  }
}
