/**
 * The SQLite → PostgreSQL move (`npm run db:to-postgres`), on the PostgreSQL run of the suite
 * only (`npm run test:pg`): the demo database, built by the same scripts as `npm run demo`, plus
 * a correction run's binary column and awkward text, lands with identical row counts and
 * checksums; ids continue after the copied ones; a changed value changes the checksum; a target
 * that holds data and a source that is not fully migrated are refused before anything is written.
 */
import { execFile } from "node:child_process";
import path from "node:path";
import { promisify } from "node:util";
import { beforeAll, describe, expect, it } from "vitest";
import { setupTestDatabase, TEST_ON_POSTGRES } from "../../support/test-db";

const testDb = setupTestDatabase();
const run = promisify(execFile);
const tsx = path.resolve("node_modules/.bin/tsx");

const { getDb } = await import("@/src/server/db/client");
const { createDb } = await import("@/src/server/db/create-db");
const { migrationSource } = await import("@/src/server/db/migration-source");
const { moveSqliteToPostgres, MigrationRefusedError } = await import("@/src/server/db/engine/sqlite-to-postgres");
const { checksumTable } = await import("@/src/server/db/engine/table-checksum");
const { tableColumns } = await import("@/src/server/db/engine/table-rows");

const sourceFile = path.join(testDb.dir, "demo.sqlite");
/** Every byte value, so bytea's hex form is exercised end to end. */
const ALL_BYTES = Buffer.from(Array.from({ length: 256 }, (_, i) => i));
const AWKWARD_TEXT = 'tab\there, newline\nthere, backslash \\ and a literal \\N, quotes "x" \'y\', umlaut ü, emoji 🧲';

describe.runIf(TEST_ON_POSTGRES)("npm run db:to-postgres", () => {
  beforeAll(async () => {
    // the demo database exactly as `npm run demo` builds it: migrate, seed, generate and import the demo logs
    const env = { ...process.env, DATABASE_FILE: sourceFile, DATABASE_URL: "", UPLOAD_DIR: path.join(testDb.dir, "uploads") };
    await run(tsx, ["scripts/db.ts", "reset"], { env });
    await run(process.execPath, ["--conditions=react-server", "--import", "tsx", "scripts/load-demo-logs.ts"], { env, maxBuffer: 1 << 24 });
    const source = createDb(sourceFile);
    try {
      const survey = await source("surveys").where({ code: "BRM-26" }).first("id");
      const [{ id: runId }] = await source("correction_runs")
        .insert({ survey_id: survey.id, day: "2026-05-04", number: 1, status: "done", progress: 1, parameters: "{}", inputs: "[]", process_id: "p", created_at: "2026-05-04T18:00:00.000Z", error: AWKWARD_TEXT })
        .returning("id");
      await source("correction_run_columns").insert({ run_id: runId, name: "every_byte", dtype: "u8", data: ALL_BYTES });
    } finally {
      await source.destroy();
    }
  }, 120_000);

  it("moves the demo database with identical row counts and checksums and exits 0", async () => {
    const { stdout } = await run(tsx, ["scripts/db-to-postgres.ts", "--from", sourceFile, "--to", testDb.url!], { env: { ...process.env, DATABASE_URL: "" } });
    expect(stdout).toMatch(/all \d+ tables match \(row counts and checksums\)/);
    expect(stdout).not.toMatch(/DIFFERENT/);
    const db = getDb();
    const readings = Number((await db("log_readings").count({ n: "*" }).first())?.n);
    const expected = Number((await db("field_logs").sum({ n: "reading_count" }).first())?.n);
    expect(readings).toBeGreaterThan(50_000);
    expect(readings).toBe(expected);
    expect(Number((await db("field_logs").count({ n: "*" }).first())?.n)).toBe(10);
    const column = await db("correction_run_columns").where({ name: "every_byte" }).first("data");
    expect(Buffer.compare(column.data, ALL_BYTES)).toBe(0);
    expect((await db("correction_runs").first("error")).error).toBe(AWKWARD_TEXT);
  }, 120_000);

  it("new rows continue after the copied ids", async () => {
    const db = getDb();
    const maxRun = Number((await db("correction_runs").max({ m: "id" }).first())?.m);
    const survey = await db("surveys").where({ code: "BRM-26" }).first("id");
    const [{ id }] = await db("correction_runs")
      .insert({ survey_id: survey.id, day: "2026-05-04", number: 2, status: "queued", parameters: "{}", inputs: "[]", process_id: "p", created_at: new Date().toISOString() })
      .returning("id");
    expect(id).toBe(maxRun + 1);
    await db("correction_runs").where({ id }).delete();
  });

  it("a value changed on one side changes that table's checksum", async () => {
    const source = createDb(sourceFile);
    try {
      const cols = await tableColumns(source, "surveys");
      const before = await checksumTable(getDb(), "surveys", cols);
      expect(before).toEqual(await checksumTable(source, "surveys", cols));
      await getDb()("surveys").where({ code: "BRM-26" }).update({ notes: "changed after the move" });
      const after = await checksumTable(getDb(), "surveys", cols);
      expect(after.rows).toBe(before.rows);
      expect(after.checksum).not.toBe(before.checksum);
    } finally {
      await source.destroy();
    }
  });

  it("refuses a target that already holds data, and a source that is not fully migrated, writing nothing", async () => {
    const source = createDb(sourceFile);
    try {
      const err = await moveSqliteToPostgres(source, getDb()).catch((e: unknown) => e);
      expect(err).toBeInstanceOf(MigrationRefusedError);
      expect((err as Error).message).toMatch(/already holds data: .*surveys \(3 rows\)/);
    } finally {
      await source.destroy();
    }
    const halfFile = path.join(testDb.dir, "half.sqlite");
    const half = createDb(halfFile);
    try {
      await half.migrate.up({ migrationSource });
      const before = Number((await getDb()("log_readings").count({ n: "*" }).first())?.n);
      const err = await moveSqliteToPostgres(half, getDb()).catch((e: unknown) => e);
      expect(err).toBeInstanceOf(MigrationRefusedError);
      expect((err as Error).message).toMatch(/at migration 0001_foundation.*npm run db:migrate/);
      expect(Number((await getDb()("log_readings").count({ n: "*" }).first())?.n)).toBe(before);
    } finally {
      await half.destroy();
    }
  });
});
