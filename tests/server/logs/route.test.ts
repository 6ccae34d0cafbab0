/**
 * The log API route handlers called with real Request objects: multipart upload with an API
 * token or a session cookie, listing, downloads, refusals and who may do what.
 */
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { setupTestDatabase } from "../../support/test-db";

const testDb = setupTestDatabase({ APP_URL: "http://localhost:3000" });
process.env.UPLOAD_DIR = path.join(testDb.dir, "uploads");

const logsRoute = await import("@/app/api/v1/surveys/[surveyId]/logs/route");
const originalRoute = await import("@/app/api/v1/surveys/[surveyId]/logs/[logId]/original/route");
const problemsRoute = await import("@/app/api/v1/surveys/[surveyId]/logs/[logId]/problems/route");
const { createApiToken, revokeApiToken } = await import("@/src/server/api-tokens/service");
const { createSession } = await import("@/src/server/auth/accounts");
const { SESSION_COOKIE_NAME } = await import("@/src/server/auth/lucia");
const { makeUser, makeSurvey, addMember } = await import("../../support/fixtures");
const { snapshot, roverCsv } = await import("./helpers");

const ORIGIN = "http://localhost:3000";
type User = Awaited<ReturnType<typeof makeUser>>;
let crew: User;
let reviewer: User;
let outsider: User;
let surveyId: string;
let otherSurveyId: string;
let crewToken: string;

beforeAll(async () => {
  crew = await makeUser();
  reviewer = await makeUser();
  outsider = await makeUser();
  surveyId = await makeSurvey();
  otherSurveyId = await makeSurvey();
  await addMember(surveyId, crew.userId, "crew");
  await addMember(surveyId, reviewer.userId, "reviewer");
  await addMember(otherSurveyId, outsider.userId, "crew");
  crewToken = (await createApiToken(crew, { name: "Truck laptop" })).token;
});

function form(text: string, fields: Record<string, string>, fileName = "rover.csv"): FormData {
  const fd = new FormData();
  for (const [k, v] of Object.entries(fields)) fd.append(k, v);
  fd.append("file", new Blob([text], { type: "text/csv" }), fileName);
  return fd;
}

function upload(sid: string, body: FormData | ReadableStream, headers: Record<string, string>): Promise<Response> {
  const request = new Request(`${ORIGIN}/api/v1/surveys/${sid}/logs`, { method: "POST", body, headers, duplex: "half" } as RequestInit);
  return logsRoute.POST(request, { params: Promise.resolve({ surveyId: sid }) });
}

function list(sid: string, headers: Record<string, string>, qs = ""): Promise<Response> {
  return logsRoute.GET(new Request(`${ORIGIN}/api/v1/surveys/${sid}/logs${qs}`, { headers }), { params: Promise.resolve({ surveyId: sid }) });
}

const bearer = (t: string) => ({ authorization: `Bearer ${t}` });

describe("POST /api/v1/surveys/{surveyId}/logs", () => {
  it("imports a multipart upload sent with an API token and answers with the import result", async () => {
    const res = await upload(surveyId, form(roverCsv(30), { kind: "rover", instrument: "ROVER-OV-12", sensorType: "overhauser", operator: "Tomas Quill" }, "day1_rover.csv"), bearer(crewToken));
    expect(res.status).toBe(201);
    const body = await res.json();
    expect(body.status).toBe("imported");
    expect(body.log).toMatchObject({ originalName: "day1_rover.csv", readingCount: 30, kind: "rover", days: ["2026-05-04"] });
    expect(body.log.url).toBe(`/surveys/${surveyId}/logs/${body.log.id}`);

    const listed = await (await list(surveyId, bearer(crewToken))).json();
    expect(listed.items.map((i: { originalName: string }) => i.originalName)).toContain("day1_rover.csv");
    expect(listed.facets.instruments).toContain("ROVER-OV-12");

    const download = await originalRoute.GET(new Request(`${ORIGIN}/x`, { headers: bearer(crewToken) }), { params: Promise.resolve({ surveyId, logId: String(body.log.id) }) });
    expect(download.status).toBe(200);
    expect(await download.text()).toBe(roverCsv(30));
    expect(download.headers.get("x-content-sha256")).toBe(body.log.sha256);
    expect(download.headers.get("content-disposition")).toContain('filename="day1_rover.csv"');
  });

  it("accepts the browser's session cookie from the same origin and refuses it cross-site", async () => {
    const session = await createSession(crew.userId);
    const cookie = { cookie: `${SESSION_COOKIE_NAME}=${session.id}` };
    const ok = await upload(surveyId, form(roverCsv(3, { startIso: "2026-05-05T08:00:00Z" }), { kind: "rover" }), { ...cookie, origin: ORIGIN });
    expect(ok.status).toBe(201);
    const before = await snapshot();
    const cross = await upload(surveyId, form(roverCsv(3, { startIso: "2026-05-05T09:00:00Z" }), { kind: "rover" }), { ...cookie, origin: "https://elsewhere.example" });
    expect(cross.status).toBe(403);
    expect(await snapshot()).toEqual(before);
  });

  it("refuses a file with bad rows with 422, each problem listed, nothing kept; accepting the good rows keeps them and serves the problems as CSV", async () => {
    const text = roverCsv(4, { startIso: "2026-05-05T10:00:00Z" }).replace(/,49500\.25\n/, ",n/a\n");
    const before = await snapshot();
    const refused = await upload(surveyId, form(text, { kind: "rover" }), bearer(crewToken));
    expect(refused.status).toBe(422);
    const err = (await refused.json()).error;
    expect(err.code).toBe("log_refused");
    expect(err.details.problems).toEqual([{ kind: "rejected", line: 3, column: "tmi_nT", value: "n/a", reason: "non_numeric_field", message: 'total field "n/a" is not a number' }]);
    expect(await snapshot()).toEqual(before);

    const accepted = await upload(surveyId, form(text, { kind: "rover", acceptGoodRows: "true" }), bearer(crewToken));
    expect(accepted.status).toBe(201);
    const log = (await accepted.json()).log;
    expect(log).toMatchObject({ readingCount: 3, rejectedCount: 1 });
    const csv = await problemsRoute.GET(new Request(`${ORIGIN}/x`, { headers: bearer(crewToken) }), { params: Promise.resolve({ surveyId, logId: String(log.id) }) });
    expect(await csv.text()).toBe('line,kind,column,value,reason,message\r\n3,rejected,tmi_nT,n/a,non_numeric_field,"total field ""n/a"" is not a number"\r\n');
  });

  it("refuses the same file twice with 409 and a link to the log already there", async () => {
    const text = roverCsv(5, { startIso: "2026-05-05T11:00:00Z" });
    const first = await (await upload(surveyId, form(text, { kind: "rover" }, "a.csv"), bearer(crewToken))).json();
    const again = await upload(surveyId, form(text, { kind: "rover" }, "b.csv"), bearer(crewToken));
    expect(again.status).toBe(409);
    expect((await again.json()).error.details.existingLog.url).toBe(first.log.url);
  });

  it("refuses an announced body over 200 MiB before reading it (413)", async () => {
    const request = new Request(`${ORIGIN}/api/v1/surveys/${surveyId}/logs`, {
      method: "POST",
      body: "x",
      headers: { ...bearer(crewToken), "content-type": "multipart/form-data; boundary=zzz", "content-length": String(202 * 1024 * 1024) },
    });
    const res = await logsRoute.POST(request, { params: Promise.resolve({ surveyId }) });
    expect(res.status).toBe(413);
    expect((await res.json()).error.message).toMatch(/larger than 200 MB/);
  });

  it("a request cut off mid-file leaves the database and the upload folder unchanged", async () => {
    const before = await snapshot();
    const boundary = "----fieldtide-test-boundary";
    const head = `--${boundary}\r\nContent-Disposition: form-data; name="kind"\r\n\r\nrover\r\n--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="cut.csv"\r\nContent-Type: text/csv\r\n\r\n`;
    const half = roverCsv(20_000, { startIso: "2026-05-05T12:00:00Z" }).slice(0, 600_000);
    const enc = new TextEncoder();
    const body = new ReadableStream<Uint8Array>({
      start(controller) {
        controller.enqueue(enc.encode(head));
        controller.enqueue(enc.encode(half));
        setTimeout(() => controller.error(new Error("connection reset by peer")), 20);
      },
    });
    const res = await upload(surveyId, body, { ...bearer(crewToken), "content-type": `multipart/form-data; boundary=${boundary}` });
    expect(res.status).toBe(400);
    expect((await res.json()).error.fieldErrors.file[0]).toMatch(/interrupted/);
    expect(await snapshot()).toEqual(before);
  });
});

describe("refusals through the route: clear error, nothing kept", () => {
  const cases: [string, BlobPart, Record<string, string>, RegExp][] = [
    ["an empty file", "", {}, /is empty/],
    ["a binary file", new Uint8Array([0x50, 0x4b, 0x03, 0x04, 0x00, 0x00, 0x08, 0x00]), {}, /not a text log/],
    ["a wrong delimiter", "time;field\n2026-05-04T09:00:00Z;48000\n", { delimiter: "comma" }, /separated by semicolons/],
    ["a missing field column", "time,lat,lon\n2026-05-04T09:00:00Z,53.6,-1.9\n", {}, /no total-field column/],
    ["non-numeric values", "time,field\n2026-05-04T09:00:00Z,4800O\n2026-05-04T09:00:01Z,48001\n", {}, /1 bad row of 2/],
    ["impossible timestamps", "time,field\n2026-13-04T09:00:00Z,48000\n2026-05-04T09:00:01Z,48001\n", {}, /1 bad row of 2/],
    ["times going backwards", "time,field\n2026-05-04T09:00:05Z,48000\n2026-05-04T09:00:01Z,48001\n", {}, /times going backwards or repeated/],
    ["duplicated timestamps", "time,field\n2026-05-04T09:00:05Z,48000\n2026-05-04T09:00:05Z,48001\n", {}, /times going backwards or repeated/],
    ["a header only", "time,field\r\n", {}, /header row but no readings/],
  ];
  for (const [name, content, extra, message] of cases) {
    it(name, async () => {
      const before = await snapshot();
      const fd = new FormData();
      fd.append("kind", "rover");
      for (const [k, v] of Object.entries(extra)) fd.append(k, v);
      fd.append("file", new Blob([content]), `${name.replace(/ /g, "-")}.csv`);
      const res = await upload(surveyId, fd, bearer(crewToken));
      expect(res.status).toBe(422);
      expect((await res.json()).error.message).toMatch(message);
      expect(await snapshot()).toEqual(before);
    });
  }

  it("a request without a file part, or not multipart", async () => {
    const fd = new FormData();
    fd.append("kind", "rover");
    const res = await upload(surveyId, fd, bearer(crewToken));
    expect(res.status).toBe(400);
    expect((await res.json()).error.fieldErrors.file[0]).toMatch(/Attach the log file/);
    const json = await upload(surveyId, new Blob(["{}"]).stream(), { ...bearer(crewToken), "content-type": "application/json" });
    expect(json.status).toBe(400);
  });
});

describe("who may upload and list", () => {
  it("no credentials → 401; a revoked token → 401", async () => {
    expect((await upload(surveyId, form(roverCsv(1), { kind: "rover" }), {})).status).toBe(401);
    const { token, apiToken } = await createApiToken(crew, { name: "old laptop" });
    await revokeApiToken(crew, apiToken.id);
    const res = await list(surveyId, bearer(token));
    expect(res.status).toBe(401);
  });

  it("a crew member of another survey cannot upload to (404) or list (404) this survey's logs; a reviewer may list but not upload (403)", async () => {
    const outsiderToken = (await createApiToken(outsider, { name: "x" })).token;
    const before = await snapshot();
    const up = await upload(surveyId, form(roverCsv(2, { startIso: "2026-05-06T07:00:00Z" }), { kind: "rover" }), bearer(outsiderToken));
    expect(up.status).toBe(404);
    expect((await list(surveyId, bearer(outsiderToken))).status).toBe(404);
    const reviewerToken = (await createApiToken(reviewer, { name: "y" })).token;
    expect((await upload(surveyId, form(roverCsv(2, { startIso: "2026-05-06T07:00:00Z" }), { kind: "rover" }), bearer(reviewerToken))).status).toBe(403);
    expect(await snapshot()).toEqual(before);
    expect((await list(surveyId, bearer(reviewerToken))).status).toBe(200);
  });

  it("validates the list query", async () => {
    const res = await list(surveyId, bearer(crewToken), "?pageSize=5000&day=yesterday");
    expect(res.status).toBe(400);
    expect(Object.keys((await res.json()).error.fieldErrors).sort()).toEqual(["day", "pageSize"]);
  });
});
