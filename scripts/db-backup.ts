/**
 * Backups: `tsx scripts/db-backup.ts backup [--out DIR]` and `restore --from DIR [--force]`
 * (npm run db:backup / db:restore). DATABASE_FILE and UPLOAD_DIR come from the environment,
 * or from --database FILE and --upload-dir DIR. The work is done in src/server/backup.
 */
import path from "node:path";
import { parseArgs } from "node:util";
import { z } from "zod";
import { getEnv } from "../src/server/env";
import { APP_VERSION } from "../src/server/version";
import { MIGRATION_NAMES } from "../src/server/db/migration-source";
import { createBackup, defaultBackupName, restoreBackup } from "../src/server/backup";
import { s3OriginalsLocation } from "../src/server/storage/layout";

const USAGE = [
  "usage: tsx scripts/db-backup.ts backup [--out DIR] [--database FILE] [--upload-dir DIR]",
  "       tsx scripts/db-backup.ts restore --from DIR [--force] [--database FILE] [--upload-dir DIR]",
].join("\n");

const ArgsSchema = z.discriminatedUnion("command", [
  z.object({ command: z.literal("backup"), out: z.string().min(1).optional(), from: z.undefined(), force: z.undefined() }),
  z.object({ command: z.literal("restore"), from: z.string({ error: "restore needs --from DIR" }).min(1), out: z.undefined(), force: z.boolean().optional() }),
]);

async function main(argv: string[]): Promise<number> {
  let parsed;
  try {
    parsed = parseArgs({
      args: argv,
      allowPositionals: true,
      options: { out: { type: "string" }, from: { type: "string" }, force: { type: "boolean" }, database: { type: "string" }, "upload-dir": { type: "string" } },
    });
  } catch (err) {
    console.error(`db-backup: ${err instanceof Error ? err.message : String(err)}\n${USAGE}`);
    return 2;
  }
  const { positionals, values } = parsed;
  if (positionals[0] !== "backup" && positionals[0] !== "restore") {
    console.error(`db-backup: ${positionals[0] ? `unknown command "${positionals[0]}"` : "no command"}\n${USAGE}`);
    return 2;
  }
  const args = ArgsSchema.safeParse({ command: positionals[0], out: values.out, from: values.from, force: values.force });
  if (!args.success || positionals.length !== 1) {
    const why = args.success ? "one command only" : args.error.issues[0].message;
    console.error(`db-backup: ${why}\n${USAGE}`);
    return 2;
  }
  const env = getEnv();
  if (env.database.engine === "postgres" && !values.database) {
    console.error("db-backup: this backs up the SQLite database; DATABASE_URL points at PostgreSQL: use pg_dump / pg_restore there (README, Running at scale)");
    return 2;
  }
  const databaseFile = values.database ? path.resolve(values.database) : env.databaseFile;
  const uploadDir = values["upload-dir"] ? path.resolve(values["upload-dir"]) : env.uploadDir;

  if (args.data.command === "backup") {
    const outDir = path.resolve(args.data.out ?? path.join("data", "backups", defaultBackupName(new Date())));
    // With STORAGE_BACKEND=s3 the originals stay in the bucket: the backup names it and copies none.
    const originalsLocation = env.storage.backend === "s3" ? s3OriginalsLocation(env.storage) : undefined;
    const r = await createBackup({ databaseFile, uploadDir, outDir, appVersion: APP_VERSION, originalsLocation });
    const rows = Object.values(r.manifest.tables).reduce((a, b) => a + b, 0);
    console.log(`backup written to ${r.dir}`);
    console.log(`  database: ${Object.keys(r.manifest.tables).length} tables, ${rows} rows, migration ${r.manifest.migration.current ?? "none"}, integrity ok`);
    if (r.manifest.originalsLocation) console.log(`  originals: NOT copied; they live in ${r.manifest.originalsLocation} (protect that bucket with its own versioning or replication)`);
    else console.log(`  originals: ${r.manifest.originals.length} files; SHA-256 of every file in manifest.json`);
    return 0;
  }
  const r = await restoreBackup({ fromDir: path.resolve(args.data.from), databaseFile, uploadDir, force: args.data.force, knownMigrations: MIGRATION_NAMES });
  console.log(`restored ${r.databaseFile} from the backup of ${r.manifest.createdAt} (checksums and integrity_check ok)`);
  if (r.manifest.originalsLocation) {
    console.log(`  originals: none in this backup; the database expects them in ${r.manifest.originalsLocation}`);
    const here = env.storage.backend === "s3" ? s3OriginalsLocation(env.storage) : path.join(uploadDir, "originals");
    if (here !== r.manifest.originalsLocation) console.log(`  note: this environment keeps originals in ${here}; set STORAGE_BACKEND=s3 and S3_* to that bucket before starting the app`);
  }
  else console.log(`  originals: ${r.copiedFiles} copied, ${r.keptFiles} already in place, into ${path.join(uploadDir, "originals")}`);
  if (r.replacedTo) console.log(`  the database it replaced was moved to ${r.replacedTo}`);
  return 0;
}

main(process.argv.slice(2)).then(
  (code) => {
    process.exitCode = code;
  },
  (err: unknown) => {
    console.error(`db-backup: ${err instanceof Error ? err.message : String(err)}`);
    process.exitCode = 1;
  },
);
