import "server-only";
/** Health: app version, database reachable, migration level. */
import { getDb } from "./db/client";
import { migrationLevel, type MigrationLevel } from "./db/migration-source";
import { APP_VERSION } from "./version";

export type Health =
  | { status: "ok"; version: string; database: { reachable: true; migration: MigrationLevel } }
  | { status: "error"; version: string; database: { reachable: false } };

export async function checkHealth(): Promise<Health> {
  try {
    const db = getDb();
    await db.raw("select 1");
    return { status: "ok", version: APP_VERSION, database: { reachable: true, migration: await migrationLevel(db) } };
  } catch (err) {
    console.error("health: database not reachable:", err instanceof Error ? err.message : String(err));
    return { status: "error", version: APP_VERSION, database: { reachable: false } };
  }
}
