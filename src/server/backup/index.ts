export { BackupError } from "./errors";
export { createBackup, defaultBackupName, type BackupResult, type CreateBackupOptions } from "./create-backup";
export { restoreBackup, type RestoreOptions, type RestoreResult } from "./restore-backup";
export { readManifest, ManifestSchema, MANIFEST_FILE, SNAPSHOT_FILE, ORIGINALS_DIR, type BackupManifest } from "./manifest";
export { FILE_REFERENCES, rowCounts, integrityCheck, appliedMigrations, referencedFiles } from "./snapshot-facts";
export { sha256File } from "./file-copy";
