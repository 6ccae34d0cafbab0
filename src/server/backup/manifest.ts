/**
 * The manifest of a backup folder (`manifest.json`): what was copied, with SHA-256 checksums,
 * so a restore can prove it puts back exactly what was backed up.
 *
 * Folder layout:
 *   manifest.json
 *   database.sqlite              consistent snapshot (SQLite online backup API)
 *   originals/<storage key>      original upload files referenced by the snapshot
 */
import fs from "node:fs";
import path from "node:path";
import "@/src/lib/zod-jitless";
import { z } from "zod";
import { STORAGE_KEY_RE } from "../storage/layout";
import { BackupError } from "./errors";

export const MANIFEST_FILE = "manifest.json";
export const SNAPSHOT_FILE = "database.sqlite";
export const ORIGINALS_DIR = "originals";
export const BACKUP_FORMAT = "fieldtide-backup";

const Sha256 = z.string().regex(/^[0-9a-f]{64}$/, "expected a SHA-256 hex digest");
/** Generated storage keys (UUIDs); anything else never becomes a path. */
export const StorageKey = z.string().regex(STORAGE_KEY_RE, "expected a generated storage key");

export const ManifestSchema = z.object({
  format: z.literal(BACKUP_FORMAT),
  formatVersion: z.literal(1),
  createdAt: z.iso.datetime(),
  appVersion: z.string().min(1),
  migration: z.object({
    /** Last applied migration of the snapshot, null for an empty schema. */
    current: z.string().nullable(),
    applied: z.array(z.string()),
  }),
  database: z.object({
    file: z.literal(SNAPSHOT_FILE),
    sha256: Sha256,
    sizeBytes: z.number().int().nonnegative(),
    integrityCheck: z.literal("ok"),
  }),
  /** Rows per table of the snapshot (sqlite_* internals excluded). */
  tables: z.record(z.string(), z.number().int().nonnegative()),
  /**
   * Set when the originals live in an S3 bucket (STORAGE_BACKEND=s3): where they are, e.g.
   * `s3://bucket/prefix/originals/`. They are then not copied and `originals` is empty.
   */
  originalsLocation: z.string().min(1).optional(),
  originals: z.array(
    z.object({
      storageKey: StorageKey,
      /** Path inside the backup folder, always `originals/<storageKey>`. */
      file: z.string(),
      sha256: Sha256,
      sizeBytes: z.number().int().nonnegative(),
    }),
  ),
});

export type BackupManifest = z.infer<typeof ManifestSchema>;

export function writeManifest(dir: string, manifest: BackupManifest): void {
  const target = path.join(dir, MANIFEST_FILE);
  fs.writeFileSync(target + ".part", JSON.stringify(manifest, null, 2) + "\n", { flag: "wx", flush: true });
  fs.renameSync(target + ".part", target);
}

/** Reads and validates a manifest; a missing, unreadable or malformed one is a BackupError. */
export function readManifest(dir: string): BackupManifest {
  const file = path.join(dir, MANIFEST_FILE);
  if (!fs.existsSync(file)) throw new BackupError(`${dir} is not a backup folder: it has no ${MANIFEST_FILE}`);
  let json: unknown;
  try {
    json = JSON.parse(fs.readFileSync(file, "utf8"));
  } catch {
    throw new BackupError(`${file} is not valid JSON`);
  }
  const parsed = ManifestSchema.safeParse(json);
  if (!parsed.success) {
    const first = parsed.error.issues[0];
    throw new BackupError(`${file} is not a Fieldtide backup manifest (${first.path.join(".") || "root"}: ${first.message})`);
  }
  for (const o of parsed.data.originals) {
    if (o.file !== `${ORIGINALS_DIR}/${o.storageKey}`) throw new BackupError(`${file}: original ${o.storageKey} has an unexpected path "${o.file}"`);
  }
  return parsed.data;
}
