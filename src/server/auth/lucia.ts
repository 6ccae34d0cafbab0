import "server-only";
/**
 * The only module that touches lucia. On PostgreSQL lucia stores sessions through Knex's pool
 * (./knex-session-adapter.ts). On SQLite, lucia's BetterSqlite3Adapter runs on Knex's own pooled
 * better-sqlite3 connection (one connection, pragmas set by the pool's afterCreate). Each lucia
 * call holds that connection exclusively for its duration (withLucia), so it queues behind an
 * open Knex transaction instead of interleaving with it or waiting on a lock from a second
 * connection. Rule: never call withLucia inside a Knex transaction (it would wait for the
 * connection the transaction holds); write `sessions` through the transaction instead.
 */
import type { Database } from "better-sqlite3";
import { BetterSqlite3Adapter } from "@lucia-auth/adapter-sqlite";
import { Lucia, TimeSpan, type Adapter } from "lucia";
import type { Knex } from "knex";
import { getDb } from "../db/client";
import { engineOf } from "../db/engine";
import { getEnv } from "../env";
import { KnexSessionAdapter } from "./knex-session-adapter";

export const SESSION_COOKIE_NAME = "fieldtide_session";
const TABLES = { user: "users", session: "sessions" };

type DatabaseUserAttributes = { email: string; name: string; is_admin: number };

function buildLucia(adapter: Adapter) {
  const env = getEnv();
  return new Lucia(adapter, {
    sessionExpiresIn: new TimeSpan(env.sessionTtlHours, "h"),
    sessionCookie: {
      name: SESSION_COOKIE_NAME,
      expires: true,
      attributes: { secure: env.appUrl.startsWith("https:"), sameSite: "lax", path: "/" },
    },
    getUserAttributes: (attrs: DatabaseUserAttributes) => ({
      email: attrs.email,
      name: attrs.name,
      isAdmin: attrs.is_admin === 1,
    }),
  });
}

type AppLucia = ReturnType<typeof buildLucia>;

declare module "lucia" {
  interface Register {
    Lucia: AppLucia;
    DatabaseUserAttributes: DatabaseUserAttributes;
  }
}

/** Knex's pool, as far as this module uses it (knex's client API, not in its public typings). */
type PoolClient = { acquireConnection(): Promise<Database>; releaseConnection(conn: Database): Promise<unknown> };

const byConnection = new WeakMap<Database, AppLucia>();

let postgresLucia: { db: Knex; lucia: AppLucia } | null = null;

/**
 * Runs `fn` with lucia. SQLite: on Knex's connection, held for the duration of the call.
 * PostgreSQL: through Knex's pool like every other query (KnexSessionAdapter).
 */
export async function withLucia<T>(fn: (lucia: AppLucia) => Promise<T>): Promise<T> {
  const db = getDb();
  if (engineOf(db) === "postgres") {
    if (postgresLucia?.db !== db) postgresLucia = { db, lucia: buildLucia(new KnexSessionAdapter(getDb, TABLES)) };
    return fn(postgresLucia.lucia);
  }
  const client = db.client as unknown as PoolClient;
  const conn = await client.acquireConnection();
  try {
    let lucia = byConnection.get(conn);
    if (!lucia) {
      lucia = buildLucia(new BetterSqlite3Adapter(conn, TABLES));
      byConnection.set(conn, lucia);
    }
    return await fn(lucia);
  } finally {
    await client.releaseConnection(conn);
  }
}

function noDatabase(): never {
  throw new Error("cookie-only lucia instance has no database; use withLucia");
}

const cookieOnlyAdapter: Adapter = {
  getSessionAndUser: noDatabase,
  getUserSessions: noDatabase,
  setSession: noDatabase,
  updateSessionExpiration: noDatabase,
  deleteSession: noDatabase,
  deleteUserSessions: noDatabase,
  deleteExpiredSessions: noDatabase,
};

let cookieLucia: AppLucia | null = null;

/** Lucia for cookie building and parsing only (no database access). */
export function luciaCookies(): Pick<AppLucia, "createSessionCookie" | "createBlankSessionCookie" | "readSessionCookie"> {
  cookieLucia ??= buildLucia(cookieOnlyAdapter);
  return cookieLucia;
}
