/**
 * Moves a Fieldtide SQLite database into an empty PostgreSQL database: the same migrations are
 * run on the target, every table is copied with COPY in foreign-key order inside one
 * transaction, id sequences are moved past the copied ids, and then each table's row count and
 * content checksum are compared on both sides. The source is opened read-only and never changed.
 */
import type { Knex } from "knex";
import { migrateToLatest, migrationLevel } from "../migration-source";
import { copyRowsIntoPostgres, resetPostgresSequences } from "./postgres";
import { checksumTable, type TableChecksum } from "./table-checksum";
import { forEachTablePage, tableColumns } from "./table-rows";

/** Knex's own bookkeeping: written by migrateToLatest on the target, not copied. */
const KNEX_TABLES = new Set(["knex_migrations", "knex_migrations_lock"]);
/** Tables holding many rows per log: copied and checksummed one log at a time. */
const PER_LOG_TABLES = new Set(["log_readings", "log_problems"]);

export class MigrationRefusedError extends Error {}

export type TableResult = { table: string; source: TableChecksum; target: TableChecksum; same: boolean };
export type MoveResult = { tables: TableResult[]; allSame: boolean; seconds: number };

async function appTables(db: Knex): Promise<string[]> {
  const rows = (await db("sqlite_master").where({ type: "table" }).whereNot("name", "like", "sqlite_%").pluck("name")) as string[];
  return rows.filter((n) => !KNEX_TABLES.has(n)).sort();
}

/** Tables ordered so that each comes after the tables its foreign keys point to. */
async function inForeignKeyOrder(source: Knex, tables: string[]): Promise<string[]> {
  const deps = new Map<string, Set<string>>();
  for (const t of tables) {
    const fks = (await source.raw(`PRAGMA foreign_key_list("${t.replace(/"/g, '""')}")`)) as { table: string }[];
    deps.set(t, new Set(fks.map((f) => f.table).filter((p) => p !== t && tables.includes(p))));
  }
  const ordered: string[] = [];
  const placed = new Set<string>();
  while (ordered.length < tables.length) {
    const next = tables.filter((t) => !placed.has(t) && [...deps.get(t)!].every((d) => placed.has(d)));
    if (next.length === 0) throw new MigrationRefusedError("the tables' foreign keys form a cycle; cannot order the copy");
    for (const t of next) {
      ordered.push(t);
      placed.add(t);
    }
  }
  return ordered;
}

async function checkTargetEmpty(target: Knex, tables: string[]): Promise<void> {
  const busy: string[] = [];
  for (const t of tables) {
    const row = await target(t).count({ n: "*" }).first();
    if (Number(row?.n) > 0) busy.push(`${t} (${row?.n} rows)`);
  }
  if (busy.length > 0) throw new MigrationRefusedError(`the PostgreSQL database already holds data: ${busy.join(", ")}; migrate into an empty database`);
}

async function checkSameMigrations(source: Knex, target: Knex): Promise<void> {
  const level = await migrationLevel(source);
  if (level.pending > 0 || level.current !== level.latest) {
    throw new MigrationRefusedError(`the SQLite database is at migration ${level.current ?? "none"}, this Fieldtide expects ${level.latest}: run \`npm run db:migrate\` on it first`);
  }
  await migrateToLatest(target);
}

async function logIds(db: Knex): Promise<number[]> {
  return ((await db("field_logs").orderBy("id").pluck("id")) as number[]).map(Number);
}

/**
 * Copies `source` (SQLite) into `target` (PostgreSQL, empty). Throws MigrationRefusedError
 * before writing anything when the source is not fully migrated or the target holds data.
 */
export async function moveSqliteToPostgres(source: Knex, target: Knex, log: (line: string) => void = () => undefined): Promise<MoveResult> {
  const started = Date.now();
  await checkSameMigrations(source, target);
  const tables = await inForeignKeyOrder(source, await appTables(source));
  await checkTargetEmpty(target, tables);
  const columnsOf = new Map<string, string[]>();
  for (const t of tables) {
    const cols = await tableColumns(source, t);
    const targetCols = new Set(await tableColumns(target, t));
    const missing = cols.filter((c) => !targetCols.has(c));
    if (missing.length > 0) throw new MigrationRefusedError(`table ${t}: columns ${missing.join(", ")} are missing on PostgreSQL`);
    columnsOf.set(t, cols);
  }
  const logs = await logIds(source);

  await target.transaction(async (trx) => {
    for (const t of tables) {
      const cols = columnsOf.get(t)!;
      let copied = 0;
      const onPage = async (rows: unknown[][]) => {
        await copyRowsIntoPostgres(trx, t, cols, rows);
        copied += rows.length;
      };
      if (PER_LOG_TABLES.has(t)) for (const id of logs) await forEachTablePage(source, t, cols, onPage, { column: "log_id", value: id });
      else await forEachTablePage(source, t, cols, onPage);
      log(`copied ${t}: ${copied} rows`);
    }
    const withSerialIds = tables.filter((t) => columnsOf.get(t)!.includes("id"));
    await resetPostgresSequences(trx, withSerialIds);
  });

  const results: TableResult[] = [];
  for (const t of tables) {
    const cols = columnsOf.get(t)!;
    const byLog = PER_LOG_TABLES.has(t) ? logs : undefined;
    const [s, d] = [await checksumTable(source, t, cols, byLog), await checksumTable(target, t, cols, byLog)];
    results.push({ table: t, source: s, target: d, same: s.rows === d.rows && s.checksum === d.checksum });
  }
  return { tables: results, allSame: results.every((r) => r.same), seconds: (Date.now() - started) / 1000 };
}
