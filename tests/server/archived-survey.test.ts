/**
 * An archived survey is read-only: its processing settings, QA thresholds, Kp values and day
 * pairings are refused with a 409 that says to restore it, and nothing is written; after a
 * restore the same change goes through.
 */
import { beforeAll, describe, expect, it } from "vitest";
import { setupTestDatabase } from "../support/test-db";

setupTestDatabase();

const surveys = await import("@/src/server/surveys/service");
const { getProcessingSettings, updateProcessingSettings } = await import("@/src/server/processing/service");
const { getQaThresholds, updateQaThresholds } = await import("@/src/server/qa-assessment/thresholds-service");
const { saveKpValues } = await import("@/src/server/kp/service");
const { saveDayPairing } = await import("@/src/server/days/service");
const { ConflictError } = await import("@/src/server/errors");
const { makeUser, makeSurvey, addMember, countRows } = await import("../support/fixtures");

type Actor = Awaited<ReturnType<typeof makeUser>>;
let lead: Actor;
let surveyId: string;

const TABLES = ["processing_settings", "processing_setting_changes", "qa_thresholds", "qa_threshold_changes", "kp_values", "day_pairings"];
const counts = async () => Object.fromEntries(await Promise.all(TABLES.map(async (t) => [t, await countRows(t)])));

beforeAll(async () => {
  lead = await makeUser();
  surveyId = await makeSurvey();
  await addMember(surveyId, lead.userId, "lead");
  await surveys.archiveSurvey(lead, surveyId);
});

describe("an archived survey", () => {
  it("refuses each change with a 409 naming the way out, and writes nothing", async () => {
    const before = await counts();
    const settings = (await getProcessingSettings(lead, surveyId)).settings;
    const thresholds = (await getQaThresholds(lead, surveyId)).thresholds;
    const firstKey = Object.keys(thresholds)[0] as keyof typeof thresholds;
    const attempts: [string, () => Promise<unknown>][] = [
      ["settings", () => updateProcessingSettings(lead, surveyId, { ...settings, datumKind: "mean" })],
      ["thresholds", () => updateQaThresholds(lead, surveyId, { ...thresholds, [firstKey]: Number(thresholds[firstKey]) + 1 })],
      ["kp", () => saveKpValues(lead, surveyId, { text: "start,kp\n2026-03-07T06:00Z,3o" })],
      ["pairing", () => saveDayPairing(lead, surveyId, "2026-03-07", { method: "default" })],
    ];
    for (const [what, attempt] of attempts) {
      const err = await attempt().catch((e: unknown) => e);
      expect(err, what).toBeInstanceOf(ConflictError);
      expect((err as Error).message, what).toMatch(/archived: restore it before/);
    }
    expect(await counts()).toEqual(before);
  });

  it("takes the same change once restored", async () => {
    await surveys.restoreSurvey(lead, surveyId);
    expect(await saveKpValues(lead, surveyId, { text: "start,kp\n2026-03-07T06:00Z,3o" })).toEqual({ saved: 1, replaced: 0 });
    const settings = (await getProcessingSettings(lead, surveyId)).settings;
    expect((await updateProcessingSettings(lead, surveyId, { ...settings, datumKind: "mean" })).record.settings.datumKind).toBe("mean");
  });
});
