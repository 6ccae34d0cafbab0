/**
 * Restore a backup folder into DATABASE_FILE and UPLOAD_DIR.
 *
 * Nothing is moved into place until everything is verified:
 * 1. the manifest is read and validated; the backup's migrations must all be known to this app;
 * 2. an existing database (or its -wal/-shm) is refused unless `force`;
 * 3. every file of the backup must match its SHA-256 and size in the manifest;
 * 4. the snapshot is copied beside the target, and the copy must hash to the manifest's digest,
 *    pass `PRAGMA integrity_check`, hold the manifest's row counts and migrations, and refer to
 *    exactly the originals in the backup;
 * 5. originals are copied in via UPLOAD_DIR/tmp and renamed into UPLOAD_DIR/originals (an
 *    original already there with the same bytes is kept; a different one needs `force`); a backup
 *    made with STORAGE_BACKEND=s3 holds none (its manifest names the bucket), so none are copied;
 * 6. last, the staged database is renamed onto DATABASE_FILE; with `force` the database it
 *    replaces is moved aside (with its -wal/-shm) to `<file>.before-restore-<time>`, never deleted.
 * Stop the app before restoring over a database it has open.
 *
 * No `server-only` import: the backup script (tsx) loads this module outside Next.
 */
import { randomUUID } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import Database from "better-sqlite3";
import { originalsDir as originalsDirOf, tempDir as tempDirOf } from "../storage/layout";
import { BackupError } from "./errors";
import { copyAndHash, fsyncDir, sha256File } from "./file-copy";
import { readManifest, SNAPSHOT_FILE, type BackupManifest } from "./manifest";
import { appliedMigrations, integrityCheck, referencedFiles, rowCounts } from "./snapshot-facts";

export interface RestoreOptions {
  fromDir: string;
  databaseFile: string;
  uploadDir: string;
  /** Replace an existing database (moved aside, not deleted) and differing originals. */
  force?: boolean;
  /** Migration names this app knows; a backup with others was made by a newer version. */
  knownMigrations?: readonly string[];
  now?: () => Date;
}

export interface RestoreResult {
  manifest: BackupManifest;
  databaseFile: string;
  /** Originals copied in, and those already present with the same bytes. */
  copiedFiles: number;
  keptFiles: number;
  /** Where the replaced database was moved, when `force` replaced one. */
  replacedTo: string | null;
}

const SIDE_FILES = ["", "-wal", "-shm"] as const;

async function verifyBackupFiles(fromDir: string, manifest: BackupManifest): Promise<void> {
  const problems: string[] = [];
  const check = async (rel: string, sha256: string, sizeBytes: number) => {
    const file = path.join(fromDir, rel);
    if (!fs.existsSync(file)) problems.push(`${rel} is missing`);
    else if (fs.statSync(file).size !== sizeBytes) problems.push(`${rel} has ${fs.statSync(file).size} bytes, the manifest says ${sizeBytes}`);
    else if ((await sha256File(file)) !== sha256) problems.push(`${rel} does not match its SHA-256 in the manifest`);
  };
  await check(manifest.database.file, manifest.database.sha256, manifest.database.sizeBytes);
  for (const o of manifest.originals) await check(o.file, o.sha256, o.sizeBytes);
  if (problems.length > 0) {
    const shown = problems.slice(0, 5).join("; ") + (problems.length > 5 ? `; and ${problems.length - 5} more` : "");
    throw new BackupError(`the backup in ${fromDir} fails verification, nothing was restored: ${shown}`);
  }
}

/** Opens the staged copy read-only and checks it against the manifest; throws BackupError on any difference. */
function verifyStagedDatabase(file: string, manifest: BackupManifest): void {
  const db = new Database(file, { readonly: true, fileMustExist: true });
  try {
    const integrity = integrityCheck(db);
    if (integrity !== "ok") throw new BackupError(`the backed-up database fails PRAGMA integrity_check (${integrity.slice(0, 200)})`);
    const counts = rowCounts(db);
    const tables = new Set([...Object.keys(counts), ...Object.keys(manifest.tables)]);
    const differing = [...tables].filter((t) => counts[t] !== manifest.tables[t]);
    if (differing.length > 0) {
      const t = differing[0];
      throw new BackupError(`the backed-up database holds ${counts[t] ?? "no"} rows in ${t}, the manifest says ${manifest.tables[t] ?? "no table"}`);
    }
    if (JSON.stringify(appliedMigrations(db)) !== JSON.stringify(manifest.migration.applied)) {
      throw new BackupError("the backed-up database's migrations differ from the manifest");
    }
    const referenced = referencedFiles(db).map((r) => r.storageKey).sort();
    const inBackup = manifest.originals.map((o) => o.storageKey).sort();
    if (!manifest.originalsLocation && JSON.stringify(referenced) !== JSON.stringify(inBackup)) {
      throw new BackupError(`the backed-up database refers to ${referenced.length} original files, the backup holds ${inBackup.length}`);
    }
  } finally {
    db.close();
  }
}

export async function restoreBackup(opts: RestoreOptions): Promise<RestoreResult> {
  const { fromDir, databaseFile, uploadDir, force = false } = opts;
  const manifest = readManifest(fromDir);
  if (opts.knownMigrations) {
    const unknown = manifest.migration.applied.filter((m) => !opts.knownMigrations!.includes(m));
    if (unknown.length > 0) {
      throw new BackupError(`the backup was made at migration ${unknown[0]}, which this version of Fieldtide does not know; restore it with the version that made it (${manifest.appVersion})`);
    }
  }
  const present = SIDE_FILES.map((s) => databaseFile + s).filter((f) => fs.existsSync(f));
  if (present.length > 0 && !force) {
    throw new BackupError(`${present[0]} already exists; restore will not overwrite a database without --force (stop the app first; the old database is then kept beside it)`);
  }
  await verifyBackupFiles(fromDir, manifest);

  const originalsDir = originalsDirOf(uploadDir);
  const tmpDir = tempDirOf(uploadDir);
  const toCopy: BackupManifest["originals"] = [];
  let keptFiles = 0;
  for (const o of manifest.originals) {
    const target = path.join(originalsDir, o.storageKey);
    if (!fs.existsSync(target)) toCopy.push(o);
    else if ((await sha256File(target)) === o.sha256) keptFiles++;
    else if (force) toCopy.push(o);
    else throw new BackupError(`${target} exists with different contents; restore will not overwrite it without --force`);
  }

  fs.mkdirSync(path.dirname(databaseFile), { recursive: true });
  const staged = `${databaseFile}.restore-${randomUUID().slice(0, 8)}`;
  try {
    const copy = await copyAndHash(path.join(fromDir, SNAPSHOT_FILE), staged);
    if (copy.sha256 !== manifest.database.sha256) throw new BackupError("the database copy does not match the manifest's SHA-256 (disk error while copying?)");
    verifyStagedDatabase(staged, manifest);

    fs.mkdirSync(originalsDir, { recursive: true });
    fs.mkdirSync(tmpDir, { recursive: true });
    for (const o of toCopy) {
      const temp = path.join(tmpDir, `${o.storageKey}.restore-${randomUUID().slice(0, 8)}`);
      try {
        const c = await copyAndHash(path.join(fromDir, o.file), temp);
        if (c.sha256 !== o.sha256) throw new BackupError(`the copy of original ${o.storageKey} does not match its SHA-256 (disk error while copying?)`);
        fs.renameSync(temp, path.join(originalsDir, o.storageKey));
      } finally {
        fs.rmSync(temp, { force: true });
      }
    }
    fsyncDir(originalsDir);

    let replacedTo: string | null = null;
    if (present.length > 0) {
      const stamp = (opts.now ?? (() => new Date()))().toISOString().replace(/[-:.]/g, "");
      replacedTo = `${databaseFile}.before-restore-${stamp}`;
      for (const s of SIDE_FILES) if (fs.existsSync(databaseFile + s)) fs.renameSync(databaseFile + s, replacedTo + s);
    }
    try {
      fs.renameSync(staged, databaseFile);
    } catch (err) {
      // put the replaced database back rather than leave no database at all
      if (replacedTo) for (const s of SIDE_FILES) if (fs.existsSync(replacedTo + s)) fs.renameSync(replacedTo + s, databaseFile + s);
      throw err;
    }
    fsyncDir(path.dirname(databaseFile));
    return { manifest, databaseFile, copiedFiles: toCopy.length, keptFiles, replacedTo };
  } finally {
    for (const s of ["", "-journal", "-wal", "-shm"]) fs.rmSync(staged + s, { force: true });
  }
}
