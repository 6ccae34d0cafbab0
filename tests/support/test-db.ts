/**
 * Per-test-file database, migrations run: a fresh SQLite file in a temp folder, or, when
 * FIELDTIDE_TEST_PG_URL names a PostgreSQL server (an admin URL such as
 * postgres://postgres@127.0.0.1:55432/postgres, `npm run test:pg`), a fresh database on it,
 * dropped afterwards.
 * Call setupTestDatabase() at the top of a test file, BEFORE anything reads the environment.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll } from "vitest";
import { createPgDatabase, dropPgDatabase, newPgDatabaseName, pgDatabaseUrl } from "../../scripts/lib/pg-database";

export type TestDatabase = { dir: string; file: string; engine: "sqlite" | "postgres"; url: string | null };

/** The integration suite is running against PostgreSQL (`npm run test:pg`). */
export const TEST_ON_POSTGRES = Boolean(process.env.FIELDTIDE_TEST_PG_URL);

export function setupTestDatabase(extraEnv: Record<string, string> = {}): TestDatabase {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "fieldtide-test-"));
  const file = path.join(dir, "test.sqlite");
  const adminUrl = process.env.FIELDTIDE_TEST_PG_URL;
  const dbName = newPgDatabaseName("fieldtide_test");
  let url: string | null = null;
  if (adminUrl) {
    url = pgDatabaseUrl(adminUrl, dbName);
    process.env.DATABASE_URL = url;
  } else {
    delete process.env.DATABASE_URL;
  }
  process.env.DATABASE_FILE = file;
  process.env.APP_URL ??= "http://localhost:3000";
  for (const [k, v] of Object.entries(extraEnv)) process.env[k] = v;

  beforeAll(async () => {
    if (adminUrl) await createPgDatabase(adminUrl, dbName);
    const { getDb } = await import("@/src/server/db/client");
    const { migrateToLatest } = await import("@/src/server/db/migration-source");
    await migrateToLatest(getDb());
  });
  afterAll(async () => {
    const { closeDb } = await import("@/src/server/db/client");
    await closeDb();
    if (adminUrl) await dropPgDatabase(adminUrl, dbName);
    fs.rmSync(dir, { recursive: true, force: true });
  });
  return { dir, file, engine: adminUrl ? "postgres" : "sqlite", url };
}

/**
 * ORDER BY expression for "in the order the rows were inserted", for tests reading back a small
 * table that only ever had inserts: SQLite's rowid; on PostgreSQL the tuple position (ctid),
 * which follows insertion order in a fresh table with no updates or deletes.
 */
export const INSERTION_ORDER = TEST_ON_POSTGRES ? "ctid" : "rowid";
