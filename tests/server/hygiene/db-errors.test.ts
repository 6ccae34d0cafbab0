/**
 * Errors never echo SQL or stacks: the database is broken underneath running route handlers
 * (tables dropped in this file's own temp database) and each answer is a plain 500 whose body
 * names no SQL, no SQLite error, no table, no file path or stack frame.
 */
import path from "node:path";
import { beforeAll, describe, expect, it, vi } from "vitest";
import { setupTestDatabase, TEST_ON_POSTGRES } from "../../support/test-db";

const testDb = setupTestDatabase({ APP_URL: "http://localhost:3000" });
process.env.UPLOAD_DIR = path.join(testDb.dir, "uploads");

const { createApiToken } = await import("@/src/server/api-tokens/service");
const { importLogStream } = await import("@/src/server/logs/import-service");
const { getDb } = await import("@/src/server/db/client");
const { makeUser, makeSurvey, addMember } = await import("../../support/fixtures");
const { BASE_POSITION, DAY, baseCsv, streamOf } = await import("../days/day-fixtures");
const logsRoute = await import("@/app/api/v1/surveys/[surveyId]/logs/route");
const daysRoute = await import("@/app/api/v1/surveys/[surveyId]/days/route");
const seriesRoute = await import("@/app/api/v1/surveys/[surveyId]/days/[date]/series/route");
const runsRoute = await import("@/app/api/v1/surveys/[surveyId]/days/[date]/runs/route");
const signInRoute = await import("@/app/api/v1/auth/sign-in/route");

const ORIGIN = "http://localhost:3000";
const LEAKS = [/sqlite/i, /\bselect\b/i, /\binsert\b/i, /\bfrom\s+["`]?\w+/i, /no such (table|column)/i, /\bat \//, /\.ts:\d+/, /node_modules/, /knex/i, /Error:/];
let token: string;
let surveyId: string;
let user: Awaited<ReturnType<typeof makeUser>>;

beforeAll(async () => {
  user = await makeUser();
  surveyId = await makeSurvey();
  await addMember(surveyId, user.userId, "lead");
  token = (await createApiToken(user, { name: "db error laptop" })).token;
  await importLogStream(user, surveyId, streamOf(baseCsv()), { fileName: "b.csv", kind: "base", baseSiteName: "Gate", baseLatitudeDeg: BASE_POSITION.latDeg, baseLongitudeDeg: BASE_POSITION.lonDeg });
});

const auth = () => ({ authorization: `Bearer ${token}` });
const p = <T extends Record<string, string>>(v: T) => ({ params: Promise.resolve(v) });

async function expectPlain500(res: Response): Promise<void> {
  const text = await res.text();
  expect(res.status, text).toBe(500);
  for (const leak of LEAKS) expect(text, `body matches ${leak}`).not.toMatch(leak);
  expect(JSON.parse(text).error.message).toMatch(/on our side/);
}

describe("a broken database behind the routes", () => {
  it("answers each route with a plain 500 once its tables are gone", async () => {
    const quiet = vi.spyOn(console, "error").mockImplementation(() => undefined); // the server-side log keeps the detail
    const list = () => logsRoute.GET(new Request(`${ORIGIN}/api/v1/surveys/${surveyId}/logs`, { headers: auth() }), p({ surveyId }));
    expect((await list()).status).toBe(200);

    // tables go with whatever references them: no foreign-key checks on SQLite, CASCADE on PostgreSQL
    const dropTable = (name: string) => (TEST_ON_POSTGRES ? getDb().raw("DROP TABLE ?? CASCADE", [name]) : getDb().schema.dropTable(name));
    if (!TEST_ON_POSTGRES) await getDb().raw("PRAGMA foreign_keys = OFF");
    await dropTable("log_days");
    await expectPlain500(await daysRoute.GET(new Request(`${ORIGIN}/api/v1/surveys/${surveyId}/days`, { headers: auth() }), p({ surveyId })));

    await dropTable("log_readings");
    await expectPlain500(await seriesRoute.GET(new Request(`${ORIGIN}/api/v1/surveys/${surveyId}/days/${DAY}/series?kind=base`, { headers: auth() }), p({ surveyId, date: DAY })));

    await dropTable("correction_run_columns");
    await dropTable("correction_runs");
    await expectPlain500(await runsRoute.GET(new Request(`${ORIGIN}/api/v1/surveys/${surveyId}/days/${DAY}/runs`, { headers: auth() }), p({ surveyId, date: DAY })));

    await dropTable("field_logs");
    await expectPlain500(await list());

    await dropTable("sign_in_failures");
    await expectPlain500(
      await signInRoute.POST(new Request(`${ORIGIN}/api/v1/auth/sign-in`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ email: user.email, password: user.password }) })),
    );
    expect(quiet).toHaveBeenCalled();
    quiet.mockRestore();
  });
});
