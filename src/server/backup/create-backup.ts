/**
 * Online backup of the live database and the upload files it refers to.
 *
 * 1. Snapshot: SQLite's online backup API (better-sqlite3 `db.backup`) copies the live file page
 *    by page from a read transaction; in WAL mode writers carry on meanwhile. The whole copy is
 *    asked for in one step after the first, so steady writes by other connections cannot keep
 *    restarting it. The snapshot is switched to a rollback journal so it is one self-contained file.
 * 2. Facts from the SNAPSHOT (not the live file): integrity_check, row counts, migrations, and
 *    the storage keys it references.
 * 3. The referenced originals are copied; each copy must hash to the SHA-256 recorded at upload.
 *    With STORAGE_BACKEND=s3 they stay in the bucket and are NOT copied: the manifest names the
 *    bucket (`originalsLocation`), and the bucket's own versioning or replication protects them.
 *    An original is written to disk before the row that names it commits, so every file the
 *    snapshot names exists; files uploaded after the snapshot are not needed and not copied.
 * 4. manifest.json, then the staging folder is renamed to the backup folder: a backup folder
 *    with a manifest is always complete, an interrupted one leaves only a `.partial-*` folder.
 *
 * No `server-only` import: the backup script (tsx) loads this module outside Next.
 */
import { randomUUID } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import Database from "better-sqlite3";
import { BUSY_TIMEOUT_MS } from "../db/pragmas";
import { BackupError } from "./errors";
import { copyAndHash, fsyncDir, sha256File } from "./file-copy";
import { BACKUP_FORMAT, ManifestSchema, ORIGINALS_DIR, SNAPSHOT_FILE, StorageKey, writeManifest, type BackupManifest } from "./manifest";
import { appliedMigrations, integrityCheck, referencedFiles, rowCounts } from "./snapshot-facts";

export interface CreateBackupOptions {
  databaseFile: string;
  uploadDir: string;
  /** Backup folder to create; it must not exist yet, or be empty. */
  outDir: string;
  appVersion: string;
  /** The originals live here (an S3 bucket's `s3://…/originals/`) and are not copied. */
  originalsLocation?: string;
  now?: () => Date;
}

export interface BackupResult {
  dir: string;
  manifest: BackupManifest;
  /** Start and end (Unix ms) of the online backup step, the only time the live database is read. */
  snapshotWindowMs: { from: number; to: number };
}

/** `fieldtide-20261201T231500Z`: a default folder name that sorts by time. */
export function defaultBackupName(at: Date): string {
  return `fieldtide-${at.toISOString().replace(/[-:]/g, "").replace(/\.\d{3}/, "")}`;
}

/** Online backup of `databaseFile` (any journal mode) into `file`. Resolves when the copy is complete. */
async function snapshotDatabase(databaseFile: string, file: string): Promise<void> {
  const live = new Database(databaseFile, { fileMustExist: true });
  try {
    live.pragma(`busy_timeout = ${BUSY_TIMEOUT_MS}`);
    // after the first step (100 pages), copy everything that is left in one step
    await live.backup(file, { progress: ({ totalPages }) => Math.max(totalPages, 100) });
  } finally {
    live.close();
  }
  const snap = new Database(file, { fileMustExist: true });
  try {
    snap.pragma("journal_mode = DELETE");
  } finally {
    snap.close();
  }
}

export async function createBackup(opts: CreateBackupOptions): Promise<BackupResult> {
  const { databaseFile, uploadDir, outDir } = opts;
  if (!fs.existsSync(databaseFile)) throw new BackupError(`no database at ${databaseFile} (set DATABASE_FILE or --database)`);
  if (fs.existsSync(outDir) && (!fs.statSync(outDir).isDirectory() || fs.readdirSync(outDir).length > 0)) {
    throw new BackupError(`${outDir} already exists and is not an empty folder; choose a new --out folder`);
  }
  const parent = path.dirname(outDir);
  fs.mkdirSync(parent, { recursive: true });
  const staging = `${outDir}.partial-${randomUUID().slice(0, 8)}`;
  fs.mkdirSync(staging);
  try {
    const snapshotFile = path.join(staging, SNAPSHOT_FILE);
    const from = Date.now();
    await snapshotDatabase(databaseFile, snapshotFile);
    const snapshotWindowMs = { from, to: Date.now() };
    const createdAt = (opts.now ?? (() => new Date()))().toISOString();

    const snap = new Database(snapshotFile, { readonly: true, fileMustExist: true });
    let facts;
    try {
      const integrity = integrityCheck(snap);
      if (integrity !== "ok") throw new BackupError(`the snapshot fails PRAGMA integrity_check (${integrity.slice(0, 200)}); the live database needs attention`);
      facts = { tables: rowCounts(snap), applied: appliedMigrations(snap), files: referencedFiles(snap) };
    } finally {
      snap.close();
    }

    fs.mkdirSync(path.join(staging, ORIGINALS_DIR));
    const originals: BackupManifest["originals"] = [];
    for (const ref of opts.originalsLocation ? [] : facts.files) {
      if (!StorageKey.safeParse(ref.storageKey).success) throw new BackupError(`the database names an original "${ref.storageKey}" that is not a generated storage key`);
      const source = path.join(ref.dirOf(uploadDir), ref.storageKey);
      if (!fs.existsSync(source)) {
        throw new BackupError(`original file ${ref.storageKey} is missing from ${ref.dirOf(uploadDir)} although the database refers to it (check UPLOAD_DIR)`);
      }
      const rel = `${ORIGINALS_DIR}/${ref.storageKey}`;
      const copied = await copyAndHash(source, path.join(staging, rel));
      if (copied.sha256 !== ref.sha256) {
        throw new BackupError(`original file ${ref.storageKey} does not match the SHA-256 recorded at upload; it was changed or damaged on disk`);
      }
      originals.push({ storageKey: ref.storageKey, file: rel, ...copied });
    }

    const manifest = ManifestSchema.parse({
      format: BACKUP_FORMAT,
      formatVersion: 1,
      createdAt,
      appVersion: opts.appVersion,
      migration: { current: facts.applied.at(-1) ?? null, applied: facts.applied },
      database: { file: SNAPSHOT_FILE, sha256: await sha256File(snapshotFile), sizeBytes: fs.statSync(snapshotFile).size, integrityCheck: "ok" },
      tables: facts.tables,
      ...(opts.originalsLocation ? { originalsLocation: opts.originalsLocation } : {}),
      originals,
    } satisfies BackupManifest);
    writeManifest(staging, manifest);
    fsyncDir(path.join(staging, ORIGINALS_DIR));
    fsyncDir(staging);
    fs.renameSync(staging, outDir);
    fsyncDir(parent);
    return { dir: outDir, manifest, snapshotWindowMs };
  } catch (err) {
    fs.rmSync(staging, { recursive: true, force: true });
    throw err;
  }
}
