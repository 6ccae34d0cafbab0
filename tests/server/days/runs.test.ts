/**
 * Processing settings, pairing, numbered correction runs and their exports against a real SQLite
 * file. The CSV export must carry exactly the values of `npx tsx src/cli/index.ts correct` on the
 * same original files with the same parameters.
 */
import { execFile } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { promisify } from "node:util";
import { beforeAll, describe, expect, it } from "vitest";
import { setupTestDatabase } from "../../support/test-db";
import { BASE_POSITION, DAY, baseCsv, roverCsv, streamOf } from "./day-fixtures";

const testDb = setupTestDatabase();
process.env.UPLOAD_DIR = path.join(testDb.dir, "uploads");

const { importLogStream } = await import("@/src/server/logs/import-service");
const { updateProcessingSettings, getProcessingSettings, listProcessingSettingChanges, listBaseSiteNames } = await import("@/src/server/processing/service");
const { NotFoundError } = await import("@/src/server/errors");
const { DEFAULT_PROCESSING_SETTINGS } = await import("@/src/server/processing/schema");
const { listDays, getDayPairing } = await import("@/src/server/days/service");
const runs = await import("@/src/server/runs/service");
const { PROCESS_ID } = await import("@/src/server/runs/process-id");
const { exportRunCsv, exportRunGeoJson } = await import("@/src/server/runs/export");
const { getDb } = await import("@/src/server/db/client");
const { ValidationError, ConflictError } = await import("@/src/server/errors");
const { makeUser, makeSurvey, addMember } = await import("../../support/fixtures");

const run = promisify(execFile);
type Actor = Awaited<ReturnType<typeof makeUser>>;
let processor: Actor;
let surveyId: string;
let files: { base: string; rover: string };

async function importFile(actor: Actor, sid: string, file: string, fields: Record<string, unknown>) {
  return importLogStream(actor, sid, streamOf(fs.readFileSync(file, "utf8")), { fileName: path.basename(file), ...fields });
}

beforeAll(async () => {
  processor = await makeUser({ name: "Pat Processor" });
  surveyId = await makeSurvey();
  await addMember(surveyId, processor.userId, "processor");
  files = { base: path.join(testDb.dir, "base-day1.csv"), rover: path.join(testDb.dir, "rover-day1.csv") };
  fs.writeFileSync(files.base, baseCsv({ gap: { fromMin: 50, toMin: 60 } }));
  fs.writeFileSync(files.rover, roverCsv());
  await importFile(processor, surveyId, files.base, {
    kind: "base", instrument: "B1", baseSiteName: "Gatehouse", baseLatitudeDeg: BASE_POSITION.latDeg, baseLongitudeDeg: BASE_POSITION.lonDeg, baseHeightM: BASE_POSITION.heightM,
  });
  await importFile(processor, surveyId, files.rover, { kind: "rover", instrument: "R1", acceptGoodRows: true });
});

describe("processing settings", () => {
  it("start at the defaults and record each change with who, when, old and new", async () => {
    const initial = await getProcessingSettings(processor, surveyId);
    expect(initial.revision).toBe(0);
    expect(initial.settings).toEqual(DEFAULT_PROCESSING_SETTINGS);
    const { record, changes } = await updateProcessingSettings(processor, surveyId, { ...initial.settings, interpolation: "spline", maxBaseGapS: "90" });
    expect(record.revision).toBe(1);
    expect(changes.map((c) => [c.setting, c.oldValue, c.newValue]).sort()).toEqual([
      ["interpolation", "linear", "spline"],
      ["maxBaseGapS", 120, 90],
    ]);
    expect(changes[0].changedBy).toBe("Pat Processor");
    // back to the defaults for the runs below
    await updateProcessingSettings(processor, surveyId, DEFAULT_PROCESSING_SETTINGS);
    const history = await listProcessingSettingChanges(processor, surveyId);
    expect(history).toHaveLength(4);
    expect(history[0].revision).toBe(2);
  });

  it("list the base sites of the survey's base logs, to members only", async () => {
    expect(await listBaseSiteNames(processor, surveyId)).toEqual(["Gatehouse"]);
    const outsider = await makeUser();
    await expect(listBaseSiteNames(outsider, surveyId)).rejects.toBeInstanceOf(NotFoundError);
  });

  it("refuse a fixed datum without its value, and a reference datum without a model, with field errors", async () => {
    await expect(updateProcessingSettings(processor, surveyId, { ...DEFAULT_PROCESSING_SETTINGS, datumKind: "value", datumValueNt: "" })).rejects.toSatisfy(
      (e: unknown) => e instanceof ValidationError && "datumValueNt" in e.fieldErrors,
    );
    await expect(updateProcessingSettings(processor, surveyId, { ...DEFAULT_PROCESSING_SETTINGS, datumKind: "reference", referenceModel: "none" })).rejects.toSatisfy(
      (e: unknown) => e instanceof ValidationError && "referenceModel" in e.fieldErrors,
    );
    expect((await getProcessingSettings(processor, surveyId)).revision).toBe(2);
  });
});

describe("days and pairing", () => {
  it("lists the day with its logs and pairs the base log of the main site with the rover log", async () => {
    const days = await listDays(processor, surveyId);
    expect(days.map((d) => d.day)).toEqual([DAY]);
    const pairing = await getDayPairing(processor, surveyId, DAY);
    expect(pairing.method).toBe("base");
    expect(pairing.baseLog?.originalName).toBe("base-day1.csv");
    expect(pairing.roverLogs.map((l) => l.originalName)).toEqual(["rover-day1.csv"]);
  });
});

describe("correction runs", () => {
  it("numbers runs, stores parameters, model and inputs with SHA-256, and exports the CLI's values", async () => {
    const queued = await runs.startRun(processor, surveyId, DAY);
    expect(queued.number).toBe(1);
    expect(["queued", "running"]).toContain(queued.status);
    const done = await runs.waitForRun(processor, surveyId, DAY, 1);
    expect(done.error).toBeNull();
    expect(done.status).toBe("done");
    expect(done.modelName).toBe("IGRF-14");
    expect(done.modelVersion).toBeTruthy();
    expect(done.createdBy).toBe("Pat Processor");
    const logs = await getDb()("field_logs").where({ survey_id: surveyId }).select("id", "sha256", "original_name");
    expect(done.inputs.map((i) => [i.role, i.sha256]).sort()).toEqual(
      [["base", logs.find((l) => l.original_name === "base-day1.csv")!.sha256], ["rover", logs.find((l) => l.original_name === "rover-day1.csv")!.sha256]].sort(),
    );
    expect(done.parameters).toMatchObject({ datum: "median", method: "linear", maxGapS: 120, referenceModel: "igrf", basePosition: BASE_POSITION });

    const csv = Buffer.concat((await exportRunCsv(processor, surveyId, DAY, 1)).chunks).toString("utf8");
    const header = csv.split("\n").filter((l) => l.startsWith("#"));
    for (const what of ["survey:", "day: 2026-05-04", "run: 1", "datum: median", "method: linear", "model: IGRF-14", "GPS offset: GPS − UTC = 18 s", "caution:"]) {
      expect(header.some((l) => l.includes(what)), what).toBe(true);
    }

    const out = path.join(testDb.dir, "cli-out.csv");
    await run(process.execPath, [
      "node_modules/tsx/dist/cli.mjs", "src/cli/index.ts", "correct", "--base", files.base, "--rover", files.rover, "--out", out,
      "--datum", "median", "--method", "linear", "--max-gap-s", "120", "--reference", "igrf", "--timezone", "UTC",
      "--base-lat", String(BASE_POSITION.latDeg), "--base-lon", String(BASE_POSITION.lonDeg), "--base-height-m", String(BASE_POSITION.heightM),
    ], { cwd: path.resolve(import.meta.dirname, "../../..") });
    const cliRows = fs.readFileSync(out, "utf8").trimEnd().split("\n");
    const exportRows = csv.trimEnd().split("\n").filter((l) => !l.startsWith("#"));
    expect(cliRows.length).toBe(1 + 4 * 600); // header + every rover reading
    expect(exportRows.length).toBe(cliRows.length);
    expect(exportRows).toEqual(cliRows);
    // the base gap (10 min > 120 s) leaves flagged, uncorrected readings: the comparison covers them too
    expect(exportRows.filter((r) => r.endsWith(",base_gap")).length).toBeGreaterThan(300);
    expect(exportRows.some((r) => r.includes("duplicate_time"))).toBe(true);
  }, 60_000);

  it("a rerun with another datum is run 2; run 1 stays readable; the comparison counts changed readings", async () => {
    const before = await getProcessingSettings(processor, surveyId);
    await updateProcessingSettings(processor, surveyId, { ...before.settings, datumKind: "value", datumValueNt: 49_300 });
    const second = await runs.startRun(processor, surveyId, DAY);
    expect(second.number).toBe(2);
    await runs.waitForRun(processor, surveyId, DAY, 2);
    const list = await runs.listRuns(processor, surveyId, DAY);
    expect(list.map((r) => [r.number, r.status])).toEqual([[2, "done"], [1, "done"]]);
    const r1 = await runs.getRunResult(processor, surveyId, DAY, 1);
    const r2 = await runs.getRunResult(processor, surveyId, DAY, 2);
    const datum1 = r1.run.summary!.datumNt as number;
    // corrected = raw − (base − datum): changing the datum shifts every corrected reading by the datum change
    const shift = 49_300 - datum1;
    const cmp = await runs.compareRuns(processor, surveyId, DAY, 1, 2);
    const correctedBoth = Array.from(r1.columns.correctedNt).filter((v) => v === v).length;
    expect(cmp.matched).toBe(r1.columns.count);
    expect(cmp.changedCount).toBe(Math.abs(shift) > 0.0005 ? correctedBoth : 0);
    expect(cmp.largestChangeNt).toBeCloseTo(Math.abs(shift), 6);
    expect(cmp.parameterChanges.map((c) => c.name)).toEqual(["datum"]);
    expect(r2.columns.correctedNt[5] - r1.columns.correctedNt[5]).toBeCloseTo(shift, 6);
  }, 60_000);

  it("GeoJSON export is a FeatureCollection of [lon, lat, height] points with the values as properties", async () => {
    const { chunks, skipped } = await exportRunGeoJson(processor, surveyId, DAY, 1);
    const fc = JSON.parse(chunks.join(""));
    expect(fc.type).toBe("FeatureCollection");
    expect(skipped).toBe(0);
    const csvRows = Buffer.concat((await exportRunCsv(processor, surveyId, DAY, 1)).chunks).toString("utf8").trimEnd().split("\n").filter((l) => !l.startsWith("#"));
    expect(fc.features).toHaveLength(csvRows.length - 1);
    const f = fc.features[3];
    const cells = csvRows[4].split(",");
    expect(f.geometry).toEqual({ type: "Point", coordinates: [Number(cells[2]), Number(cells[1]), Number(cells[3])] });
    expect(f.properties.time).toBe(cells[0]);
    expect(f.properties.corrected_nT).toBe(Number(cells[8]));
    expect(f.properties.residual_nT).toBe(Number(cells[10]));
    expect(fc.fieldtide.caution).toMatch(/no clearance/);
  });

  it("a run left running by a stopped server reads as failed and the day can be run again", async () => {
    const [{ id }] = (await getDb()("correction_runs").insert({
      survey_id: surveyId, day: DAY, number: 3, status: "running", progress: 0.4, parameters: "{}", inputs: "[]",
      process_id: "an-earlier-server-process", created_at: new Date().toISOString(),
    }).returning("id")) as { id: number }[];
    const list = await runs.listRuns(processor, surveyId, DAY);
    const interrupted = list.find((r) => r.id === id)!;
    expect(interrupted.status).toBe("failed");
    expect(interrupted.error).toMatch(/Interrupted/);
    const next = await runs.startRun(processor, surveyId, DAY);
    expect(next.number).toBe(4);
    await runs.waitForRun(processor, surveyId, DAY, 4);
  }, 60_000);

  it("refuses a second run while one of the day is in progress", async () => {
    // a run this server process is running (a real one can finish before the second request on
    // PostgreSQL, where the two do not queue on one connection): the row as startRun leaves it
    const last = Number((await getDb()("correction_runs").where({ survey_id: surveyId, day: DAY }).max({ n: "number" }).first())?.n) || 0;
    const [{ id }] = (await getDb()("correction_runs").insert({
      survey_id: surveyId, day: DAY, number: last + 1, status: "running", progress: 0.3, parameters: "{}", inputs: "[]",
      process_id: PROCESS_ID, created_at: new Date().toISOString(),
    }).returning("id")) as { id: number }[];
    try {
      const err = await runs.startRun(processor, surveyId, DAY).catch((e: unknown) => e);
      expect(err).toBeInstanceOf(ConflictError);
      expect((err as Error).message).toMatch(new RegExp(`Run ${last + 1} of this day is still in progress`));
      expect(Number((await getDb()("correction_runs").where({ survey_id: surveyId, day: DAY }).count({ n: "*" }).first())?.n)).toBe(last + 1);
    } finally {
      await getDb()("correction_runs").where({ id }).delete();
    }
  }, 60_000);
});
