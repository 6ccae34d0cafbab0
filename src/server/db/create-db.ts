/**
 * Knex over better-sqlite3 for one database file. The app uses the singleton in ./client.ts;
 * tests and scripts may call createDb(file) directly.
 *
 * No `server-only` import: the database scripts (tsx) load this module outside Next.
 */
import fs from "node:fs";
import path from "node:path";
import knexFactory, { type Knex } from "knex";
import { applyPragmas } from "./pragmas";

export function createDb(file: string): Knex {
  fs.mkdirSync(path.dirname(file), { recursive: true });
  return knexFactory({
    client: "better-sqlite3",
    connection: { filename: file },
    useNullAsDefault: true,
    pool: {
      // One writer: SQLite serialises writes anyway; knex's sqlite default is also 1.
      min: 1,
      max: 1,
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
