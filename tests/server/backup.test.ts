/**
 * Backups (src/server/backup, scripts/db-backup.ts): an online backup of a live SQLite database
 * while another process keeps importing logs (original file written first, then field_logs +
 * log_readings in one transaction, as the import service does), restored into a fresh folder and
 * checked against the manifest: row counts, SHA-256 of every file, PRAGMA integrity_check.
 * Refusals: a tampered backup (checksum mismatch) and an existing database without --force.
 */
import { execFile, spawn, type ChildProcess } from "node:child_process";
import { createHash, randomUUID } from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { promisify } from "node:util";
import Database from "better-sqlite3";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createDb } from "@/src/server/db/create-db";
import { migrateToLatest, MIGRATION_NAMES } from "@/src/server/db/migration-source";
import { BackupError, createBackup, integrityCheck, restoreBackup, rowCounts, sha256File, type BackupResult } from "@/src/server/backup";

const root = fs.mkdtempSync(path.join(os.tmpdir(), "fieldtide-backup-"));
const live = { databaseFile: path.join(root, "live", "fieldtide.sqlite"), uploadDir: path.join(root, "live", "uploads") };
const READINGS_PER_LOG = 200;
const PREFILL_LOGS = 40;
const PREFILL_READINGS_PER_LOG = 5_000; // ~200 000 readings, so the copy takes more than an instant

const sha = (b: Buffer | string) => createHash("sha256").update(b).digest("hex");

/** The writer: one "import" every 2 ms until SIGTERM; prints "ready" after the first commit and its count at the end. */
const WRITER = String.raw`
const Database = require(process.argv[2]);
const crypto = require("node:crypto"), fs = require("node:fs"), path = require("node:path");
const [dbFile, uploadDir, surveyId, perLog] = process.argv.slice(3);
const db = new Database(dbFile);
db.pragma("journal_mode = WAL"); db.pragma("busy_timeout = 5000"); db.pragma("foreign_keys = ON");
const insLog = db.prepare("INSERT INTO field_logs (survey_id, kind, original_name, storage_key, sha256, size_bytes, sensor_type, time_basis, delimiter, header, mapping, row_count, reading_count, rejected_count, issue_count, uploaded_at) VALUES (?, 'base', ?, ?, ?, ?, 'overhauser', 'utc', ',', '[]', '{}', ?, ?, 0, 0, ?)");
const insReading = db.prepare("INSERT INTO log_readings (log_id, time_ms, field_nt, source_line, local_day) VALUES (?, ?, ?, ?, ?)");
const n = Number(perLog);
const importOne = db.transaction((i, key, digest, size) => {
  const id = insLog.run(surveyId, "writer-" + i + ".csv", key, digest, size, n, n, new Date().toISOString()).lastInsertRowid;
  for (let r = 0; r < n; r++) insReading.run(id, 1777885200000 + r * 1000, 48000 + ((i * 7 + r) % 500) / 4, r + 2, 20577);
});
const originals = path.join(uploadDir, "originals"), tmp = path.join(uploadDir, "tmp");
let count = 0;
const commitTimes = [];
const timer = setInterval(() => {
  const body = Buffer.from("time,field\n" + Array.from({ length: 20 }, (_, r) => "2026-05-04T09:00:" + String(r).padStart(2, "0") + "Z," + (48000 + count + r)).join("\n") + "\n");
  const key = crypto.randomUUID();
  fs.writeFileSync(path.join(tmp, key + ".part"), body);
  fs.renameSync(path.join(tmp, key + ".part"), path.join(originals, key)); // the file is in place before its row commits
  importOne(count, key, crypto.createHash("sha256").update(body).digest("hex"), body.length);
  commitTimes.push(Date.now());
  if (++count === 1) process.stdout.write("ready\n");
}, 2);
process.on("SIGTERM", () => {
  clearInterval(timer);
  db.close();
  process.stdout.write(JSON.stringify({ count, commitTimes }) + "\n");
  process.exit(0);
});
`;

let surveyId = "";
let writerChild: ChildProcess | null = null;
let prefillReadings = 0;

function startWriter(): { child: ChildProcess; ready: Promise<void>; done: Promise<{ count: number; commitTimes: number[] }> } {
  const script = path.join(root, "writer.cjs");
  fs.writeFileSync(script, WRITER);
  const child = spawn(process.execPath, [script, require.resolve("better-sqlite3"), live.databaseFile, live.uploadDir, surveyId, String(READINGS_PER_LOG)], {
    stdio: ["ignore", "pipe", "inherit"],
  });
  writerChild = child;
  let out = "";
  let resolveReady!: () => void;
  const ready = new Promise<void>((r) => (resolveReady = r));
  child.stdout!.on("data", (d: Buffer) => {
    out += d.toString();
    if (out.includes("ready\n")) resolveReady();
  });
  const done = new Promise<{ count: number; commitTimes: number[] }>((resolve, reject) => {
    child.on("exit", (code) => {
      const last = out.trim().split("\n").pop() ?? "";
      if (code === 0 && last.startsWith("{")) resolve(JSON.parse(last));
      else reject(new Error(`writer exited with ${code}: ${out}`));
    });
  });
  return { child, ready, done };
}

function liveCount(table: string): number {
  const db = new Database(live.databaseFile, { readonly: true });
  try {
    return (db.prepare(`SELECT COUNT(*) AS n FROM ${table}`).get() as { n: number }).n;
  } finally {
    db.close();
  }
}

beforeAll(async () => {
  const knex = createDb(live.databaseFile);
  await migrateToLatest(knex);
  await knex.destroy();
  const db = new Database(live.databaseFile);
  db.pragma("journal_mode = WAL");
  surveyId = randomUUID();
  const now = new Date().toISOString();
  db.prepare("INSERT INTO surveys (id, code, name, time_zone, created_at, updated_at) VALUES (?, 'BK-1', 'Backup test grid', 'UTC', ?, ?)").run(surveyId, now, now);
  fs.mkdirSync(path.join(live.uploadDir, "originals"), { recursive: true });
  fs.mkdirSync(path.join(live.uploadDir, "tmp"), { recursive: true });
  const insLog = db.prepare(
    "INSERT INTO field_logs (survey_id, kind, original_name, storage_key, sha256, size_bytes, sensor_type, time_basis, delimiter, header, mapping, row_count, reading_count, rejected_count, issue_count, uploaded_at) VALUES (?, 'rover', ?, ?, ?, ?, 'proton-precession', 'utc', ',', '[]', '{}', ?, ?, 0, 0, ?)",
  );
  const insReading = db.prepare("INSERT INTO log_readings (log_id, time_ms, field_nt, latitude_deg, longitude_deg, source_line, local_day) VALUES (?, ?, ?, ?, ?, ?, ?)");
  db.transaction(() => {
    for (let i = 0; i < PREFILL_LOGS; i++) {
      const body = Buffer.from(`time,field\n2026-05-04T09:00:00Z,${48000 + i}\n`);
      const key = randomUUID();
      fs.writeFileSync(path.join(live.uploadDir, "originals", key), body);
      const id = insLog.run(surveyId, `prefill-${i}.csv`, key, sha(body), body.length, PREFILL_READINGS_PER_LOG, PREFILL_READINGS_PER_LOG, now).lastInsertRowid;
      for (let r = 0; r < PREFILL_READINGS_PER_LOG; r++) insReading.run(id, 1777885200000 + r * 1000, 48000 + r / 8, 53.6 + r * 1e-6, -1.9, r + 2, 20577);
    }
  })();
  prefillReadings = PREFILL_LOGS * PREFILL_READINGS_PER_LOG;
  db.close();
});

afterAll(() => {
  if (writerChild && writerChild.exitCode === null) writerChild.kill("SIGKILL");
  fs.rmSync(root, { recursive: true, force: true });
});

describe("backup during writes, restore into a fresh folder", () => {
  let backup: BackupResult;
  let figures: Record<string, number>;

  it("snapshots the live database while another process keeps importing", async () => {
    const writer = startWriter();
    await writer.ready;
    await new Promise((r) => setTimeout(r, 100));
    const logsBefore = liveCount("field_logs");
    const t0 = Date.now();
    backup = await createBackup({ ...live, outDir: path.join(root, "backups", "during-writes"), appVersion: "test" });
    const t1 = Date.now();
    const logsAfter = liveCount("field_logs");
    await new Promise((r) => setTimeout(r, 100));
    writer.child.kill("SIGTERM");
    const { count: writerTotal, commitTimes } = await writer.done;
    const w = backup.snapshotWindowMs;
    const during = (a: number, b: number) => commitTimes.filter((t) => t >= a && t <= b).length;
    figures = {
      logsBefore, logsAfter, writerTotal, commitsDuringBackup: during(t0, t1), commitsDuringSnapshotStep: during(w.from, w.to),
      snapshotStepMs: w.to - w.from, backupMs: t1 - t0, snapshotLogs: backup.manifest.tables.field_logs, snapshotReadings: backup.manifest.tables.log_readings,
    };
    console.log(`[backup] ${JSON.stringify(figures)}`);

    const m = backup.manifest;
    // the writer committed while the backup ran, and the snapshot is one instant between the two counts
    expect(logsAfter).toBeGreaterThan(logsBefore);
    expect(figures.commitsDuringBackup).toBeGreaterThan(0);
    expect(m.tables.field_logs).toBeGreaterThanOrEqual(logsBefore);
    expect(m.tables.field_logs).toBeLessThanOrEqual(logsAfter);
    // every import in the snapshot is whole: its readings came with it, none half-written
    const writerLogs = m.tables.field_logs - PREFILL_LOGS;
    expect(m.tables.log_readings).toBe(prefillReadings + writerLogs * READINGS_PER_LOG);
    expect(m.tables.surveys).toBe(1);
    expect(m.migration.applied).toEqual([...MIGRATION_NAMES]);
    expect(m.migration.current).toBe(MIGRATION_NAMES.at(-1));
    expect(m.database.integrityCheck).toBe("ok");
    // one original per log in the snapshot, none of those written after it
    expect(m.originals).toHaveLength(m.tables.field_logs);
    expect(fs.readdirSync(path.join(live.uploadDir, "originals")).length).toBe(PREFILL_LOGS + writerTotal);
    expect(writerTotal).toBeGreaterThan(writerLogs);
    // the manifest's digests are those of the files in the folder
    expect(await sha256File(path.join(backup.dir, "database.sqlite"))).toBe(m.database.sha256);
    for (const o of m.originals.slice(0, 50)) expect(await sha256File(path.join(backup.dir, o.file))).toBe(o.sha256);
    expect(fs.readdirSync(path.join(root, "backups"))).toEqual(["during-writes"]); // no staging folder left
  });

  it("restores into a fresh folder: integrity ok, row counts and checksums as in the manifest", async () => {
    const target = { databaseFile: path.join(root, "fresh", "db", "restored.sqlite"), uploadDir: path.join(root, "fresh", "uploads") };
    const r = await restoreBackup({ fromDir: backup.dir, ...target, knownMigrations: MIGRATION_NAMES });
    expect(r.copiedFiles).toBe(backup.manifest.originals.length);
    expect(r.replacedTo).toBeNull();
    expect(await sha256File(target.databaseFile)).toBe(backup.manifest.database.sha256);

    const db = new Database(target.databaseFile, { readonly: true });
    try {
      expect(integrityCheck(db)).toBe("ok");
      expect(rowCounts(db)).toEqual(backup.manifest.tables);
      const logs = db.prepare("SELECT storage_key, sha256 FROM field_logs").all() as { storage_key: string; sha256: string }[];
      expect(logs).toHaveLength(backup.manifest.tables.field_logs);
      // each restored original has the bytes recorded at upload
      for (const l of logs) expect(await sha256File(path.join(target.uploadDir, "originals", l.storage_key))).toBe(l.sha256);
      console.log(`[restore] ${JSON.stringify({ logsRestored: logs.length, readingsRestored: rowCounts(db).log_readings, originalsRestored: r.copiedFiles })}`);
    } finally {
      db.close();
    }
    expect(fs.readdirSync(path.join(target.uploadDir, "originals"))).toHaveLength(backup.manifest.originals.length);
    expect(fs.readdirSync(path.join(target.uploadDir, "tmp"))).toEqual([]);
  });

  it("refuses a tampered backup (checksum mismatch) and writes nothing", async () => {
    for (const victim of ["original", "database"] as const) {
      const copy = path.join(root, `tampered-${victim}`);
      fs.cpSync(backup.dir, copy, { recursive: true });
      const file = victim === "original" ? path.join(copy, backup.manifest.originals[3].file) : path.join(copy, "database.sqlite");
      const bytes = fs.readFileSync(file);
      bytes[bytes.length >> 1] ^= 0x01; // one bit flipped, same size
      fs.writeFileSync(file, bytes);
      const target = { databaseFile: path.join(root, `t-${victim}`, "db.sqlite"), uploadDir: path.join(root, `t-${victim}`, "uploads") };
      await expect(restoreBackup({ fromDir: copy, ...target })).rejects.toThrow(/fails verification.*does not match its SHA-256/);
      expect(fs.existsSync(target.databaseFile)).toBe(false);
      expect(fs.existsSync(path.join(target.uploadDir, "originals"))).toBe(false);
    }
  });

  it("refuses to overwrite an existing database without force; with force keeps the old one aside", async () => {
    const target = { databaseFile: path.join(root, "existing", "db.sqlite"), uploadDir: path.join(root, "existing", "uploads") };
    fs.mkdirSync(path.dirname(target.databaseFile), { recursive: true });
    const old = new Database(target.databaseFile);
    old.exec("CREATE TABLE keep_me (x); INSERT INTO keep_me VALUES (1);");
    old.close();
    const before = await sha256File(target.databaseFile);
    const err = await restoreBackup({ fromDir: backup.dir, ...target }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(BackupError);
    expect((err as Error).message).toMatch(/already exists; restore will not overwrite a database without --force/);
    expect(await sha256File(target.databaseFile)).toBe(before);
    expect(fs.existsSync(path.join(target.uploadDir, "originals"))).toBe(false);

    const r = await restoreBackup({ fromDir: backup.dir, ...target, force: true });
    expect(r.replacedTo).toMatch(/db\.sqlite\.before-restore-/);
    expect(await sha256File(r.replacedTo!)).toBe(before);
    expect(await sha256File(target.databaseFile)).toBe(backup.manifest.database.sha256);
  });

  it("refuses a backup made at a migration this version does not know", async () => {
    const copy = path.join(root, "newer");
    fs.cpSync(backup.dir, copy, { recursive: true });
    const manifestFile = path.join(copy, "manifest.json");
    const m = JSON.parse(fs.readFileSync(manifestFile, "utf8"));
    m.migration.applied.push("9999_from_the_future");
    fs.writeFileSync(manifestFile, JSON.stringify(m));
    await expect(
      restoreBackup({ fromDir: copy, databaseFile: path.join(root, "nf", "db.sqlite"), uploadDir: path.join(root, "nf", "up"), knownMigrations: MIGRATION_NAMES }),
    ).rejects.toThrow(/9999_from_the_future, which this version of Fieldtide does not know/);
  });
});

describe("backups that cannot be made or read", () => {
  it("a referenced original missing from UPLOAD_DIR stops the backup with its key, leaving no folder behind", async () => {
    const dir = path.join(root, "missing-original");
    fs.mkdirSync(path.join(dir, "uploads", "originals"), { recursive: true });
    const databaseFile = path.join(dir, "db.sqlite");
    fs.copyFileSync(live.databaseFile, databaseFile); // the live file alone, without its originals (and without its WAL)
    const db = new Database(databaseFile);
    const key = (db.prepare("SELECT storage_key AS k FROM field_logs ORDER BY storage_key LIMIT 1").get() as { k: string }).k;
    db.close();
    const outDir = path.join(dir, "backups", "b1");
    await expect(createBackup({ databaseFile, uploadDir: path.join(dir, "uploads"), outDir, appVersion: "test" })).rejects.toThrow(
      new RegExp(`original file ${key} is missing from .* although the database refers to it`),
    );
    expect(fs.readdirSync(path.join(dir, "backups"))).toEqual([]);
  });

  it("a folder without a manifest, or with a malformed one, is refused by name", async () => {
    const dir = path.join(root, "not-a-backup");
    fs.mkdirSync(dir, { recursive: true });
    const target = { databaseFile: path.join(root, "nb", "db.sqlite"), uploadDir: path.join(root, "nb", "up") };
    await expect(restoreBackup({ fromDir: dir, ...target })).rejects.toThrow(/is not a backup folder: it has no manifest\.json/);
    fs.writeFileSync(path.join(dir, "manifest.json"), "{ not json");
    await expect(restoreBackup({ fromDir: dir, ...target })).rejects.toThrow(/manifest\.json is not valid JSON/);
    fs.writeFileSync(path.join(dir, "manifest.json"), JSON.stringify({ format: "fieldtide-backup", formatVersion: 1, originals: [{ storageKey: "../../etc/passwd" }] }));
    await expect(restoreBackup({ fromDir: dir, ...target })).rejects.toThrow(/is not a Fieldtide backup manifest/);
    expect(fs.existsSync(path.join(root, "nb"))).toBe(false);
  });
});

describe("npm run db:backup / db:restore (scripts/db-backup.ts)", () => {
  const run = promisify(execFile);
  const tsx = path.resolve("node_modules/.bin/tsx");
  const env = { ...process.env, DATABASE_FILE: live.databaseFile, UPLOAD_DIR: live.uploadDir };

  it("backs up with --out, restores with --from into DATABASE_FILE/UPLOAD_DIR, and refuses without --force in one line", async () => {
    const out = path.join(root, "cli-backup");
    const b = await run(tsx, ["scripts/db-backup.ts", "backup", "--out", out], { env });
    expect(b.stdout).toContain(`backup written to ${out}`);
    expect(fs.existsSync(path.join(out, "manifest.json"))).toBe(true);

    const fresh = { ...env, DATABASE_FILE: path.join(root, "cli-fresh", "db.sqlite"), UPLOAD_DIR: path.join(root, "cli-fresh", "up") };
    const r = await run(tsx, ["scripts/db-backup.ts", "restore", "--from", out], { env: fresh });
    expect(r.stdout).toMatch(/restored .*db\.sqlite .*checksums and integrity_check ok/);

    const again = await run(tsx, ["scripts/db-backup.ts", "restore", "--from", out], { env: fresh }).catch((e: { code: number; stderr: string }) => e);
    expect((again as { code: number }).code).toBe(1);
    const stderr = (again as { stderr: string }).stderr.trim();
    expect(stderr.split("\n")).toHaveLength(1);
    expect(stderr).toMatch(/^db-backup: .*already exists; restore will not overwrite a database without --force/);
  }, 60_000);
});
