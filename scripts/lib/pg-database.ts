/**
 * Throwaway PostgreSQL databases for the test suites and benches: a fresh database on a server
 * given by its admin URL (e.g. postgres://postgres@127.0.0.1:55432/postgres, from
 * scripts/pg-local.sh), made before a run and dropped after it.
 */
import { randomUUID } from "node:crypto";
import pg from "pg";

/** A database name that no other run uses: `prefix_` + 12 hex digits (a valid unquoted identifier). */
export function newPgDatabaseName(prefix: string): string {
  return `${prefix}_${randomUUID().replace(/-/g, "").slice(0, 12)}`;
}

/** The URL of database `name` on the admin URL's server, with the same user and password. */
export function pgDatabaseUrl(adminUrl: string, name: string): string {
  const u = new URL(adminUrl);
  u.pathname = `/${name}`;
  return u.toString();
}

async function onAdmin(adminUrl: string, sql: string): Promise<void> {
  const client = new pg.Client({ connectionString: adminUrl });
  await client.connect();
  try {
    await client.query(sql);
  } finally {
    await client.end();
  }
}

export function createPgDatabase(adminUrl: string, name: string): Promise<void> {
  return onAdmin(adminUrl, `CREATE DATABASE ${name}`);
}

/** Drops the database even while something is still connected to it. */
export function dropPgDatabase(adminUrl: string, name: string): Promise<void> {
  return onAdmin(adminUrl, `DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
}
