/**
 * Knex migration source with the migration files imported statically, so the same list works
 * under tsx (scripts), vitest and the Next server bundle. Add new migrations here, in order.
 */
import type { Knex } from "knex";
import * as m0001 from "@/migrations/0001_foundation";
import * as m0002 from "@/migrations/0002_field_logs";
import * as m0003 from "@/migrations/0003_day_workspace";
import * as m0004 from "@/migrations/0004_qa_review";
import * as m0005 from "@/migrations/0005_sign_in_throttle";

type Migration = { up(knex: Knex): Promise<void>; down(knex: Knex): Promise<void> };

const MIGRATIONS: ReadonlyArray<readonly [string, Migration]> = [
  ["0001_foundation", m0001],
  ["0002_field_logs", m0002],
  ["0003_day_workspace", m0003],
  ["0004_qa_review", m0004],
  ["0005_sign_in_throttle", m0005],
];

export const MIGRATION_NAMES: readonly string[] = MIGRATIONS.map(([name]) => name);

export const migrationSource: Knex.MigrationSource<string> = {
  async getMigrations() {
    return MIGRATION_NAMES.slice();
  },
  getMigrationName(name) {
    return name;
  },
  async getMigration(name) {
    const found = MIGRATIONS.find(([n]) => n === name);
    if (!found) throw new Error(`Unknown migration ${name}`);
    return found[1];
  },
};

export type MigrationLevel = { current: string | null; latest: string; pending: number };

export async function migrateToLatest(knex: Knex): Promise<string[]> {
  const [, applied] = (await knex.migrate.latest({ migrationSource })) as [number, string[]];
  return applied;
}

export async function migrationLevel(knex: Knex): Promise<MigrationLevel> {
  const [completed, pending] = (await knex.migrate.list({ migrationSource })) as [Array<{ name: string } | string>, unknown[]];
  const names = completed.map((c) => (typeof c === "string" ? c : c.name));
  return {
    current: names.length > 0 ? names[names.length - 1] : null,
    latest: MIGRATION_NAMES[MIGRATION_NAMES.length - 1],
    pending: pending.length,
  };
}
