/**
 * Database chores: `tsx scripts/db.ts migrate|seed [--replace]|reset|status`.
 * `seed` leaves an already seeded demo as it is; `--replace` rebuilds the demo rows.
 * Uses the same migration source and database as the app (DATABASE_URL for PostgreSQL, else
 * the SQLite file DATABASE_FILE).
 */
import { getEnv } from "../src/server/env";
import { createDb } from "../src/server/db/create-db";
import { describeDatabase, resetDatabase } from "../src/server/db/engine";
import { migrateToLatest, migrationLevel } from "../src/server/db/migration-source";
import { seed } from "../seeds/01_demo";

const USAGE = "usage: tsx scripts/db.ts migrate | seed [--replace] | reset | status";

async function main(command: string | undefined): Promise<void> {
  if (!command || !["migrate", "seed", "reset", "status"].includes(command)) {
    console.error(USAGE);
    process.exitCode = 2;
    return;
  }
  const config = getEnv().database;
  const where = describeDatabase(config);
  if (command === "reset") {
    await resetDatabase(config);
    console.log(config.engine === "sqlite" ? `deleted ${where}` : `dropped every table of ${where}`);
  }
  const knex = createDb(config);
  try {
    if (command === "migrate" || command === "reset") {
      const applied = await migrateToLatest(knex);
      console.log(applied.length ? `applied migrations: ${applied.join(", ")}` : "migrations: already up to date");
    }
    if (command === "seed" || command === "reset") {
      const level = await migrationLevel(knex);
      if (level.pending > 0) throw new Error(`${level.pending} migration(s) pending; run \`npm run db:migrate\` first`);
      const r = await seed(knex, { replace: process.argv.includes("--replace") });
      console.log(
        r.kept
          ? "demo data already present: left as it is (use `seed --replace` to rebuild it)"
          : `seeded demo data: ${r.users} users, ${r.surveys} surveys, ${r.members} memberships` +
              (r.replaced ? ` (replaced ${r.replaced} existing demo rows)` : ""),
      );
    }
    const level = await migrationLevel(knex);
    console.log(`database ${where}: migration ${level.current ?? "none"} of ${level.latest}, ${level.pending} pending`);
  } finally {
    await knex.destroy();
  }
}

main(process.argv[2]).catch((err: unknown) => {
  console.error(`db: ${err instanceof Error ? err.message : String(err)}`);
  process.exitCode = 1;
});
