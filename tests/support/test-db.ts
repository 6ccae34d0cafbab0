/**
 * Per-test-file database: a fresh SQLite file in a temp folder, migrations run.
 * Call setupTestDatabase() at the top of a test file, BEFORE anything reads the environment.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll } from "vitest";

export type TestDatabase = { dir: string; file: string };

export function setupTestDatabase(extraEnv: Record<string, string> = {}): TestDatabase {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "fieldtide-test-"));
  const file = path.join(dir, "test.sqlite");
  process.env.DATABASE_FILE = file;
  process.env.APP_URL ??= "http://localhost:3000";
  for (const [k, v] of Object.entries(extraEnv)) process.env[k] = v;

  beforeAll(async () => {
    const { getDb } = await import("@/src/server/db/client");
    const { migrateToLatest } = await import("@/src/server/db/migration-source");
    await migrateToLatest(getDb());
  });
  afterAll(async () => {
    const { closeDb } = await import("@/src/server/db/client");
    await closeDb();
    fs.rmSync(dir, { recursive: true, force: true });
  });
  return { dir, file };
}
