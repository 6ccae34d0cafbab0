/**
 * Connection settings shared by every better-sqlite3 connection on the app's database file
 * (Knex's pooled connection and the one lucia uses).
 */
export const BUSY_TIMEOUT_MS = 5000;

type PragmaTarget = { pragma(source: string): unknown };

export function applyPragmas(conn: PragmaTarget): void {
  conn.pragma("journal_mode = WAL");
  conn.pragma("foreign_keys = ON");
  conn.pragma(`busy_timeout = ${BUSY_TIMEOUT_MS}`);
  conn.pragma("synchronous = NORMAL");
}
