/**
 * Automatic assessment of a day from its base record, against the survey's thresholds (defaults:
 * chord 3.0 nT / 60 s, Geological Survey of Canada (CADB); Kp limit 5, Hejda et al. 2006 / NOAA
 * G1; disturbed range 100 nT (quiet days 20–50 nT, UBC-GIF; the 100 is common practice); storm
 * change 100 nT in 60 s (storm onsets move hundreds of nT in minutes, Milsom; the 100 is common
 * practice); storm range 300 nT, gap 120 s, 10 spikes: common practice). Records are synthetic with
 * the answer known by construction (tests/server/review/base-records.ts).
 */
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { setupTestDatabase } from "../../support/test-db";
import { streamOf } from "../days/day-fixtures";
import { baseRecordCsv, type Disturbance } from "./base-records";

const testDb = setupTestDatabase();
process.env.UPLOAD_DIR = path.join(testDb.dir, "uploads");

const { importLogStream } = await import("@/src/server/logs/import-service");
const { getDayReview, listDayReviewHistory } = await import("@/src/server/review/service");
const { saveKpValues, listKp } = await import("@/src/server/kp/service");
const { updateQaThresholds, getQaThresholds, listQaThresholdChanges } = await import("@/src/server/qa-assessment/thresholds-service");
const { DEFAULT_QA_THRESHOLDS } = await import("@/src/server/qa-assessment/thresholds");
const { ForbiddenError, ValidationError } = await import("@/src/server/errors");
const { saveDayPairing } = await import("@/src/server/days/service");
const { makeUser, makeSurvey, addMember, countRows } = await import("../../support/fixtures");

type Actor = Awaited<ReturnType<typeof makeUser>>;
let processor: Actor, crew: Actor, reviewer: Actor;
let surveyId: string;

const DAYS: Record<string, Disturbance> = {
  "2026-03-01": { kind: "none" },
  "2026-03-02": { kind: "step", atMin: 90, stepNt: 200 },
  "2026-03-03": { kind: "ramp", fromMin: 40, toMin: 110, ratePerMinNt: 5 },
  "2026-03-04": { kind: "swing", periodMin: 120, peakRatePerMinNt: 5 },
  "2026-03-05": { kind: "spikes", everyMin: 10, count: 12, heightNt: 25 },
  "2026-03-06": { kind: "gap", fromMin: 60, minutes: 10 },
  "2026-03-07": { kind: "none" },
};

beforeAll(async () => {
  [processor, crew, reviewer] = await Promise.all([makeUser(), makeUser(), makeUser()]);
  surveyId = await makeSurvey();
  await addMember(surveyId, processor.userId, "processor");
  await addMember(surveyId, crew.userId, "crew");
  await addMember(surveyId, reviewer.userId, "reviewer");
  for (const [day, d] of Object.entries(DAYS)) {
    await importLogStream(crew, surveyId, streamOf(baseRecordCsv(day, d)), { fileName: `base-${day}.csv`, kind: "base", baseSiteName: "Gate" });
  }
});

const metrics = (r: Awaited<ReturnType<typeof getDayReview>>) => r.assessment.reasons.map((x) => `${x.level}:${x.metric}`).sort();

describe("assessment from the base record", () => {
  it("a quiet record is quiet with no reasons; the day starts in processing", async () => {
    const r = await getDayReview(reviewer, surveyId, "2026-03-01");
    expect(r.state).toBe("in_processing");
    expect(r.assessment.level).toBe("quiet");
    expect(r.assessment.reasons).toEqual([]);
    expect(r.assessment.metrics!.rangeNt).toBeGreaterThan(14.9); // half a 6 h period of a 15 nT sine, ±0.05 wiggle
    expect(r.assessment.metrics!.rangeNt).toBeLessThan(15.2);
    expect(r.assessment.metrics!.spikeCount).toBe(0);
  });

  // The step's fourth difference is 200·[1, −3, 3, −1]/16 nT: RMS over 5 400 points √(3 125/5 400) ≈ 0.76 nT > 0.5 nT.
  it("a 200 nT step is a storm by its change within 60 s, and breaks range, chord and d4 noise too", async () => {
    const r = await getDayReview(reviewer, surveyId, "2026-03-02");
    expect(r.assessment.level).toBe("storm");
    expect(r.assessment.metrics!.maxChangeNt).toBeGreaterThan(199);
    expect(r.assessment.metrics!.maxChangeNt).toBeLessThan(202);
    expect(metrics(r)).toEqual(["disturbed:changeNt", "disturbed:chordDeviationNt", "disturbed:dailyRangeNt", "disturbed:noiseRmsNt", "storm:changeNt"]);
    expect(r.assessment.metrics!.noiseRmsNt).toBeCloseTo(Math.sqrt(3125 / 5400), 1);
    expect(r.assessment.reasons.find((x) => x.level === "storm")!.text).toMatch(/> 100 nT \(storm\)/);
  });

  it("a 5 nT-per-minute swing held for 70 min is a storm by its range, though no minute changes more than 20 nT", async () => {
    const r = await getDayReview(reviewer, surveyId, "2026-03-03");
    expect(r.assessment.level).toBe("storm");
    expect(r.assessment.metrics!.maxChangeNt).toBeLessThan(6); // 5 nT/min × 1 min plus the quiet curve
    expect(r.assessment.metrics!.rangeNt).toBeGreaterThan(350); // 70 min × 5 nT/min
    expect(metrics(r)).toEqual(["disturbed:dailyRangeNt", "storm:dailyRangeNt"]);
  });

  it("a 5 nT-per-minute sine swing (amplitude 95 nT) is disturbed by its range only", async () => {
    const r = await getDayReview(reviewer, surveyId, "2026-03-04");
    expect(r.assessment.level).toBe("disturbed");
    expect(metrics(r)).toEqual(["disturbed:dailyRangeNt"]);
    expect(r.assessment.worst?.metric).toBe("dailyRangeNt");
  });

  it("a train of 12 single-sample 25 nT spikes is counted exactly and makes the day disturbed", async () => {
    const r = await getDayReview(reviewer, surveyId, "2026-03-05");
    expect(r.assessment.metrics!.spikeCount).toBe(12);
    expect(r.assessment.level).toBe("disturbed");
    const spikes = r.assessment.reasons.find((x) => x.metric === "spikeCount")!;
    expect(spikes).toMatchObject({ level: "disturbed", value: 12, limit: 10 });
    expect(r.assessment.reasons.some((x) => x.level === "storm")).toBe(false);
  });

  it("a 10-minute gap is found at its length (600 s + one sample interval) and flags the day", async () => {
    const r = await getDayReview(reviewer, surveyId, "2026-03-06");
    expect(r.assessment.metrics!.longestGapS).toBe(602);
    expect(r.assessment.metrics!.gapCount).toBe(1);
    expect(r.assessment.level).toBe("disturbed");
    expect(metrics(r)).toEqual(["disturbed:longestGapS"]);
  });
});

describe("a base log landing or changing", () => {
  it("is judged on the next read: a second, fuller base log with a step makes the day a storm; choosing the first base again makes it quiet", async () => {
    const day = "2026-03-09";
    const first = await importLogStream(crew, surveyId, streamOf(baseRecordCsv(day, { kind: "none" })), { fileName: "quiet.csv", kind: "base", baseSiteName: "Gate" });
    expect((await getDayReview(reviewer, surveyId, day)).assessment.level).toBe("quiet");
    // 1 s sampling: more readings, so the day's default pairing takes this log as its base.
    await importLogStream(crew, surveyId, streamOf(baseRecordCsv(day, { kind: "step", atMin: 30, stepNt: 200 }, 1)), { fileName: "step.csv", kind: "base", baseSiteName: "Gate" });
    const stormy = await getDayReview(reviewer, surveyId, day);
    expect(stormy.assessment.level).toBe("storm");
    expect(stormy.assessment.baseLogId).not.toBe(first.log.id);
    await saveDayPairing(processor, surveyId, day, { method: "base", baseLogId: first.log.id });
    const again = await getDayReview(reviewer, surveyId, day);
    expect(again.assessment).toMatchObject({ level: "quiet", baseLogId: first.log.id });
    const steps = (await listDayReviewHistory(crew, surveyId, day)).filter((e) => e.kind === "assessed").map((e) => [e.details.previousLevel, e.details.level]);
    expect(steps).toEqual([[null, "quiet"], ["quiet", "storm"], ["storm", "quiet"]]);
  });
});

describe("Kp", () => {
  it("a Kp above the survey's limit (5) marks a quiet record disturbed; a lower value replaces it and the day is quiet again", async () => {
    expect((await getDayReview(reviewer, surveyId, "2026-03-07")).assessment.level).toBe("quiet");
    const saved = await saveKpValues(reviewer, surveyId, { text: "start,kp\n2026-03-07T06:00Z,3o\n2026-03-07T09:00Z,6-\n2026-03-07T12:00Z,2+", source: "csv" });
    expect(saved).toEqual({ saved: 3, replaced: 0 });
    let r = await getDayReview(reviewer, surveyId, "2026-03-07");
    expect(r.assessment.kpMax).toBeCloseTo(5.667, 3); // 6- = 5 2/3
    expect(r.assessment.level).toBe("disturbed");
    expect(metrics(r)).toEqual(["disturbed:kp"]);
    await saveKpValues(processor, surveyId, { text: "2026-03-07 09:00,4.33" });
    r = await getDayReview(reviewer, surveyId, "2026-03-07");
    expect(r.assessment.kpMax).toBeCloseTo(4.33, 3);
    expect(r.assessment.level).toBe("quiet");
    expect((await listKp(crew, surveyId)).length).toBe(3);
    const assessed = (await listDayReviewHistory(crew, surveyId, "2026-03-07")).filter((e) => e.kind === "assessed").map((e) => e.details.level);
    expect(assessed).toEqual(["quiet", "disturbed", "quiet"]);
  });

  it("refuses a bad row (off the 3-hour grid, Kp 10) and keeps nothing; crew cannot enter Kp", async () => {
    const before = await countRows("kp_values");
    await expect(saveKpValues(reviewer, surveyId, { text: "2026-03-08T10:00Z,3\n2026-03-08T12:00Z,10" })).rejects.toSatisfy(
      (e: unknown) => e instanceof ValidationError && e.fieldErrors.text.length === 2 && /3-hour/.test(e.fieldErrors.text[0]) && /0–9/.test(e.fieldErrors.text[1]),
    );
    await expect(saveKpValues(crew, surveyId, { text: "2026-03-08T12:00Z,3" })).rejects.toBeInstanceOf(ForbiddenError);
    expect(await countRows("kp_values")).toBe(before);
  });
});

describe("survey thresholds", () => {
  it("a processor raises the disturbed range; the change is recorded and the sine swing day is quiet now", async () => {
    await expect(updateQaThresholds(crew, surveyId, { ...DEFAULT_QA_THRESHOLDS, disturbedRangeNt: 250 })).rejects.toBeInstanceOf(ForbiddenError);
    const { changed, record } = await updateQaThresholds(processor, surveyId, { ...DEFAULT_QA_THRESHOLDS, disturbedRangeNt: 250 });
    expect(changed).toEqual(["disturbedRangeNt"]);
    expect(record.revision).toBe(1);
    expect((await getQaThresholds(crew, surveyId)).thresholds.disturbedRangeNt).toBe(250);
    const history = await listQaThresholdChanges(crew, surveyId);
    expect(history).toMatchObject([{ setting: "disturbedRangeNt", oldValue: 100, newValue: 250, changedBy: processor.name }]);
    expect((await getDayReview(reviewer, surveyId, "2026-03-04")).assessment.level).toBe("quiet");
    await expect(updateQaThresholds(processor, surveyId, { ...DEFAULT_QA_THRESHOLDS, stormRangeNt: 50 })).rejects.toBeInstanceOf(ValidationError);
  });
});
