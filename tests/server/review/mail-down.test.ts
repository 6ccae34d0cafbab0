/**
 * With the mail server down, a review step still stands (the state change is saved first) and the
 * caller learns who was not mailed; nothing is half-written.
 */
import net from "node:net";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { setupTestDatabase } from "../../support/test-db";
import { DAY, baseCsv, streamOf } from "../days/day-fixtures";

const closedPort = await new Promise<number>((resolve) => {
  const s = net.createServer().listen(0, "127.0.0.1", () => {
    const { port } = s.address() as net.AddressInfo;
    s.close(() => resolve(port));
  });
});
const testDb = setupTestDatabase({ SMTP_URL: `smtp://127.0.0.1:${closedPort}` });
process.env.UPLOAD_DIR = path.join(testDb.dir, "uploads");

const { importLogStream } = await import("@/src/server/logs/import-service");
const review = await import("@/src/server/review/service");
const { makeUser, makeSurvey, addMember, countRows } = await import("../../support/fixtures");

describe("mail server down", () => {
  it("the submit and the decision are saved and say who was not mailed", async () => {
    const [processor, reviewer] = await Promise.all([makeUser(), makeUser()]);
    const surveyId = await makeSurvey();
    await addMember(surveyId, processor.userId, "processor");
    await addMember(surveyId, reviewer.userId, "reviewer");
    await importLogStream(processor, surveyId, streamOf(baseCsv()), { fileName: "b.csv", kind: "base", baseSiteName: "Gate" });
    const sub = await review.submitDayForReview(processor, surveyId, DAY);
    expect(sub.mail).toEqual({ sentTo: [], failedTo: [reviewer.email] });
    expect(sub.review.state).toBe("awaiting_review");
    const dec = await review.decideDay(reviewer, surveyId, DAY, { decision: "resurvey", scope: "day", comment: "Noisy base all day." });
    expect(dec.mail).toEqual({ sentTo: [], failedTo: [processor.email] });
    expect(dec.review.state).toBe("resurvey_needed");
    expect(await countRows("captured_mail")).toBe(0);
    expect((await review.listDayReviewHistory(reviewer, surveyId, DAY)).filter((e) => e.kind !== "assessed").map((e) => e.kind)).toEqual(["submitted", "resurvey"]);
  });
});
