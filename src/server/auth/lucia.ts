import "server-only";
/**
 * The only module that touches lucia. Lucia's SQLite adapter gets its own better-sqlite3
 * connection on DATABASE_FILE with the same pragmas as Knex's (WAL, foreign keys, busy timeout).
 * Knex keeps its single pooled connection; WAL lets both read concurrently.
 * Rule: never call lucia while a Knex write transaction is open (the adapter is synchronous
 * and would wait on the lock the transaction holds); write to `sessions` through the
 * transaction instead (see password-reset.ts).
 */
import Database from "better-sqlite3";
import { BetterSqlite3Adapter } from "@lucia-auth/adapter-sqlite";
import { Lucia, TimeSpan } from "lucia";
import fs from "node:fs";
import path from "node:path";
import { getEnv } from "../env";
import { applyPragmas } from "../db/pragmas";

export const SESSION_COOKIE_NAME = "fieldtide_session";

type DatabaseUserAttributes = { email: string; name: string; is_admin: number };

function buildLucia(file: string) {
  fs.mkdirSync(path.dirname(file), { recursive: true });
  const sqlite = new Database(file);
  applyPragmas(sqlite);
  const env = getEnv();
  const lucia = new Lucia(new BetterSqlite3Adapter(sqlite, { user: "users", session: "sessions" }), {
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
  return { lucia, sqlite };
}

type AppLucia = ReturnType<typeof buildLucia>["lucia"];

declare module "lucia" {
  interface Register {
    Lucia: AppLucia;
    DatabaseUserAttributes: DatabaseUserAttributes;
  }
}

type Cached = { file: string } & ReturnType<typeof buildLucia>;
const globalForLucia = globalThis as unknown as { __fieldtideLucia?: Cached };

export function getLucia(): AppLucia {
  const file = getEnv().databaseFile;
  const cached = globalForLucia.__fieldtideLucia;
  if (cached && cached.file === file) return cached.lucia;
  if (cached) cached.sqlite.close();
  const built = buildLucia(file);
  globalForLucia.__fieldtideLucia = { file, ...built };
  return built.lucia;
}

/** Closes lucia's connection (tests). */
export function closeLucia(): void {
  const cached = globalForLucia.__fieldtideLucia;
  globalForLucia.__fieldtideLucia = undefined;
  cached?.sqlite.close();
}
