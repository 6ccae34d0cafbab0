/**
 * The day-workspace API route handlers called with real Requests and a session cookie: list,
 * series, run (202 then poll), CSV/GeoJSON downloads, role refusals as HTTP statuses, and the
 * reference-field endpoint against a published WMM2025 test value.
 */
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { setupTestDatabase } from "../../support/test-db";
import { BASE_POSITION, DAY, baseCsv, roverCsv, streamOf } from "./day-fixtures";

const testDb = setupTestDatabase({ APP_URL: "http://localhost:3000" });
process.env.UPLOAD_DIR = path.join(testDb.dir, "uploads");

const daysRoute = await import("@/app/api/v1/surveys/[surveyId]/days/route");
const seriesRoute = await import("@/app/api/v1/surveys/[surveyId]/days/[date]/series/route");
const runsRoute = await import("@/app/api/v1/surveys/[surveyId]/days/[date]/runs/route");
const runRoute = await import("@/app/api/v1/surveys/[surveyId]/days/[date]/runs/[run]/route");
const csvRoute = await import("@/app/api/v1/surveys/[surveyId]/days/[date]/runs/[run]/corrected.csv/route");
const geoRoute = await import("@/app/api/v1/surveys/[surveyId]/days/[date]/runs/[run]/corrected.geojson/route");
const refRoute = await import("@/app/api/v1/reference-field/route");
const { importLogStream } = await import("@/src/server/logs/import-service");
const { waitForRun } = await import("@/src/server/runs/service");
const { createSession } = await import("@/src/server/auth/accounts");
const { SESSION_COOKIE_NAME } = await import("@/src/server/auth/lucia");
const { makeUser, makeSurvey, addMember } = await import("../../support/fixtures");

const ORIGIN = "http://localhost:3000";
type Actor = Awaited<ReturnType<typeof makeUser>>;
let processor: Actor;
let crew: Actor;
let surveyId: string;
const cookies: Record<string, string> = {};

function get(url: string, who: string): Request {
  return new Request(`${ORIGIN}${url}`, { headers: { cookie: `${SESSION_COOKIE_NAME}=${cookies[who]}`, host: "localhost:3000" } });
}

beforeAll(async () => {
  processor = await makeUser();
  crew = await makeUser();
  surveyId = await makeSurvey();
  await addMember(surveyId, processor.userId, "processor");
  await addMember(surveyId, crew.userId, "crew");
  cookies.processor = (await createSession(processor.userId)).id;
  cookies.crew = (await createSession(crew.userId)).id;
  await importLogStream(processor, surveyId, streamOf(baseCsv()), {
    fileName: "b.csv", kind: "base", baseSiteName: "Gate", baseLatitudeDeg: BASE_POSITION.latDeg, baseLongitudeDeg: BASE_POSITION.lonDeg,
  });
  await importLogStream(processor, surveyId, streamOf(roverCsv({ lines: 3, perLine: 300 })), { fileName: "r.csv", kind: "rover", acceptGoodRows: true });
});

const ctx = <T extends Record<string, string>>(p: T) => ({ params: Promise.resolve(p) });

describe("day routes", () => {
  it("lists days and answers the base series with at most maxPoints points", async () => {
    const res = await daysRoute.GET(get(`/api/v1/surveys/${surveyId}/days`, "crew"), ctx({ surveyId }));
    expect(res.status).toBe(200);
    expect((await res.json()).days[0].day).toBe(DAY);
    const s = await seriesRoute.GET(get(`/api/v1/surveys/${surveyId}/days/${DAY}/series?kind=base&maxPoints=300`, "crew"), ctx({ surveyId, date: DAY }));
    const body = await s.json();
    expect(body.totalCount).toBe(4801);
    expect(body.t.length).toBeLessThanOrEqual(300);
    expect(body.t.length).toBeGreaterThan(200);
    const bad = await seriesRoute.GET(get(`/api/v1/surveys/${surveyId}/days/${DAY}/series?kind=nope`, "crew"), ctx({ surveyId, date: DAY }));
    expect(bad.status).toBe(400);
  });

  it("POST runs answers 202 with the queued run; the downloads are refused to crew and served to the processor", async () => {
    const post = new Request(`${ORIGIN}/api/v1/surveys/${surveyId}/days/${DAY}/runs`, {
      method: "POST", headers: { cookie: `${SESSION_COOKIE_NAME}=${cookies.processor}`, origin: ORIGIN, host: "localhost:3000" },
    });
    const res = await runsRoute.POST(post, ctx({ surveyId, date: DAY }));
    expect(res.status).toBe(202);
    const { run } = await res.json();
    expect(run.number).toBe(1);
    await waitForRun(processor, surveyId, DAY, 1);
    const polled = await (await runRoute.GET(get(`/x`, "processor"), ctx({ surveyId, date: DAY, run: "1" }))).json();
    expect(polled.run.status).toBe("done");

    const crewPost = new Request(post.url, { method: "POST", headers: { cookie: `${SESSION_COOKIE_NAME}=${cookies.crew}`, origin: ORIGIN, host: "localhost:3000" } });
    expect((await runsRoute.POST(crewPost, ctx({ surveyId, date: DAY }))).status).toBe(403);
    expect((await csvRoute.GET(get("/x", "crew"), ctx({ surveyId, date: DAY, run: "1" }))).status).toBe(403);
    const csv = await csvRoute.GET(get("/x", "processor"), ctx({ surveyId, date: DAY, run: "1" }));
    expect(csv.status).toBe(200);
    expect(csv.headers.get("content-disposition")).toMatch(/attachment; filename=".*_2026-05-04_run1_corrected\.csv"/);
    const text = await csv.text();
    expect(text.split("\n").filter((l) => l && !l.startsWith("#"))).toHaveLength(1 + 900);
    const geo = await geoRoute.GET(get("/x", "processor"), ctx({ surveyId, date: DAY, run: "1" }));
    expect(geo.headers.get("content-type")).toBe("application/geo+json");
    expect((await geo.json()).features).toHaveLength(900);
    expect((await runRoute.GET(get("/x", "processor"), ctx({ surveyId, date: DAY, run: "9" }))).status).toBe(404);
  }, 60_000);
});

describe("GET /api/v1/reference-field", () => {
  it("answers the WMM2025 total field at a published test point", async () => {
    // node_modules/geomagnetism/test/values.csv (NOAA WMM2025 test values): 2025.0, 65 km, 43° N, 93° E → F = 55626.621348 nT
    const res = await refRoute.GET(get(`/api/v1/reference-field?lat=43&lon=93&heightM=65000&date=2025-01-01&model=wmm`, "crew"));
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.model.name).toMatch(/WMM/);
    expect(body.field.totalNt).toBeCloseTo(55626.621348, 1);
  });
  it("refuses a bad latitude with a field error and an anonymous caller with 401", async () => {
    const bad = await refRoute.GET(get(`/api/v1/reference-field?lat=123&lon=0&date=2026-01-01`, "crew"));
    expect(bad.status).toBe(400);
    expect((await bad.json()).error.fieldErrors.lat).toBeTruthy();
    const anon = await refRoute.GET(new Request(`${ORIGIN}/api/v1/reference-field?lat=1&lon=1&date=2026-01-01`));
    expect(anon.status).toBe(401);
  });
});
