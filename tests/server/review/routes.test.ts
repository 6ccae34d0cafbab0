/**
 * The review and Kp API routes with real Requests and session cookies: Kp as a CSV body, submit
 * without a body, a decision as JSON, refusals as HTTP statuses with the service's messages.
 */
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { setupTestDatabase } from "../../support/test-db";
import { startTestSmtp } from "../../support/smtp";
import { DAY, baseCsv, roverCsv, streamOf } from "../days/day-fixtures";

await startTestSmtp();
const testDb = setupTestDatabase({ APP_URL: "http://localhost:3000" });
process.env.UPLOAD_DIR = path.join(testDb.dir, "uploads");

const reviewRoute = await import("@/app/api/v1/surveys/[surveyId]/days/[date]/review/route");
const submitRoute = await import("@/app/api/v1/surveys/[surveyId]/days/[date]/review/submit/route");
const decisionRoute = await import("@/app/api/v1/surveys/[surveyId]/days/[date]/review/decision/route");
const kpRoute = await import("@/app/api/v1/surveys/[surveyId]/kp/route");
const { importLogStream } = await import("@/src/server/logs/import-service");
const { createSession } = await import("@/src/server/auth/accounts");
const { SESSION_COOKIE_NAME } = await import("@/src/server/auth/lucia");
const { makeUser, makeSurvey, addMember } = await import("../../support/fixtures");

const ORIGIN = "http://localhost:3000";
let surveyId: string;
const cookies: Record<string, string> = {};

function req(url: string, who: string, init: { method?: string; body?: string; type?: string } = {}): Request {
  const headers: Record<string, string> = { cookie: `${SESSION_COOKIE_NAME}=${cookies[who]}`, host: "localhost:3000", origin: ORIGIN };
  if (init.type) headers["content-type"] = init.type;
  return new Request(`${ORIGIN}${url}`, { method: init.method ?? "GET", headers, body: init.body });
}
const dayCtx = () => ({ params: Promise.resolve({ surveyId, date: DAY }) });

beforeAll(async () => {
  const [processor, reviewer, crew] = await Promise.all([makeUser(), makeUser(), makeUser()]);
  surveyId = await makeSurvey();
  await addMember(surveyId, processor.userId, "processor");
  await addMember(surveyId, reviewer.userId, "reviewer");
  await addMember(surveyId, crew.userId, "crew");
  for (const [k, u] of Object.entries({ processor, reviewer, crew })) cookies[k] = (await createSession(u.userId)).id;
  await importLogStream(crew, surveyId, streamOf(baseCsv()), { fileName: "b.csv", kind: "base", baseSiteName: "Gate" });
  await importLogStream(crew, surveyId, streamOf(roverCsv({ lines: 2, perLine: 100 })), { fileName: "r.csv", kind: "rover", acceptGoodRows: true });
});

describe("review and Kp routes", () => {
  it("Kp CSV body: 201 with counts; a bad row is 400 naming it; crew 403", async () => {
    const ok = await kpRoute.POST(req(`/api/v1/surveys/${surveyId}/kp`, "reviewer", { method: "POST", type: "text/csv", body: `start,kp\n${DAY}T09:00Z,7-\n` }), { params: Promise.resolve({ surveyId }) });
    expect(ok.status).toBe(201);
    expect(await ok.json()).toEqual({ saved: 1, replaced: 0 });
    const bad = await kpRoute.POST(req(`/api/v1/surveys/${surveyId}/kp`, "reviewer", { method: "POST", type: "application/json", body: JSON.stringify({ text: `${DAY}T10:00Z,3` }) }), { params: Promise.resolve({ surveyId }) });
    expect(bad.status).toBe(400);
    expect((await bad.json()).error.fieldErrors.text[0]).toMatch(/Row 1: .*not the start of a 3-hour Kp interval/);
    const crew = await kpRoute.POST(req(`/api/v1/surveys/${surveyId}/kp`, "crew", { method: "POST", type: "text/csv", body: `${DAY}T12:00Z,1` }), { params: Promise.resolve({ surveyId }) });
    expect(crew.status).toBe(403);
    const list = await (await kpRoute.GET(req(`/api/v1/surveys/${surveyId}/kp`, "crew"), { params: Promise.resolve({ surveyId }) })).json();
    expect(list.values.map((v: { intervalStart: string; kp: number }) => [v.intervalStart, v.kp])).toEqual([[`${DAY}T09:00:00.000Z`, 6.667]]);
  });

  it("GET review: in processing, Kp 6.67 over the limit 5 makes the day disturbed at least", async () => {
    const body = await (await reviewRoute.GET(req(`/api/v1/surveys/${surveyId}/days/${DAY}/review`, "crew"), dayCtx())).json();
    expect(body.review.state).toBe("in_processing");
    expect(body.review.assessment.kpMax).toBe(6.667);
    expect(["disturbed", "storm"]).toContain(body.review.assessment.level);
    expect(body.review.assessment.reasons.some((r: { metric: string }) => r.metric === "kp")).toBe(true);
  });

  it("submit without a body, then a reviewer's JSON decision; a second decision is 409; crew cannot decide", async () => {
    const sub = await submitRoute.POST(req(`/api/v1/surveys/${surveyId}/days/${DAY}/review/submit`, "processor", { method: "POST" }), dayCtx());
    expect(sub.status).toBe(200);
    expect((await sub.json()).review.state).toBe("awaiting_review");
    const crew = await decisionRoute.POST(req(`/api/v1/surveys/${surveyId}/days/${DAY}/review/decision`, "crew", { method: "POST", type: "application/json", body: JSON.stringify({ decision: "accept" }) }), dayCtx());
    expect(crew.status).toBe(403);
    const noComment = await decisionRoute.POST(req(`/api/v1/surveys/${surveyId}/days/${DAY}/review/decision`, "reviewer", { method: "POST", type: "application/json", body: JSON.stringify({ decision: "resurvey", scope: "lines", lines: ["L100"] }) }), dayCtx());
    expect(noComment.status).toBe(400);
    expect((await noComment.json()).error.fieldErrors.comment).toBeTruthy();
    const ok = await decisionRoute.POST(req(`/api/v1/surveys/${surveyId}/days/${DAY}/review/decision`, "reviewer", { method: "POST", type: "application/json", body: JSON.stringify({ decision: "resurvey", scope: "lines", lines: ["L100"], comment: "Kp 7- all morning." }) }), dayCtx());
    expect(ok.status).toBe(200);
    expect((await ok.json()).review).toMatchObject({ state: "resurvey_needed", lines: ["L100"] });
    const again = await decisionRoute.POST(req(`/api/v1/surveys/${surveyId}/days/${DAY}/review/decision`, "reviewer", { method: "POST", type: "application/json", body: JSON.stringify({ decision: "accept" }) }), dayCtx());
    expect(again.status).toBe(409);
  });
});
