/**
 * Where originals live under UPLOAD_DIR, without `server-only` so scripts (backup, demo loader)
 * share it: `originals/<key>` for committed files, `tmp/<uuid>.part` while an upload streams in;
 * with STORAGE_BACKEND=s3, committed files are objects `<S3_PREFIX>originals/<key>` instead.
 */
import fs from "node:fs";
import path from "node:path";

/** Generated storage keys (randomUUID): never derived from an uploaded file name. */
export const STORAGE_KEY_RE = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/;

export function originalsDir(uploadDir: string): string {
  return path.join(uploadDir, "originals");
}

export function tempDir(uploadDir: string): string {
  return path.join(uploadDir, "tmp");
}

/** Object-key prefix of originals in a bucket: `<S3_PREFIX>originals/` (S3_PREFIX is empty or ends in "/"). */
export function s3OriginalsPrefix(prefix: string): string {
  return `${prefix}originals/`;
}

/** `s3://bucket/<prefix>originals/`, for messages and the backup manifest. */
export function s3OriginalsLocation(config: { bucket: string; prefix: string }): string {
  return `s3://${config.bucket}/${s3OriginalsPrefix(config.prefix)}`;
}

/** fsync a directory so a rename into it survives a crash; a filesystem that refuses is ignored (the rename is atomic anyway). */
export function fsyncDir(dir: string): void {
  try {
    const fd = fs.openSync(dir, "r");
    try {
      fs.fsyncSync(fd);
    } finally {
      fs.closeSync(fd);
    }
  } catch {
    /* some filesystems refuse fsync on a directory */
  }
}

/**
 * Removes staged uploads (`tmp/*.part`) last written before `beforeMs`: at boot these can only be
 * left over from a process that died mid-upload, since a staged file is either renamed into
 * originals/ on commit or removed on failure. Returns how many were removed.
 * (One app process per UPLOAD_DIR, as with SQLite; a shared folder would need a longer age.)
 */
export function sweepStagedUploads(uploadDir: string, beforeMs: number): number {
  const dir = tempDir(uploadDir);
  let removed = 0;
  let names: string[];
  try {
    names = fs.readdirSync(dir);
  } catch {
    return 0; // no tmp folder yet
  }
  for (const name of names) {
    if (!name.endsWith(".part")) continue;
    const file = path.join(dir, name);
    try {
      if (fs.statSync(file).mtimeMs < beforeMs) {
        fs.rmSync(file, { force: true });
        removed++;
      }
    } catch {
      /* gone meanwhile */
    }
  }
  return removed;
}
