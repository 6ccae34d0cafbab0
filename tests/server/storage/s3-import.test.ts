/**
 * The import and download paths with STORAGE_BACKEND=s3, the bucket being the loopback fake S3
 * server reached through the real AWS SDK: a log imported over the API route is downloaded back
 * byte for byte; an import refused before the upload stores nothing; an import whose database
 * COMMIT fails after the upload leaves no object behind; the boot sweep removes an orphan; a
 * backup names the bucket instead of copying its objects, and restores.
 */
import { createHash, randomUUID } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { describe, expect, it, beforeAll } from "vitest";
import { setupTestDatabase, TEST_ON_POSTGRES } from "../../support/test-db";
import { startTestS3 } from "./fake-s3-support";

const s3 = await startTestS3();
const testDb = setupTestDatabase({ ...s3.env, UPLOAD_DIR: "" });
process.env.UPLOAD_DIR = path.join(testDb.dir, "uploads");

const { importLogStream } = await import("@/src/server/logs/import-service");
const { getLog, openLogOriginal } = await import("@/src/server/logs/read-service");
const { PART_SIZE_BYTES } = await import("@/src/server/storage/s3-store");
const { LogImportRefusedError } = await import("@/src/server/logs/errors");
const { getOriginalStore } = await import("@/src/server/storage/store");
const { createBackup, restoreBackup } = await import("@/src/server/backup");
const { sweepStorageAtBoot, ORPHAN_MIN_AGE_MS } = await import("@/src/server/storage/boot-sweep");
const { createApiToken } = await import("@/src/server/api-tokens/service");
const { getDb } = await import("@/src/server/db/client");
const { makeUser, makeSurvey, addMember } = await import("../../support/fixtures");
const { snapshot, streamOf, roverCsv } = await import("../logs/helpers");
const originalRoute = await import("@/app/api/v1/surveys/[surveyId]/logs/[logId]/original/route");

type User = Awaited<ReturnType<typeof makeUser>>;
let crew: User;
let surveyId: string;
const sha = (b: Buffer | string) => createHash("sha256").update(b).digest("hex");
/** Objects in the fake bucket's folder (one data file and one .json sidecar each), independent of the SDK. */
const objectFilesOnDisk = () => fs.readdirSync(path.join(s3.dir, s3.config.bucket, "objects")).filter((n) => n.endsWith(".json")).length;

beforeAll(async () => {
  crew = await makeUser();
  surveyId = await makeSurvey();
  await addMember(surveyId, crew.userId, "crew");
});

describe("imports with the S3 backend", () => {
  it("the store in use is the bucket", async () => {
    const store = await getOriginalStore();
    expect(store.backend).toBe("s3");
    expect(store.location).toBe(`s3://${s3.config.bucket}/test-prefix/originals/`);
  });

  it("a log lands in the bucket under a generated key and downloads back byte for byte", async () => {
    const text = "\uFEFF" + roverCsv(400, { eol: "\r\n" });
    const before = await snapshot();
    const result = await importLogStream(crew, surveyId, streamOf(text), { kind: "rover", fileName: "Line 100 (rover).csv", instrument: "R-1" });
    const after = await snapshot();
    expect(after.field_logs - before.field_logs).toBe(1);
    expect(after.originals - before.originals).toBe(1);
    expect(after.tempFiles).toBe(0); // the staged copy is gone once uploaded

    const row = await getDb()("field_logs").where({ id: result.log.id }).first();
    expect(row.storage_key).not.toContain("Line 100");
    expect(s3.server.operations).toContain("PutObject");
    expect((await getLog(crew, surveyId, result.log.id)).originalAvailable).toBe(true);

    const token = (await createApiToken(crew, { name: "s3 test" })).token;
    const res = await originalRoute.GET(new Request("http://localhost:3000/x", { headers: { authorization: `Bearer ${token}` } }), {
      params: Promise.resolve({ surveyId, logId: String(result.log.id) }),
    });
    expect(res.status).toBe(200);
    const body = Buffer.from(await res.arrayBuffer());
    expect(body.equals(Buffer.from(text, "utf8"))).toBe(true);
    expect(sha(body)).toBe(res.headers.get("x-content-sha256"));
    expect(sha(body)).toBe(row.sha256);
  });

  it("a log larger than one part goes up as a multipart upload and still downloads byte for byte", async () => {
    const text = roverCsv(120_000, { startIso: "2026-05-07T06:00:00Z" });
    expect(Buffer.byteLength(text)).toBeGreaterThan(PART_SIZE_BYTES);
    const ops = s3.server.operations.length;
    const result = await importLogStream(crew, surveyId, streamOf(text), { kind: "rover", fileName: "long-line.csv" });
    expect(result.log.readingCount).toBe(120_000);
    const served = s3.server.operations.slice(ops);
    expect(served).toContain("CreateMultipartUpload");
    expect(served.filter((o) => o === "UploadPart").length).toBe(Math.ceil(Buffer.byteLength(text) / PART_SIZE_BYTES));
    const { stream } = await openLogOriginal(crew, surveyId, result.log.id);
    const parts: Buffer[] = [];
    for await (const c of stream) parts.push(c as Buffer);
    expect(sha(Buffer.concat(parts))).toBe(sha(text));
  });

  it("a refused import (duplicate) uploads nothing", async () => {
    const text = roverCsv(5, { startIso: "2026-05-05T09:00:00Z" });
    await importLogStream(crew, surveyId, streamOf(text), { kind: "rover", fileName: "first.csv" });
    const before = await snapshot();
    const onDisk = objectFilesOnDisk();
    const err = await importLogStream(crew, surveyId, streamOf(text), { kind: "rover", fileName: "again.csv" }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(LogImportRefusedError);
    expect(await snapshot()).toEqual(before);
    expect(objectFilesOnDisk()).toBe(onDisk);
  });

  it("an import whose COMMIT fails after the upload leaves no object and no rows", async () => {
    // A deferred foreign key is checked only at COMMIT ("DEFERRABLE INITIALLY DEFERRED"), so this
    // trigger lets the whole import run, the upload included, and then fails the COMMIT.
    const db = getDb();
    await db.raw("CREATE TABLE commit_breaker (survey_id TEXT REFERENCES surveys(id) DEFERRABLE INITIALLY DEFERRED)");
    if (TEST_ON_POSTGRES) {
      await db.raw(
        "CREATE FUNCTION break_commit() RETURNS trigger LANGUAGE plpgsql AS $$ BEGIN IF NEW.original_name = 'commit-fails.csv' THEN INSERT INTO commit_breaker VALUES ('no-such-survey'); END IF; RETURN NEW; END $$",
      );
      await db.raw("CREATE TRIGGER break_commit AFTER INSERT ON field_logs FOR EACH ROW EXECUTE FUNCTION break_commit()");
    } else {
      await db.raw("CREATE TRIGGER break_commit AFTER INSERT ON field_logs WHEN NEW.original_name = 'commit-fails.csv' BEGIN INSERT INTO commit_breaker VALUES ('no-such-survey'); END");
    }
    try {
      const before = await snapshot();
      const onDisk = objectFilesOnDisk();
      const puts = s3.server.operations.filter((o) => o === "PutObject").length;
      const err = await importLogStream(crew, surveyId, streamOf(roverCsv(50, { startIso: "2026-05-06T09:00:00Z" })), { kind: "rover", fileName: "commit-fails.csv" }).catch((e: unknown) => e);
      expect(String(err)).toMatch(TEST_ON_POSTGRES ? /violates foreign key constraint/ : /FOREIGN KEY constraint failed/);
      expect(s3.server.operations.filter((o) => o === "PutObject").length).toBe(puts + 1); // the upload did happen
      expect(s3.server.operations.at(-1)).toBe("DeleteObject"); // and was taken back
      expect(objectFilesOnDisk()).toBe(onDisk);
      expect(await snapshot()).toEqual(before);
    } finally {
      await db.raw(TEST_ON_POSTGRES ? "DROP TRIGGER IF EXISTS break_commit ON field_logs" : "DROP TRIGGER IF EXISTS break_commit");
      if (TEST_ON_POSTGRES) await db.raw("DROP FUNCTION IF EXISTS break_commit()");
      await db.raw("DROP TABLE IF EXISTS commit_breaker");
    }
  });

  it("the boot sweep removes an object older than the age limit that no log names, and keeps the logs' originals", async () => {
    const store = await getOriginalStore();
    const orphan = randomUUID();
    const staged = path.join(testDb.dir, "orphan.part");
    fs.writeFileSync(staged, "left by a crash between upload and commit\n");
    await store.commit({ tempPath: staged, sizeBytes: fs.statSync(staged).size }, orphan);
    const named = await getDb()("field_logs").pluck("storage_key");
    const lines: string[] = [];
    // a boot a little over the age limit after the orphan was written
    await sweepStorageAtBoot(Date.now() + ORPHAN_MIN_AGE_MS + 1_000, (l) => lines.push(l));
    expect(await store.exists(orphan)).toBe(false);
    expect(lines.join("\n")).toMatch(/removed 1 original\(s\) in s3:\/\/fieldtide-test\/test-prefix\/originals\//);
    for (const key of named) expect(await store.exists(key)).toBe(true);
  });
});

// db:backup is the SQLite file's backup (PostgreSQL: pg_dump), so this runs on SQLite only
describe.skipIf(TEST_ON_POSTGRES)("backups with the S3 backend", () => {
  it("the backup names the bucket and copies no originals; its restore checks out and the originals are where it says", async () => {
    const store = await getOriginalStore();
    const outDir = path.join(testDb.dir, "backup-1");
    const { manifest } = await createBackup({ databaseFile: testDb.file, uploadDir: process.env.UPLOAD_DIR!, outDir, appVersion: "test", originalsLocation: store.location });
    const logs = await getDb()("field_logs").select("storage_key");
    expect(logs.length).toBeGreaterThan(0);
    expect(manifest.originalsLocation).toBe("s3://fieldtide-test/test-prefix/originals/");
    expect(manifest.originals).toEqual([]);
    expect(fs.readdirSync(path.join(outDir, "originals"))).toEqual([]);

    const restoredFile = path.join(testDb.dir, "restored", "fieldtide.sqlite");
    const restored = await restoreBackup({ fromDir: outDir, databaseFile: restoredFile, uploadDir: path.join(testDb.dir, "restored-uploads") });
    expect(restored.copiedFiles).toBe(0);
    expect(restored.manifest.tables.field_logs).toBe(logs.length);
    for (const { storage_key } of logs) expect(await store.exists(storage_key)).toBe(true);
  });
});
