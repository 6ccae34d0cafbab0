/**
 * The one Knex instance of the process, on the configured database (DATABASE_URL for
 * PostgreSQL, else the SQLite file DATABASE_FILE). Cached on globalThis so that Next's hot
 * reload in development does not open a new connection per reload.
 */
import type { Knex } from "knex";
import { getEnv } from "../env";
import { createDb } from "./create-db";

type Cached = { target: string; knex: Knex };
const globalForDb = globalThis as unknown as { __fieldtideDb?: Cached };

export function getDb(): Knex {
  const config = getEnv().database;
  const target = config.engine === "postgres" ? config.url : config.file;
  const cached = globalForDb.__fieldtideDb;
  if (cached && cached.target === target) return cached.knex;
  const knex = createDb(config);
  globalForDb.__fieldtideDb = { target, knex };
  return knex;
}

/** Closes the singleton (scripts and tests). */
export async function closeDb(): Promise<void> {
  const cached = globalForDb.__fieldtideDb;
  globalForDb.__fieldtideDb = undefined;
  if (cached) await cached.knex.destroy();
}
