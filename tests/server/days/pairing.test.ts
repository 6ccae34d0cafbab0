/**
 * Pairing beyond one base: a second base log fills the first one's gap (shifted by the
 * simultaneous difference), and a day with no base log is corrected by looping from the rover's
 * reoccupations of the base point, giving the same values as `correct --loop-station`.
 */
import { execFile } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { promisify } from "node:util";
import { beforeAll, describe, expect, it } from "vitest";
import { setupTestDatabase } from "../../support/test-db";
import { BASE_POSITION, DAY, baseCsv, diurnalAt, roverCsv, streamOf } from "./day-fixtures";

const testDb = setupTestDatabase();
process.env.UPLOAD_DIR = path.join(testDb.dir, "uploads");

const { importLogStream } = await import("@/src/server/logs/import-service");
const { getDayPairing, saveDayPairing } = await import("@/src/server/days/service");
const runs = await import("@/src/server/runs/service");
const { exportRunCsv } = await import("@/src/server/runs/export");
const { getDaySeries } = await import("@/src/server/days/series");
type BaseSeriesResponse = import("@/src/server/days/series").BaseSeriesResponse;
const { updateProcessingSettings } = await import("@/src/server/processing/service");
const { DEFAULT_PROCESSING_SETTINGS } = await import("@/src/server/processing/schema");
const { makeUser, makeSurvey, addMember } = await import("../../support/fixtures");

type Actor = Awaited<ReturnType<typeof makeUser>>;
let processor: Actor;

beforeAll(async () => {
  processor = await makeUser();
});

async function surveyWith(role: "processor" = "processor") {
  const id = await makeSurvey();
  await addMember(id, processor.userId, role);
  return id;
}

describe("second base", () => {
  it("is chosen as fallback and fills the main base's gap, so readings in the gap are corrected", async () => {
    const sid = await surveyWith();
    // main base (site Gatehouse) has a 20-minute gap at 08:50–09:10; the second base sits 140 nT lower
    await importLogStream(processor, sid, streamOf(baseCsv({ gap: { fromMin: 50, toMin: 70 } })), {
      fileName: "main.csv", kind: "base", baseSiteName: "Gatehouse", baseLatitudeDeg: BASE_POSITION.latDeg, baseLongitudeDeg: BASE_POSITION.lonDeg,
    });
    await importLogStream(processor, sid, streamOf(baseCsv({ levelNt: 49_170 })), {
      fileName: "second.csv", kind: "base", baseSiteName: "Quarry gate",
    });
    await importLogStream(processor, sid, streamOf(roverCsv({ lines: 2, perLine: 1200 })), { fileName: "r.csv", kind: "rover", acceptGoodRows: true });
    // two base logs of the same day: make the main site explicit so the choice does not depend on upload order
    await updateProcessingSettings(processor, sid, { ...DEFAULT_PROCESSING_SETTINGS, mainBaseSite: "Gatehouse", datumKind: "value", datumValueNt: 49_300 });
    const pairing = await getDayPairing(processor, sid, DAY);
    expect(pairing.baseLog?.originalName).toBe("main.csv");
    expect(pairing.fallbackBaseLog?.originalName).toBe("second.csv");
    await runs.startRun(processor, sid, DAY);
    const run = await runs.waitForRun(processor, sid, DAY, 1);
    expect(run.status).toBe("done");
    expect((run.summary!.fallback as { levelShiftNt: number }).levelShiftNt).toBeCloseTo(140, 1);
    expect(run.inputs.map((i) => i.role)).toEqual(["base", "fallback-base", "rover"]);
    const { columns } = await runs.getRunResult(processor, sid, DAY, 1);
    const gapFrom = Date.parse("2026-05-04T08:50:00Z"), gapTo = Date.parse("2026-05-04T09:10:00Z");
    let inGap = 0;
    for (let i = 0; i < columns.count; i++) {
      if (columns.timeMs[i] <= gapFrom + 3000 || columns.timeMs[i] >= gapTo - 3000) continue;
      inGap++;
      // base by construction: 49 310 + diurnal (second base shifted back by 140 nT); rounding of the logs to 0.01 nT
      expect(columns.baseNt[i]).toBeCloseTo(49_310 + diurnalAt(columns.timeMs[i]), 1);
      expect(Number.isNaN(columns.correctedNt[i])).toBe(false);
    }
    expect(inGap).toBeGreaterThan(1000);

    // the drift chart draws the second base as the correction uses it: shifted onto the first
    const series = (await getDaySeries(processor, sid, DAY, { kind: "base" })) as BaseSeriesResponse;
    expect(series.fallback?.log.originalName).toBe("second.csv");
    expect(series.fallback!.levelShiftNt).toBeCloseTo(140, 1);
    expect(series.fallback!.samplesUsed).toBe((run.summary!.fallback as { samplesUsed: number }).samplesUsed);
    const inGapPoints = series.fallback!.t.map((t, i) => [t, series.fallback!.fieldNt[i]] as const).filter(([t, f]) => t > gapFrom + 3000 && t < gapTo - 3000 && f !== null);
    expect(inGapPoints.length).toBeGreaterThan(10);
    for (const [t, f] of inGapPoints) expect(f!).toBeCloseTo(49_310 + diurnalAt(t), 1);
  }, 60_000);

  it("can be switched off by choosing the logs by hand", async () => {
    const sid = await surveyWith();
    await importLogStream(processor, sid, streamOf(baseCsv()), { fileName: "a.csv", kind: "base", baseSiteName: "A" });
    await importLogStream(processor, sid, streamOf(baseCsv({ levelNt: 49_000 })), { fileName: "b.csv", kind: "base", baseSiteName: "B" });
    const auto = await getDayPairing(processor, sid, DAY);
    const chosen = await saveDayPairing(processor, sid, DAY, { method: "base", baseLogId: auto.fallbackBaseLog!.id, fallbackBaseLogId: null });
    expect(chosen.explicit).toBe(true);
    expect(chosen.baseLog?.id).toBe(auto.fallbackBaseLog!.id);
    expect(chosen.fallbackBaseLog).toBeNull();
    const back = await saveDayPairing(processor, sid, DAY, { method: "default" });
    expect(back.explicit).toBe(false);
  });
});

describe("looping (no base log)", () => {
  it("pairs the day by loop and exports the values of `correct --loop-station BASE`", async () => {
    const sid = await surveyWith();
    const roverFile = path.join(testDb.dir, "loop-rover.csv");
    fs.writeFileSync(roverFile, roverCsv({ lines: 4, perLine: 300, withBaseStation: true }));
    await importLogStream(processor, sid, streamOf(fs.readFileSync(roverFile, "utf8")), { fileName: "loop-rover.csv", kind: "rover", acceptGoodRows: true });
    const pairing = await getDayPairing(processor, sid, DAY);
    expect(pairing.method).toBe("loop");
    expect(pairing.loopOccupations).toBe(4);
    await runs.startRun(processor, sid, DAY);
    const run = await runs.waitForRun(processor, sid, DAY, 1);
    expect(run.error).toBeNull();
    const csv = Buffer.concat((await exportRunCsv(processor, sid, DAY, 1)).chunks).toString("utf8");
    expect(csv).toMatch(/# method: looping/);
    const out = path.join(testDb.dir, "loop-cli.csv");
    await promisify(execFile)(process.execPath, [
      "node_modules/tsx/dist/cli.mjs", "src/cli/index.ts", "correct", "--loop-station", "BASE", "--rover", roverFile, "--out", out, "--reference", "igrf",
    ], { cwd: path.resolve(import.meta.dirname, "../../..") });
    const cli = fs.readFileSync(out, "utf8").trimEnd().split("\n");
    const exported = csv.trimEnd().split("\n").filter((l) => !l.startsWith("#"));
    expect(exported).toEqual(cli);
    expect(exported.filter((r) => r.includes("base_occupation"))).toHaveLength(4);
  }, 60_000);
});
