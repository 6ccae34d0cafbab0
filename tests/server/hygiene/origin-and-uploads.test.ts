/**
 * Web hygiene of the route handlers: every state-changing route in the route access table refuses
 * a cross-site Origin (403) for cookie callers; a Bearer-token call without cookies and without
 * Origin is served (a token is not an ambient credential: a hostile page cannot make the browser
 * attach it). Upload file names never become file system paths: hostile names are stored as text
 * only, and every file under UPLOAD_DIR has a generated key.
 */
import fs from "node:fs";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { setupTestDatabase } from "../../support/test-db";

const testDb = setupTestDatabase({ APP_URL: "http://localhost:3000" });
const UPLOAD_DIR = path.join(testDb.dir, "uploads");
process.env.UPLOAD_DIR = UPLOAD_DIR;

const { ROUTE_ACCESS } = await import("@/src/server/authz/route-access");
const { STORAGE_KEY_RE } = await import("@/src/server/storage/layout");
const { createSession } = await import("@/src/server/auth/accounts");
const { SESSION_COOKIE_NAME } = await import("@/src/server/auth/lucia");
const { createApiToken } = await import("@/src/server/api-tokens/service");
const { importLogStream } = await import("@/src/server/logs/import-service");
const { waitForRun } = await import("@/src/server/runs/service");
const { getDb } = await import("@/src/server/db/client");
const { makeUser, makeSurvey, addMember } = await import("../../support/fixtures");
const { BASE_POSITION, DAY, baseCsv, roverCsv, streamOf } = await import("../days/day-fixtures");
const signInRoute = await import("@/app/api/v1/auth/sign-in/route");
const signOutRoute = await import("@/app/api/v1/auth/sign-out/route");
const runsRoute = await import("@/app/api/v1/surveys/[surveyId]/days/[date]/runs/route");
const logsRoute = await import("@/app/api/v1/surveys/[surveyId]/logs/route");
const submitRoute = await import("@/app/api/v1/surveys/[surveyId]/days/[date]/review/submit/route");
const decisionRoute = await import("@/app/api/v1/surveys/[surveyId]/days/[date]/review/decision/route");
const kpRoute = await import("@/app/api/v1/surveys/[surveyId]/kp/route");

const ORIGIN = "http://localhost:3000";
const EVIL = "https://fieldtide-lookalike.example";
let lead: Awaited<ReturnType<typeof makeUser>>;
let surveyId: string;
/** A session of its own per call: sign-in rotates the session it is sent with, sign-out ends it. */
const freshCookie = async () => `${SESSION_COOKIE_NAME}=${(await createSession(lead.userId)).id}`;
let token: string;
/** Only a QA reviewer decides a day: the decision route is called with a reviewer's session in place of the lead's. */
let reviewerCookie: string;

beforeAll(async () => {
  lead = await makeUser();
  surveyId = await makeSurvey();
  await addMember(surveyId, lead.userId, "lead");
  token = (await createApiToken(lead, { name: "Hygiene laptop" })).token;
  const reviewer = await makeUser();
  await addMember(surveyId, reviewer.userId, "reviewer");
  reviewerCookie = `${SESSION_COOKIE_NAME}=${(await createSession(reviewer.userId)).id}`;
  await importLogStream(lead, surveyId, streamOf(baseCsv()), { fileName: "b.csv", kind: "base", baseSiteName: "Gate", baseLatitudeDeg: BASE_POSITION.latDeg, baseLongitudeDeg: BASE_POSITION.lonDeg });
  await importLogStream(lead, surveyId, streamOf(roverCsv({ lines: 1, perLine: 60 })), { fileName: "r.csv", kind: "rover", acceptGoodRows: true });
});

let uploads = 0;
function uploadBody(fileName = `u${++uploads}.csv`): FormData {
  const fd = new FormData();
  fd.append("kind", "rover");
  fd.append("acceptGoodRows", "true");
  // Distinct bytes per upload (line name), so none is refused as a duplicate.
  const text = roverCsv({ lines: 1, perLine: 10 }).replace(/,L100,/g, `,U${++uploads},`);
  fd.append("file", new Blob([text], { type: "text/csv" }), fileName);
  return fd;
}

type Call = (headers: Record<string, string>) => Promise<Response>;
const p = <T extends Record<string, string>>(v: T) => ({ params: Promise.resolve(v) });

/** One call per state-changing route of the table; a new one fails below until it is added. */
const STATE_CHANGING: Record<string, Call> = {
  "POST /api/v1/auth/sign-in": (h) =>
    signInRoute.POST(new Request(`${ORIGIN}/api/v1/auth/sign-in`, { method: "POST", headers: { ...h, "content-type": "application/json" }, body: JSON.stringify({ email: lead.email, password: lead.password }) })),
  "POST /api/v1/auth/sign-out": (h) => signOutRoute.POST(new Request(`${ORIGIN}/api/v1/auth/sign-out`, { method: "POST", headers: h })),
  "POST /api/v1/surveys/[surveyId]/days/[date]/runs": (h) =>
    runsRoute.POST(new Request(`${ORIGIN}/api/v1/surveys/${surveyId}/days/${DAY}/runs`, { method: "POST", headers: h }), p({ surveyId, date: DAY })),
  "POST /api/v1/surveys/[surveyId]/logs": (h) =>
    logsRoute.POST(new Request(`${ORIGIN}/api/v1/surveys/${surveyId}/logs`, { method: "POST", headers: h, body: uploadBody() }), p({ surveyId })),
  // Review (issue 6): each call starts from the review state it needs.
  "POST /api/v1/surveys/[surveyId]/days/[date]/review/submit": async (h) => {
    await getDb()("day_reviews").where({ survey_id: surveyId, day: DAY }).delete();
    return submitRoute.POST(new Request(`${ORIGIN}/api/v1/surveys/${surveyId}/days/${DAY}/review/submit`, { method: "POST", headers: h }), p({ surveyId, date: DAY }));
  },
  "POST /api/v1/surveys/[surveyId]/days/[date]/review/decision": async (h) => {
    const now = new Date().toISOString();
    await getDb()("day_reviews").insert({ survey_id: surveyId, day: DAY, state: "awaiting_review", submitted_at: now, updated_at: now }).onConflict(["survey_id", "day"]).merge();
    const headers = { ...h, ...(h.cookie ? { cookie: reviewerCookie } : {}), "content-type": "application/json" };
    return decisionRoute.POST(new Request(`${ORIGIN}/api/v1/surveys/${surveyId}/days/${DAY}/review/decision`, { method: "POST", headers, body: JSON.stringify({ decision: "accept" }) }), p({ surveyId, date: DAY }));
  },
  "POST /api/v1/surveys/[surveyId]/kp": (h) =>
    kpRoute.POST(new Request(`${ORIGIN}/api/v1/surveys/${surveyId}/kp`, { method: "POST", headers: { ...h, "content-type": "text/csv" }, body: `${DAY}T09:00Z,2` }), p({ surveyId })),
};

const stateChanging = Object.entries(ROUTE_ACCESS).filter(([, e]) => e.changesState).map(([k]) => k);

describe("Origin on state-changing route handlers", () => {
  it("has a call here for every state-changing route of the table", () => {
    expect(stateChanging.length).toBeGreaterThanOrEqual(4);
    expect(stateChanging.filter((k) => !STATE_CHANGING[k])).toEqual([]);
  });

  it.each(stateChanging)("%s refuses a cross-site Origin with the session cookie (403), changing nothing", async (key) => {
    const before = await getDb()("field_logs").count<{ n: number }[]>({ n: "*" });
    const runsBefore = await getDb()("correction_runs").count<{ n: number }[]>({ n: "*" });
    const res = await STATE_CHANGING[key]({ cookie: await freshCookie(), origin: EVIL, host: "localhost:3000" });
    expect(res.status).toBe(403);
    expect((await res.json()).error.message).toBe("Cross-site request refused.");
    expect(await getDb()("field_logs").count<{ n: number }[]>({ n: "*" })).toEqual(before);
    expect(await getDb()("correction_runs").count<{ n: number }[]>({ n: "*" })).toEqual(runsBefore);
  });

  it.each(stateChanging)("%s serves our own Origin", async (key) => {
    const res = await STATE_CHANGING[key]({ cookie: await freshCookie(), origin: ORIGIN, host: "localhost:3000" });
    expect(res.status).toBeLessThan(300);
    if (key.endsWith("/runs")) await waitForRun(lead, surveyId, DAY, (await res.json()).run.number);
  });

  it("serves a Bearer-token upload and run with no cookie and no Origin (tokens are not ambient credentials)", async () => {
    const up = await STATE_CHANGING["POST /api/v1/surveys/[surveyId]/logs"]({ authorization: `Bearer ${token}` });
    expect(up.status).toBe(201);
    const run = await STATE_CHANGING["POST /api/v1/surveys/[surveyId]/days/[date]/runs"]({ authorization: `Bearer ${token}` });
    expect(run.status).toBe(202);
    await waitForRun(lead, surveyId, DAY, (await run.json()).run.number);
  });
});

function allFiles(dir: string): string[] {
  if (!fs.existsSync(dir)) return [];
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((d) => (d.isDirectory() ? allFiles(path.join(dir, d.name)) : [path.join(dir, d.name)]));
}

describe("upload file names never reach a file system path", () => {
  const HOSTILE = [
    "../../etc/passwd",
    "..\\..\\windows\\win.ini",
    "/etc/passwd",
    "rover\u0000.csv.sh",
    "a".repeat(5000) + ".csv",
    "CON",
    ".",
    "rover\r\nX-Injected: 1.csv",
  ];

  it.each(HOSTILE)("%j is stored as text only; every file on disk has a generated key", async (name) => {
    const res = await logsRoute.POST(new Request(`${ORIGIN}/api/v1/surveys/${surveyId}/logs`, { method: "POST", headers: { authorization: `Bearer ${token}` }, body: uploadBody(name) }), p({ surveyId }));
    const body = await res.json();
    // Either stored (201) or refused with a clear message; never a 500.
    expect([201, 400, 422]).toContain(res.status);
    if (res.status !== 201) expect(typeof body.error.message).toBe("string");
    for (const f of allFiles(UPLOAD_DIR)) {
      const rel = path.relative(UPLOAD_DIR, f).split(path.sep);
      expect(rel.length, f).toBe(2);
      expect(["originals", "tmp"]).toContain(rel[0]);
      if (rel[0] === "originals") expect(rel[1]).toMatch(STORAGE_KEY_RE);
    }
    expect(allFiles(path.join(testDb.dir, "..", "etc"))).toEqual([]);
    expect(fs.readdirSync(testDb.dir).sort()).toEqual(expect.arrayContaining(["uploads"]));
    expect(fs.readdirSync(testDb.dir).filter((f) => !/^(uploads|test\.sqlite(-wal|-shm)?)$/.test(f))).toEqual([]);
    if (res.status === 201) {
      const row = await getDb()("field_logs").where({ id: body.log.id }).first();
      expect(row.storage_key).toMatch(STORAGE_KEY_RE);
      expect(String(row.original_name)).not.toContain("\u0000");
      // Downloads quote the stored name safely in Content-Disposition (no header injection).
      const { GET } = await import("@/app/api/v1/surveys/[surveyId]/logs/[logId]/original/route");
      const dl = await GET(new Request(`${ORIGIN}/x`, { headers: { authorization: `Bearer ${token}` } }), p({ surveyId, logId: String(body.log.id) }));
      expect(dl.status).toBe(200);
      expect(dl.headers.get("content-disposition") ?? "").not.toMatch(/[\r\n]/);
      expect(dl.headers.get("x-injected")).toBeNull();
    }
  });
});
