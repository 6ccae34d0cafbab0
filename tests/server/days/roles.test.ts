/**
 * Who may do what in the day workspace: a reviewer reads but cannot run or change; a crew member
 * sees the days and the charts' data but cannot export; members of other surveys see nothing (404).
 */
import fs from "node:fs";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { setupTestDatabase } from "../../support/test-db";
import { BASE_POSITION, DAY, baseCsv, roverCsv, streamOf } from "./day-fixtures";

const testDb = setupTestDatabase();
process.env.UPLOAD_DIR = path.join(testDb.dir, "uploads");

const { importLogStream } = await import("@/src/server/logs/import-service");
const { updateProcessingSettings, getProcessingSettings } = await import("@/src/server/processing/service");
const { listDays, getDay, saveDayPairing } = await import("@/src/server/days/service");
const { getDaySeries } = await import("@/src/server/days/series");
const runs = await import("@/src/server/runs/service");
const { exportRunCsv, exportRunGeoJson } = await import("@/src/server/runs/export");
const { ForbiddenError, NotFoundError } = await import("@/src/server/errors");
const { countRows, makeUser, makeSurvey, addMember } = await import("../../support/fixtures");

type Actor = Awaited<ReturnType<typeof makeUser>>;
let processor: Actor, reviewer: Actor, crew: Actor, outsider: Actor;
let surveyId: string;

beforeAll(async () => {
  [processor, reviewer, crew, outsider] = await Promise.all([makeUser(), makeUser(), makeUser(), makeUser()]);
  surveyId = await makeSurvey();
  const otherSurvey = await makeSurvey();
  await addMember(surveyId, processor.userId, "processor");
  await addMember(surveyId, reviewer.userId, "reviewer");
  await addMember(surveyId, crew.userId, "crew");
  await addMember(otherSurvey, outsider.userId, "lead");
  await importLogStream(processor, surveyId, streamOf(baseCsv()), {
    fileName: "b.csv", kind: "base", baseSiteName: "Gate", baseLatitudeDeg: BASE_POSITION.latDeg, baseLongitudeDeg: BASE_POSITION.lonDeg,
  });
  fs.mkdirSync(testDb.dir, { recursive: true });
  await importLogStream(processor, surveyId, streamOf(roverCsv({ lines: 2, perLine: 200 })), { fileName: "r.csv", kind: "rover", acceptGoodRows: true });
  await runs.startRun(processor, surveyId, DAY);
  await runs.waitForRun(processor, surveyId, DAY, 1);
});

describe("reviewer", () => {
  it("reads days, runs, series and exports", async () => {
    expect((await listDays(reviewer, surveyId)).length).toBe(1);
    expect((await runs.getRun(reviewer, surveyId, DAY, 1)).status).toBe("done");
    expect((await getDaySeries(reviewer, surveyId, DAY, { kind: "base" })).kind).toBe("base");
    const before = await countRows("audit_events");
    expect((await exportRunCsv(reviewer, surveyId, DAY, 1)).chunks.length).toBeGreaterThan(1);
    expect(await countRows("audit_events")).toBe(before + 1); // the export is on the audit trail
  });
  it("cannot run, change settings or pairing, and nothing is written", async () => {
    const before = await countRows("correction_runs");
    await expect(runs.startRun(reviewer, surveyId, DAY)).rejects.toBeInstanceOf(ForbiddenError);
    const s = await getProcessingSettings(reviewer, surveyId);
    await expect(updateProcessingSettings(reviewer, surveyId, { ...s.settings, interpolation: "nearest" })).rejects.toBeInstanceOf(ForbiddenError);
    await expect(saveDayPairing(reviewer, surveyId, DAY, { method: "default" })).rejects.toBeInstanceOf(ForbiddenError);
    expect(await countRows("correction_runs")).toBe(before);
    expect(await countRows("processing_setting_changes")).toBe(0);
  });
});

describe("crew", () => {
  it("sees the days and the chart series", async () => {
    expect((await getDay(crew, surveyId, DAY)).roverLogs).toHaveLength(1);
    const series = await getDaySeries(crew, surveyId, DAY, { kind: "corrected" });
    expect(series.kind).toBe("corrected");
  });
  it("cannot export or run", async () => {
    await expect(exportRunCsv(crew, surveyId, DAY, 1)).rejects.toBeInstanceOf(ForbiddenError);
    const audited = await countRows("audit_events");
    await expect(exportRunGeoJson(crew, surveyId, DAY, 1)).rejects.toBeInstanceOf(ForbiddenError);
    expect(await countRows("audit_events")).toBe(audited); // a refused export leaves no trace as an export
    await expect(runs.startRun(crew, surveyId, DAY)).rejects.toBeInstanceOf(ForbiddenError);
  });
});

describe("a member of another survey", () => {
  it("gets not found for everything of this survey", async () => {
    const calls: Array<() => Promise<unknown>> = [
      () => listDays(outsider, surveyId),
      () => getDay(outsider, surveyId, DAY),
      () => runs.listRuns(outsider, surveyId, DAY),
      () => runs.getRun(outsider, surveyId, DAY, 1),
      () => runs.startRun(outsider, surveyId, DAY),
      () => getDaySeries(outsider, surveyId, DAY, { kind: "base" }),
      () => exportRunCsv(outsider, surveyId, DAY, 1),
      () => getProcessingSettings(outsider, surveyId),
    ];
    for (const call of calls) await expect(call()).rejects.toBeInstanceOf(NotFoundError);
  });
});
