/**
 * A Knex instance for the configured engine: better-sqlite3 on one file (the embedded default)
 * or PostgreSQL through node-postgres when DATABASE_URL is set. The app uses the singleton in
 * ./client.ts; tests and scripts may call createDb() directly.
 *
 * No `server-only` import: the database scripts (tsx) load this module outside Next.
 */
import fs from "node:fs";
import path from "node:path";
import knexFactory, { type Knex } from "knex";
import pg from "pg";
import type { DatabaseConfig } from "../env";
import { applyPragmas } from "./pragmas";

/** PostgreSQL type oid of int8 (bigint): times in ms and COUNT(*) come back as int8. */
const PG_INT8_OID = 20;
/** Largest pool of PostgreSQL connections per app process (the server has max_connections). */
const PG_POOL_MAX = 10;

let pgParsersSet = false;

/**
 * node-postgres returns int8 as a string by default (it can exceed 2^53). Fieldtide's int8
 * columns hold Unix milliseconds and counts, far below 2^53, so they are read as numbers, as
 * SQLite returns them.
 */
function usePgNumberParsers(): void {
  if (pgParsersSet) return;
  pg.types.setTypeParser(PG_INT8_OID, (value: string) => Number(value));
  pgParsersSet = true;
}

export function createDb(config: DatabaseConfig | string): Knex {
  const c: DatabaseConfig = typeof config === "string" ? { engine: "sqlite", file: config } : config;
  if (c.engine === "postgres") {
    usePgNumberParsers();
    return knexFactory({ client: "pg", connection: c.url, pool: { min: 0, max: PG_POOL_MAX } });
  }
  fs.mkdirSync(path.dirname(c.file), { recursive: true });
  return knexFactory({
    client: "better-sqlite3",
    connection: { filename: c.file },
    useNullAsDefault: true,
    pool: {
      // One writer: SQLite serialises writes anyway; knex's sqlite default is also 1.
      min: 1,
      max: 1,
      // Knex leaves SQLite inside the transaction when COMMIT itself fails (a deferred constraint,
      // a full disk): the one connection would then carry every later write into a transaction
      // nobody commits. Whoever takes the connection next finds it rolled back first.
      validate(conn: { inTransaction: boolean; exec(sql: string): unknown }) {
        if (conn.inTransaction) conn.exec("ROLLBACK");
        return true;
      },
      afterCreate(conn: { pragma(s: string): unknown }, done: (err: Error | null, conn: unknown) => void) {
        try {
          applyPragmas(conn);
          done(null, conn);
        } catch (err) {
          done(err as Error, conn);
        }
      },
    },
  });
}
