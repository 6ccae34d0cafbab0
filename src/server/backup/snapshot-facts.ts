/** Facts read from a database file for the manifest and for checking a restore: tables, row counts, migrations, referenced files. */
import type Database from "better-sqlite3";
import { originalsDir } from "../storage/layout";

/**
 * Columns that name a file under UPLOAD_DIR (see migrations/0002_field_logs.ts: field_logs.storage_key
 * is the file name under UPLOAD_DIR/originals, field_logs.sha256 the hex digest of its bytes).
 */
export const FILE_REFERENCES = [{ table: "field_logs", keyColumn: "storage_key", sha256Column: "sha256", dirOf: originalsDir }] as const;

const KNEX_MIGRATIONS = "knex_migrations";

function quoteIdent(name: string): string {
  return `"${name.replace(/"/g, '""')}"`;
}

export function tableNames(db: Database.Database): string[] {
  return (db.prepare("SELECT name FROM sqlite_master WHERE type = 'table' AND name NOT LIKE 'sqlite_%' ORDER BY name").all() as { name: string }[]).map(
    (r) => r.name,
  );
}

export function rowCounts(db: Database.Database): Record<string, number> {
  const counts: Record<string, number> = {};
  for (const t of tableNames(db)) counts[t] = (db.prepare(`SELECT COUNT(*) AS n FROM ${quoteIdent(t)}`).get() as { n: number }).n;
  return counts;
}

export function appliedMigrations(db: Database.Database): string[] {
  if (!tableNames(db).includes(KNEX_MIGRATIONS)) return [];
  return (db.prepare(`SELECT name FROM ${KNEX_MIGRATIONS} ORDER BY id`).all() as { name: string }[]).map((r) => r.name);
}

/** `PRAGMA integrity_check` joined into one string: "ok" when the file is sound. */
export function integrityCheck(db: Database.Database): string {
  return (db.pragma("integrity_check") as { integrity_check: string }[]).map((r) => r.integrity_check).join("; ");
}

export interface ReferencedFile {
  storageKey: string;
  /** Digest recorded when the file was uploaded. */
  sha256: string;
  /** Folder of the file under a given UPLOAD_DIR. */
  dirOf: (uploadDir: string) => string;
}

/** Files the database refers to; a table or column not there yet (older migration level) contributes none. */
export function referencedFiles(db: Database.Database): ReferencedFile[] {
  const tables = new Set(tableNames(db));
  const out: ReferencedFile[] = [];
  for (const ref of FILE_REFERENCES) {
    if (!tables.has(ref.table)) continue;
    const columns = new Set((db.pragma(`table_info(${quoteIdent(ref.table)})`) as { name: string }[]).map((c) => c.name));
    if (!columns.has(ref.keyColumn) || !columns.has(ref.sha256Column)) continue;
    const rows = db
      .prepare(`SELECT ${quoteIdent(ref.keyColumn)} AS k, ${quoteIdent(ref.sha256Column)} AS s FROM ${quoteIdent(ref.table)} ORDER BY 1`)
      .all() as { k: string; s: string }[];
    for (const r of rows) out.push({ storageKey: r.k, sha256: r.s, dirOf: ref.dirOf });
  }
  return out;
}
