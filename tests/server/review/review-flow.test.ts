/**
 * A day's review: a processor submits, only a reviewer decides, a re-survey needs a comment and
 * names known lines; mail reaches the reviewers, then the crew and processor of the day (unless
 * they turned that kind off); every step is in the history and on the audit trail; a reviewer of
 * another survey sees neither the day nor it in their queue.
 */
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { setupTestDatabase } from "../../support/test-db";
import { startTestSmtp, lastMailTo } from "../../support/smtp";
import { DAY, baseCsv, roverCsv, streamOf } from "../days/day-fixtures";

await startTestSmtp();
const testDb = setupTestDatabase();
process.env.UPLOAD_DIR = path.join(testDb.dir, "uploads");

const { importLogStream } = await import("@/src/server/logs/import-service");
const review = await import("@/src/server/review/service");
const { saveNotificationPreferences, getNotificationPreferences } = await import("@/src/server/notifications/preferences");
const { listAuditEvents } = await import("@/src/server/audit/read");
const { ConflictError, ForbiddenError, NotFoundError, ValidationError } = await import("@/src/server/errors");
const { getDb } = await import("@/src/server/db/client");
const { makeUser, makeSurvey, addMember, countRows } = await import("../../support/fixtures");

type Actor = Awaited<ReturnType<typeof makeUser>>;
let lead: Actor, processor: Actor, crew: Actor, reviewer: Actor, otherReviewer: Actor;
let surveyId: string, otherSurveyId: string;

const mailCount = async (email: string) => Number((await getDb()("captured_mail").where("envelope_to", "like", `%${email}%`).count({ n: "*" }).first())?.n ?? 0);
const fieldErrorsOf = (e: unknown) => (e instanceof ValidationError ? e.fieldErrors : {});

beforeAll(async () => {
  [lead, processor, crew, reviewer, otherReviewer] = await Promise.all([makeUser(), makeUser(), makeUser(), makeUser(), makeUser()]);
  surveyId = await makeSurvey();
  otherSurveyId = await makeSurvey();
  await addMember(surveyId, lead.userId, "lead");
  await addMember(surveyId, processor.userId, "processor");
  await addMember(surveyId, crew.userId, "crew");
  await addMember(surveyId, reviewer.userId, "reviewer");
  await addMember(otherSurveyId, otherReviewer.userId, "reviewer");
  await importLogStream(crew, surveyId, streamOf(baseCsv()), { fileName: "b.csv", kind: "base", baseSiteName: "Gate" });
  await importLogStream(crew, surveyId, streamOf(roverCsv({ lines: 3, perLine: 120 })), { fileName: "r.csv", kind: "rover", acceptGoodRows: true });
});

describe("submitting", () => {
  it("crew and reviewers cannot submit; nothing is written", async () => {
    await expect(review.submitDayForReview(crew, surveyId, DAY)).rejects.toBeInstanceOf(ForbiddenError);
    await expect(review.submitDayForReview(reviewer, surveyId, DAY)).rejects.toBeInstanceOf(ForbiddenError);
    await expect(review.submitDayForReview(otherReviewer, surveyId, DAY)).rejects.toBeInstanceOf(NotFoundError);
    expect(await countRows("day_reviews")).toBe(0);
  });

  it("a reviewer cannot decide a day still in processing", async () => {
    await expect(review.decideDay(reviewer, surveyId, DAY, { decision: "accept" })).rejects.toBeInstanceOf(ConflictError);
  });

  it("a processor submits: the day awaits review and its reviewer gets mail with the day's link", async () => {
    const { review: r, mail } = await review.submitDayForReview(processor, surveyId, DAY, { comment: "Base looked fine." });
    expect(r.state).toBe("awaiting_review");
    expect(r.submittedBy).toBe(processor.name);
    expect(mail.sentTo).toEqual([reviewer.email]);
    const m = await lastMailTo(reviewer.email);
    expect(m?.subject).toMatch(new RegExp(`Day ${DAY} awaits review`));
    expect(m?.text_body).toContain(`/surveys/${surveyId}/days/${DAY}`);
    expect(m?.text_body).toContain("Base looked fine.");
    expect(m?.text_body).toMatch(/Suggested verdict: (Quiet|Disturbed|Storm)/);
    await expect(review.submitDayForReview(processor, surveyId, DAY)).rejects.toBeInstanceOf(ConflictError);
  });
});

describe("deciding", () => {
  it("only a reviewer decides: processor, crew and lead are refused", async () => {
    for (const who of [processor, crew, lead]) {
      await expect(review.decideDay(who, surveyId, DAY, { decision: "accept" })).rejects.toBeInstanceOf(ForbiddenError);
    }
    await expect(review.decideDay(otherReviewer, surveyId, DAY, { decision: "accept" })).rejects.toBeInstanceOf(NotFoundError);
    expect((await review.getDayReview(lead, surveyId, DAY)).state).toBe("awaiting_review");
  });

  it("a re-survey needs a comment, a scope, and lines of the day", async () => {
    const noComment = await review.decideDay(reviewer, surveyId, DAY, { decision: "resurvey", scope: "day" }).catch((e) => e);
    expect(fieldErrorsOf(noComment).comment?.[0]).toMatch(/Say why/);
    const noLines = await review.decideDay(reviewer, surveyId, DAY, { decision: "resurvey", scope: "lines", comment: "x" }).catch((e) => e);
    expect(fieldErrorsOf(noLines).lines?.[0]).toMatch(/List the lines/);
    const unknownLine = await review.decideDay(reviewer, surveyId, DAY, { decision: "resurvey", scope: "lines", lines: "L101, L999", comment: "x" }).catch((e) => e);
    expect(fieldErrorsOf(unknownLine).lines?.[0]).toMatch(/Not a line of this day: L999/);
    expect((await review.getDayReview(reviewer, surveyId, DAY)).state).toBe("awaiting_review");
  });

  it("the reviewer sends listed lines back: crew and processor get the comment and the lines", async () => {
    const { review: r, mail } = await review.decideDay(reviewer, surveyId, DAY, { decision: "resurvey", scope: "lines", lines: "L101 L102", comment: "Car parked by the base at 09:40." });
    expect(r).toMatchObject({ state: "resurvey_needed", scope: "lines", lines: ["L101", "L102"], decidedBy: reviewer.name });
    expect(mail.sentTo.sort()).toEqual([crew.email, processor.email].sort());
    for (const who of [crew, processor]) {
      const m = await lastMailTo(who.email);
      expect(m?.subject).toMatch(/re-survey needed/);
      expect(m?.text_body).toContain("Car parked by the base at 09:40.");
      expect(m?.text_body).toMatch(/- L101\n\s+- L102/);
    }
    expect(await mailCount(lead.email)).toBe(0);
  });

  it("a user who turned a kind off gets none of it; the day's history shows every step", async () => {
    await saveNotificationPreferences(crew, { enabled: ["review.awaiting", "review.accepted"] });
    expect(await getNotificationPreferences(crew)).toEqual({ "review.awaiting": true, "review.accepted": true, "review.resurvey": false });
    const crewBefore = await mailCount(crew.email);
    await review.submitDayForReview(processor, surveyId, DAY, { comment: "L101, L102 walked again." });
    const { mail } = await review.decideDay(reviewer, surveyId, DAY, { decision: "resurvey", scope: "day", comment: "Storm onset after lunch; whole day again." });
    expect(mail.sentTo).toEqual([processor.email]);
    expect(await mailCount(crew.email)).toBe(crewBefore);
    await review.submitDayForReview(processor, surveyId, DAY);
    const accepted = await review.decideDay(reviewer, surveyId, DAY, { decision: "accept" });
    expect(accepted.review.state).toBe("accepted");
    expect((await lastMailTo(crew.email))?.subject).toMatch(/accepted/);
    await expect(review.submitDayForReview(processor, surveyId, DAY)).rejects.toBeInstanceOf(ConflictError);

    const steps = (await review.listDayReviewHistory(crew, surveyId, DAY)).filter((e) => e.kind !== "assessed");
    expect(steps.map((e) => [e.kind, e.fromState, e.toState, e.actorName])).toEqual([
      ["submitted", "in_processing", "awaiting_review", processor.name],
      ["resurvey", "awaiting_review", "resurvey_needed", reviewer.name],
      ["submitted", "resurvey_needed", "awaiting_review", processor.name],
      ["resurvey", "awaiting_review", "resurvey_needed", reviewer.name],
      ["submitted", "resurvey_needed", "awaiting_review", processor.name],
      ["accepted", "awaiting_review", "accepted", reviewer.name],
    ]);
    expect(steps[1].details).toMatchObject({ scope: "lines", lines: ["L101", "L102"] });
    expect(steps[1].comment).toBe("Car parked by the base at 09:40.");
  });
});

describe("queue and audit", () => {
  it("the reviewer's queue holds the day; a reviewer of another survey sees none of it", async () => {
    const mine = await review.listReviewQueue(reviewer);
    expect(mine.map((r) => [r.surveyId, r.day, r.state])).toEqual([[surveyId, DAY, "accepted"]]);
    expect(mine[0].assessment.level).not.toBeNull();
    expect((await review.listReviewQueue(otherReviewer)).filter((r) => r.surveyId === surveyId)).toEqual([]);
    expect(await review.listReviewQueue(processor)).toEqual([]); // processors do not decide
    await expect(review.getDayReview(otherReviewer, surveyId, DAY)).rejects.toBeInstanceOf(NotFoundError);
    expect(await review.decidesAnywhere(reviewer)).toBe(true);
    expect(await review.decidesAnywhere(processor)).toBe(false);
  });

  it("the lead reads the audit trail with every review step and the log imports; a processor may not", async () => {
    const events = await listAuditEvents(lead, surveyId);
    const actions = events.map((e) => e.action);
    expect(actions.filter((a) => a === "day.submit").length).toBe(3);
    expect(actions.filter((a) => a === "day.resurvey").length).toBe(2);
    expect(actions.filter((a) => a === "day.accept").length).toBe(1);
    expect(actions.filter((a) => a === "log.import").length).toBe(2);
    expect(events.find((e) => e.action === "day.accept")?.actorName).toBe(reviewer.name);
    await expect(listAuditEvents(processor, surveyId)).rejects.toBeInstanceOf(ForbiddenError);
    await expect(listAuditEvents(otherReviewer, surveyId)).rejects.toBeInstanceOf(NotFoundError);
  });
});
