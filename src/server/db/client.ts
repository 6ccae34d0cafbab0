/**
 * The one Knex instance of the process, on DATABASE_FILE. Cached on globalThis so that
 * Next's hot reload in development does not open a new connection per reload.
 */
import type { Knex } from "knex";
import { getEnv } from "../env";
import { createDb } from "./create-db";

type Cached = { file: string; knex: Knex };
const globalForDb = globalThis as unknown as { __fieldtideDb?: Cached };

export function getDb(): Knex {
  const file = getEnv().databaseFile;
  const cached = globalForDb.__fieldtideDb;
  if (cached && cached.file === file) return cached.knex;
  const knex = createDb(file);
  globalForDb.__fieldtideDb = { file, knex };
  return knex;
}

/** Closes the singleton (scripts and tests). */
export async function closeDb(): Promise<void> {
  const cached = globalForDb.__fieldtideDb;
  globalForDb.__fieldtideDb = undefined;
  if (cached) await cached.knex.destroy();
}
