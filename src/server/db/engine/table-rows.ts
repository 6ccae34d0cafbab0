/**
 * Whole tables as arrays of values on either engine, in pages (for the SQLite → PostgreSQL
 * migration and its checksums): SQLite pages by rowid; PostgreSQL reads the (filtered) rows in
 * one query, so callers filter big tables by log. No row objects.
 */
import type Database from "better-sqlite3";
import type { Knex } from "knex";
import type { PoolClient as PgClient } from "pg";
import { engineOf } from "./engine-of";

export type Cell = number | string | Buffer | null;
export type TableRows = { columns: string[]; rows: Cell[][] };

const quote = (name: string) => `"${name.replace(/"/g, '""')}"`;

/** Column names of a table, in declaration order. */
export async function tableColumns(db: Knex, table: string): Promise<string[]> {
  const info = await db(table).columnInfo();
  const names = Object.keys(info);
  if (engineOf(db) === "sqlite") {
    // columnInfo keeps declaration order on SQLite; on PostgreSQL ask for ordinal order
    return names;
  }
  const r = await db.raw("SELECT column_name FROM information_schema.columns WHERE table_schema = current_schema() AND table_name = ? ORDER BY ordinal_position", [table]);
  return (r.rows as { column_name: string }[]).map((c) => c.column_name);
}

type Pool = { acquireConnection(): Promise<unknown>; releaseConnection(c: unknown): Promise<unknown> };

/**
 * Calls `onPage` with successive pages of a table's rows (values in `columns` order), optionally
 * only rows where `filter.column = filter.value`. SQLite pages by rowid; PostgreSQL reads the
 * filtered rows at once (callers filter big tables by log).
 */
export async function forEachTablePage(
  db: Knex,
  table: string,
  columns: string[],
  onPage: (rows: Cell[][]) => Promise<void> | void,
  filter?: { column: string; value: number | string },
  pageRows = 50_000,
): Promise<void> {
  const pool = db.client as unknown as Pool;
  const list = columns.map(quote).join(", ");
  if (engineOf(db) === "sqlite") {
    const conn = (await pool.acquireConnection()) as Database.Database;
    try {
      const where = filter ? `AND ${quote(filter.column)} = ?` : "";
      const stmt = conn.prepare(`SELECT rowid, ${list} FROM ${quote(table)} WHERE rowid > ? ${where} ORDER BY rowid LIMIT ${pageRows}`).raw(true);
      let after = -Infinity;
      for (;;) {
        const page = (filter ? stmt.all(after, filter.value) : stmt.all(after)) as Cell[][];
        if (page.length === 0) return;
        after = page[page.length - 1][0] as number;
        await onPage(page.map((r) => r.slice(1)));
        if (page.length < pageRows) return;
      }
    } finally {
      await pool.releaseConnection(conn);
    }
  }
  const conn = (await pool.acquireConnection()) as PgClient;
  try {
    const r = await conn.query<Cell[]>({
      text: `SELECT ${list} FROM ${quote(table)}${filter ? ` WHERE ${quote(filter.column)} = $1` : ""}`,
      values: filter ? [filter.value] : [],
      rowMode: "array",
    });
    for (let i = 0; i < r.rows.length; i += pageRows) await onPage(r.rows.slice(i, i + pageRows));
  } finally {
    await pool.releaseConnection(conn);
  }
}
