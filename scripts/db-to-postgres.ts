/**
 * `npm run db:to-postgres -- [--from FILE] [--to URL]`: moves a Fieldtide SQLite database into
 * an empty PostgreSQL database (same migrations, every table copied in one transaction, id
 * sequences moved on), then prints each table's row count and checksum on both sides.
 * --from defaults to DATABASE_FILE, --to to DATABASE_URL. Exit 0 only when every table matches.
 * Original files are not touched: UPLOAD_DIR (or the bucket) stays where it is.
 */
import fs from "node:fs";
import path from "node:path";
import { parseArgs } from "node:util";
import { createDb } from "../src/server/db/create-db";
import { describeDatabase } from "../src/server/db/engine";
import { MigrationRefusedError, moveSqliteToPostgres } from "../src/server/db/engine/sqlite-to-postgres";
import { getEnv } from "../src/server/env";

const USAGE = "usage: npm run db:to-postgres -- [--from data/fieldtide.sqlite] [--to postgres://user@host:5432/db]";

async function main(): Promise<number> {
  let values: { from?: string; to?: string };
  try {
    ({ values } = parseArgs({ options: { from: { type: "string" }, to: { type: "string" } }, strict: true, allowPositionals: false }));
  } catch (err) {
    console.error(`db:to-postgres: ${(err as Error).message}\n${USAGE}`);
    return 2;
  }
  const env = getEnv();
  const from = path.resolve(values.from ?? env.databaseFile);
  const to = values.to ?? (env.database.engine === "postgres" ? env.database.url : undefined);
  if (!to || !/^postgres(ql)?:\/\//.test(to)) {
    console.error(`db:to-postgres: give the PostgreSQL database with --to postgres://… or DATABASE_URL\n${USAGE}`);
    return 2;
  }
  if (!fs.existsSync(from)) {
    console.error(`db:to-postgres: no SQLite database at ${from}`);
    return 2;
  }
  const target = { engine: "postgres" as const, url: to };
  console.log(`moving ${from} → ${describeDatabase(target)}`);
  const source = createDb(from);
  const dest = createDb(target);
  try {
    const r = await moveSqliteToPostgres(source, dest, (line) => console.log(`  ${line}`));
    const width = Math.max(...r.tables.map((t) => t.table.length));
    console.log(`\n  ${"table".padEnd(width)}  ${"rows sqlite".padStart(11)}  ${"rows pg".padStart(9)}  checksum (sqlite = pg)`);
    for (const t of r.tables) {
      const mark = t.same ? "same" : `DIFFERENT (pg ${t.target.checksum})`;
      console.log(`  ${t.table.padEnd(width)}  ${String(t.source.rows).padStart(11)}  ${String(t.target.rows).padStart(9)}  ${t.source.checksum} ${mark}`);
    }
    console.log(r.allSame ? `\nall ${r.tables.length} tables match (row counts and checksums), ${r.seconds.toFixed(1)} s` : "\nTABLES DIFFER: see above");
    return r.allSame ? 0 : 1;
  } catch (err) {
    if (err instanceof MigrationRefusedError) {
      console.error(`db:to-postgres: ${err.message}`);
      return 1;
    }
    console.error(`db:to-postgres: ${err instanceof Error ? err.message : String(err)}`);
    return 1;
  } finally {
    await source.destroy();
    await dest.destroy();
  }
}

main().then((code) => (process.exitCode = code));
