/**
 * Demo logs into the demo surveys: generates the scenario's base and rover files (through
 * scripts/generate-demo-logs.ts, which writes them with their manifest) and imports each one
 * through the same import service as the upload page, as the crew member of its survey
 * (BRM-26: crew@copperwren.example; SDK-26 has no crew, so its lead). Idempotent: a file whose
 * SHA-256 is already in its survey is skipped.
 *
 *   node --conditions=react-server --import tsx scripts/load-demo-logs.ts [folder]
 *   (or: npx tsx --conditions=react-server scripts/load-demo-logs.ts [folder])
 *
 * Uses DATABASE_FILE and UPLOAD_DIR like the app; the database must be migrated and seeded.
 */
import { createHash } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { z } from "zod";
import { PROJECT_ROOT, runStep } from "./lib/app-process";

const UPLOADER_BY_SURVEY: Record<string, string> = {
  "BRM-26": "crew@copperwren.example",
  "SDK-26": "lead@copperwren.example",
};

/** The fields scripts/generate-demo-logs.ts writes per file. */
const ManifestSchema = z.array(
  z.object({
    file: z.string().min(1),
    surveyCode: z.string(),
    date: z.string(),
    kind: z.enum(["base", "rover"]),
    rows: z.number().int(),
    timeBasis: z.enum(["utc", "gps", "local"]),
    instrument: z.string(),
    sensor: z.enum(["proton-precession", "overhauser", "other"]),
    operator: z.string(),
    baseSite: z.object({ name: z.string(), latitudeDeg: z.number(), longitudeDeg: z.number(), heightM: z.number() }).optional(),
  }),
);

function sha256File(file: string): string {
  return createHash("sha256").update(fs.readFileSync(file)).digest("hex");
}

export async function loadDemoLogs(folder: string): Promise<{ imported: number; skipped: number }> {
  await runStep(process.execPath, ["--import", "tsx", path.join(PROJECT_ROOT, "scripts", "generate-demo-logs.ts"), folder]);
  const manifest = ManifestSchema.parse(JSON.parse(fs.readFileSync(path.join(folder, "manifest.json"), "utf8")));
  const { getDb, closeDb } = await import("../src/server/db/client");
  const { importLogStream } = await import("../src/server/logs/import-service");
  const { actorFromRow } = await import("../src/server/auth/actor");
  const { closeOriginalStore } = await import("../src/server/storage/store");
  const db = getDb();
  let imported = 0;
  let skipped = 0;
  try {
    for (const entry of manifest) {
      const survey = await db("surveys").select("id").where({ code: entry.surveyCode }).first();
      const email = UPLOADER_BY_SURVEY[entry.surveyCode];
      const user = email ? await db("users").where({ email }).first() : undefined;
      if (!survey || !user) throw new Error(`survey ${entry.surveyCode} or its uploader ${email ?? "?"} is missing: seed the demo first (npm run db:seed)`);
      const file = path.join(folder, entry.file);
      if (await db("field_logs").where({ survey_id: survey.id, sha256: sha256File(file) }).first()) {
        console.log(`${entry.file}: already in ${entry.surveyCode}, skipped`);
        skipped++;
        continue;
      }
      const result = await importLogStream(actorFromRow(user), survey.id, fs.createReadStream(file), {
        kind: entry.kind,
        fileName: entry.file,
        instrument: entry.instrument,
        sensorType: entry.sensor,
        operator: entry.operator,
        timeBasis: entry.timeBasis,
        baseSiteName: entry.baseSite?.name,
        baseLatitudeDeg: entry.baseSite?.latitudeDeg,
        baseLongitudeDeg: entry.baseSite?.longitudeDeg,
        baseHeightM: entry.baseSite?.heightM,
      });
      if (result.log.readingCount !== entry.rows) throw new Error(`${entry.file}: stored ${result.log.readingCount} readings, the generator wrote ${entry.rows}`);
      console.log(`${entry.file}: ${result.log.readingCount} readings into ${entry.surveyCode} (${result.log.days.join(", ")})`);
      imported++;
    }
  } finally {
    await closeDb();
    await closeOriginalStore();
  }
  return { imported, skipped };
}

const isMain = process.argv[1] && path.resolve(process.argv[1]) === path.resolve(import.meta.filename);
if (isMain) {
  const folder = path.resolve(process.argv[2] ?? path.join(PROJECT_ROOT, "data", "demo-logs"));
  loadDemoLogs(folder)
    .then(({ imported, skipped }) => console.log(`demo logs: ${imported} imported, ${skipped} already present`))
    .catch((err: unknown) => {
      const detail = err && typeof err === "object" && "details" in err ? ` ${JSON.stringify((err as { details: unknown }).details).slice(0, 400)}` : "";
      console.error(`load-demo-logs: ${err instanceof Error ? err.message : String(err)}${detail}`);
      process.exitCode = 1;
    });
}
