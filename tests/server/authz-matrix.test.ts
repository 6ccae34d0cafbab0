/**
 * The authorization matrix, generated from the file system and the route access table
 * (src/server/authz/route-access.ts), whose survey entries name permissions of the permission table.
 *
 * 1. Every route handler export (GET/POST/PUT/PATCH/DELETE in app/**\/route.ts) and every exported
 *    async function of a server-action module (app/**\/actions.ts or a "use server" file) must be in
 *    the table, and every table entry must exist: a new route fails here until it is listed.
 * 2. Each entry is called as anonymous, as each role on its survey, as each role on another survey
 *    and as org admin, and the outcome (allowed / 401 / 403 / survey 404) is checked against the table.
 *
 * Route handlers get real Requests with a session cookie. Server actions run outside Next, so
 * `next/headers` is mocked with a cookie jar holding the chosen caller's session (cookies()) and a
 * plain Headers (headers()); `next/cache` revalidation is a no-op; `next/navigation` is the real
 * one (redirect throws its NEXT_REDIRECT error, read back from its digest). The app's
 * actionErrorState is wrapped to record which error class an action turned into form state.
 */
import fs from "node:fs";
import path from "node:path";
import { randomUUID } from "node:crypto";
import { beforeAll, describe, expect, it, vi } from "vitest";
import { setupTestDatabase } from "../support/test-db";

const jar = vi.hoisted(() => ({ cookies: new Map<string, string>(), lastActionError: null as unknown }));

vi.mock("next/headers", () => ({
  cookies: async () => ({
    get: (name: string) => (jar.cookies.has(name) ? { name, value: jar.cookies.get(name)! } : undefined),
    getAll: () => [...jar.cookies].map(([name, value]) => ({ name, value })),
    has: (name: string) => jar.cookies.has(name),
    set: (name: string, value: string) => {
      if (value === "") jar.cookies.delete(name);
      else jar.cookies.set(name, value);
    },
    delete: (name: string) => jar.cookies.delete(name),
  }),
  headers: async () => new Headers({ host: "localhost:3000", origin: "http://localhost:3000" }),
}));
vi.mock("next/cache", () => ({ revalidatePath: () => undefined, revalidateTag: () => undefined }));
vi.mock("@/app/_lib/action-errors", async (importOriginal) => {
  const actual = await importOriginal<typeof import("@/app/_lib/action-errors")>();
  return {
    ...actual,
    actionErrorState: (err: unknown) => {
      jar.lastActionError = err;
      return actual.actionErrorState(err);
    },
  };
});

const ROOT = path.resolve(import.meta.dirname, "..", "..");
const testDb = setupTestDatabase({ APP_URL: "http://localhost:3000" });
process.env.UPLOAD_DIR = path.join(testDb.dir, "uploads");
const { startTestSmtp, lastMailTo, tokenFromMail } = await import("../support/smtp");
await startTestSmtp();

const { ROUTE_ACCESS, ACTION_ACCESS, assertRouteAccess } = await import("@/src/server/authz/route-access");
type Entry = import("@/src/server/authz/route-access").RouteAccessEntry;
const { SURVEY_ROLES, roleAllows, SURVEY_NOT_FOUND } = await import("@/src/server/authz/permissions");
const { ForbiddenError, NotFoundError, UnauthenticatedError } = await import("@/src/server/errors");
const { createSession } = await import("@/src/server/auth/accounts");
const { SESSION_COOKIE_NAME } = await import("@/src/server/auth/lucia");
const { importLogStream } = await import("@/src/server/logs/import-service");
const { startRun, waitForRun } = await import("@/src/server/runs/service");
const { readSettings } = await import("@/src/server/processing/service");
const { requestPasswordReset } = await import("@/src/server/auth/password-reset");
const { inviteToSurvey } = await import("@/src/server/invitations/service");
const { createApiToken } = await import("@/src/server/api-tokens/service");
const { getDb } = await import("@/src/server/db/client");
const { makeUser, makeSurvey, addMember } = await import("../support/fixtures");
const { BASE_POSITION, DAY, baseCsv, roverCsv, streamOf } = await import("./days/day-fixtures");
type SurveyRole = (typeof SURVEY_ROLES)[number];
type User = Awaited<ReturnType<typeof makeUser>>;

// ---------------------------------------------------------------- discovery
const HTTP_METHODS = ["GET", "POST", "PUT", "PATCH", "DELETE"] as const;

function walk(dir: string): string[] {
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((d) => {
    const p = path.join(dir, d.name);
    return d.isDirectory() ? walk(p) : [p];
  });
}

const appFiles = walk(path.join(ROOT, "app")).filter((f) => /\.(ts|tsx)$/.test(f));

/** "METHOD /path" → file, route groups dropped. */
function discoverRoutes(): Map<string, string> {
  const out = new Map<string, string>();
  for (const file of appFiles.filter((f) => /[/\\]route\.tsx?$/.test(f))) {
    const text = fs.readFileSync(file, "utf8");
    const urlPath = "/" + path.relative(path.join(ROOT, "app"), path.dirname(file)).split(path.sep).filter((s) => !/^\(.*\)$/.test(s)).join("/");
    for (const m of HTTP_METHODS) {
      if (new RegExp(`export\\s+(async\\s+)?function\\s+${m}\\b|export\\s+(const|let)\\s+${m}\\b|export\\s*\\{[^}]*\\b${m}\\b`).test(text)) out.set(`${m} ${urlPath}`, file);
    }
  }
  return out;
}

/** "app/…/actions.ts#name" → file, for actions.ts files and any module that starts with "use server". */
function discoverActions(): Map<string, string> {
  const out = new Map<string, string>();
  for (const file of appFiles) {
    const text = fs.readFileSync(file, "utf8");
    const isActionModule = /[/\\]actions\.ts$/.test(file) || /^\s*(\/\*[\s\S]*?\*\/\s*|\/\/[^\n]*\n\s*)*["']use server["']/.test(text);
    if (!isActionModule) continue;
    const rel = path.relative(ROOT, file).split(path.sep).join("/");
    for (const m of text.matchAll(/export\s+async\s+function\s+(\w+)|export\s+const\s+(\w+)\s*=\s*async\b/g)) out.set(`${rel}#${m[1] ?? m[2]}`, file);
  }
  return out;
}

const routes = discoverRoutes();
const actions = discoverActions();

describe("every route handler and server action is in the route access table", () => {
  it("finds the app's handlers at all (the scan works)", () => {
    expect(routes.size).toBeGreaterThanOrEqual(10);
    expect(actions.size).toBeGreaterThanOrEqual(10);
  });
  it("lists every route handler; lists no route that does not exist", () => {
    const table = Object.keys(ROUTE_ACCESS);
    expect([...routes.keys()].filter((k) => !table.includes(k)), "route handlers missing from ROUTE_ACCESS").toEqual([]);
    expect(table.filter((k) => !routes.has(k)), "ROUTE_ACCESS entries with no handler").toEqual([]);
  });
  it("lists every server action; lists no action that does not exist", () => {
    const table = Object.keys(ACTION_ACCESS);
    expect([...actions.keys()].filter((k) => !table.includes(k)), "server actions missing from ACTION_ACCESS").toEqual([]);
    expect(table.filter((k) => !actions.has(k)), "ACTION_ACCESS entries with no action").toEqual([]);
  });
});

// ---------------------------------------------------------------- callers and fixtures
const ORIGIN = "http://localhost:3000";
type CallerId = "anonymous" | "admin" | `own:${SurveyRole}` | `foreign:${SurveyRole}`;
const CALLERS: CallerId[] = ["anonymous", ...SURVEY_ROLES.map((r) => `own:${r}` as const), ...SURVEY_ROLES.map((r) => `foreign:${r}` as const), "admin"];

type Fixture = { surveyId: string; surveyCode: string; otherSurveyId: string; day: string; baseLogId: number; roverLogId: number; processor: User; admin: User };
const fx = {} as Fixture;
const users = new Map<CallerId, User>();
const sessions = new Map<CallerId, string>();
let uploadCounter = 0;

beforeAll(async () => {
  fx.surveyId = await makeSurvey();
  fx.otherSurveyId = await makeSurvey();
  fx.surveyCode = (await getDb()("surveys").where({ id: fx.surveyId }).first()).code;
  fx.day = DAY;
  fx.admin = await makeUser({ isAdmin: true });
  users.set("admin", fx.admin);
  for (const role of SURVEY_ROLES) {
    const own = await makeUser();
    await addMember(fx.surveyId, own.userId, role);
    users.set(`own:${role}`, own);
    const foreign = await makeUser();
    await addMember(fx.otherSurveyId, foreign.userId, role);
    users.set(`foreign:${role}`, foreign);
  }
  fx.processor = users.get("own:processor")!;
  const base = await importLogStream(fx.processor, fx.surveyId, streamOf(baseCsv()), {
    fileName: "matrix-base.csv", kind: "base", baseSiteName: "Gate", baseLatitudeDeg: BASE_POSITION.latDeg, baseLongitudeDeg: BASE_POSITION.lonDeg,
  });
  const rover = await importLogStream(fx.processor, fx.surveyId, streamOf(roverCsv({ lines: 2, perLine: 200 })), { fileName: "matrix-rover.csv", kind: "rover", acceptGoodRows: true });
  fx.baseLogId = Number((base as { log: { id: number } }).log.id);
  fx.roverLogId = Number((rover as { log: { id: number } }).log.id);
  for (let i = 0; i < 2; i++) {
    const run = await startRun(fx.processor, fx.surveyId, DAY);
    await waitForRun(fx.processor, fx.surveyId, DAY, run.number);
  }
});

async function sessionOf(caller: CallerId): Promise<string | null> {
  if (caller === "anonymous") return null;
  if (!sessions.has(caller)) sessions.set(caller, (await createSession(users.get(caller)!.userId)).id);
  return sessions.get(caller)!;
}

// ---------------------------------------------------------------- outcomes
type Outcome = "allowed" | "unauthenticated" | "forbidden" | "not-found";

function expected(entry: Entry, caller: CallerId): Outcome {
  if (entry.who === "anonymous") return "allowed";
  if (caller === "anonymous") return "unauthenticated";
  if (entry.who === "signed-in") return "allowed";
  if (caller === "admin") return "allowed";
  if (entry.who === "admin") return "forbidden";
  const [where, role] = caller.split(":") as ["own" | "foreign", SurveyRole];
  if (where === "foreign") return "not-found";
  return roleAllows(role, entry.permission) ? "allowed" : "forbidden";
}

async function routeOutcome(res: Response): Promise<{ outcome: Outcome; detail: string }> {
  const text = await res.text();
  let message = "";
  try {
    message = JSON.parse(text)?.error?.message ?? "";
  } catch {
    /* not JSON (a download) */
  }
  const detail = `${res.status} ${text.slice(0, 160)}`;
  if (res.status === 401) return { outcome: "unauthenticated", detail };
  if (res.status === 403) return { outcome: "forbidden", detail };
  if (res.status === 404 && message === SURVEY_NOT_FOUND) return { outcome: "not-found", detail };
  // Allowed means the call did what it is for: a 2xx answer, not merely "not refused".
  return { outcome: res.status < 300 ? "allowed" : ("error" as Outcome), detail };
}

function classifyError(err: unknown): Outcome | "error" {
  if (err instanceof UnauthenticatedError) return "unauthenticated";
  if (err instanceof ForbiddenError) return "forbidden";
  if (err instanceof NotFoundError && err.message === SURVEY_NOT_FOUND) return "not-found";
  return "error";
}

async function actionOutcome(run: () => Promise<unknown>): Promise<{ outcome: Outcome | "error"; detail: string }> {
  jar.lastActionError = null;
  try {
    const state = (await run()) as { status?: string; formError?: string; fieldErrors?: unknown } | undefined;
    if (state && state.status === "error") {
      return { outcome: classifyError(jar.lastActionError), detail: `state ${JSON.stringify(state).slice(0, 200)}` };
    }
    return { outcome: "allowed", detail: `state ${JSON.stringify(state ?? null).slice(0, 120)}` };
  } catch (err) {
    const digest = (err as { digest?: unknown })?.digest;
    if (typeof digest === "string" && digest.startsWith("NEXT_REDIRECT")) {
      const url = digest.split(";")[2] ?? "";
      if (/^\/sign-in(\?next=|$)/.test(url)) return { outcome: "unauthenticated", detail: `redirect ${url}` };
      return { outcome: "allowed", detail: `redirect ${url}` };
    }
    return { outcome: classifyError(err), detail: `threw ${String(err)}` };
  }
}

// ---------------------------------------------------------------- call recipes
type RouteCall = { request: (headers: Headers) => Request | Promise<Request>; params: (f: Fixture) => Record<string, string> };
const survey = (f: Fixture) => ({ surveyId: f.surveyId });
const day = (f: Fixture) => ({ surveyId: f.surveyId, date: f.day });
const run1 = (f: Fixture) => ({ surveyId: f.surveyId, date: f.day, run: "1" });
const u = (p: string, init: RequestInit = {}) => (headers: Headers) => new Request(`${ORIGIN}${p.replace("{S}", fx.surveyId).replace("{D}", fx.day)}`, { ...init, headers });

function uploadForm(): FormData {
  uploadCounter += 1;
  const fd = new FormData();
  fd.append("kind", "rover");
  fd.append("acceptGoodRows", "true");
  // Distinct bytes per upload (its own line name), so none is refused as a duplicate of another.
  const text = roverCsv({ lines: 1, perLine: 20 }).replace(/,L100,/g, `,M${uploadCounter},`);
  fd.append("file", new Blob([`${text}`], { type: "text/csv" }), `matrix-upload-${uploadCounter}.csv`);
  return fd;
}

async function settleRuns(): Promise<void> {
  const open = await getDb()("correction_runs").where({ survey_id: fx.surveyId }).whereIn("status", ["queued", "running"]).select("number");
  for (const r of open) await waitForRun(fx.processor, fx.surveyId, fx.day, r.number);
}

const signInPassword = "matrix-sign-in-password";
let signInUser: User;

const ROUTE_CALLS: Record<string, RouteCall> = {
  "GET /api/health": { request: u("/api/health"), params: () => ({}) },
  "POST /api/v1/auth/sign-in": {
    request: async (h) => {
      signInUser ??= await makeUser({ password: signInPassword });
      h.set("content-type", "application/json");
      return new Request(`${ORIGIN}/api/v1/auth/sign-in`, { method: "POST", headers: h, body: JSON.stringify({ email: signInUser.email, password: signInPassword }) });
    },
    params: () => ({}),
  },
  "POST /api/v1/auth/sign-out": { request: (h) => new Request(`${ORIGIN}/api/v1/auth/sign-out`, { method: "POST", headers: h }), params: () => ({}) },
  "GET /api/v1/reference-field": { request: u("/api/v1/reference-field?lat=43&lon=93&heightM=0&date=2025-01-01&model=wmm"), params: () => ({}) },
  "GET /api/v1/surveys/[surveyId]/days": { request: u("/api/v1/surveys/{S}/days"), params: survey },
  "GET /api/v1/surveys/[surveyId]/days/[date]": { request: u("/api/v1/surveys/{S}/days/{D}"), params: day },
  "GET /api/v1/surveys/[surveyId]/days/[date]/series": { request: u("/api/v1/surveys/{S}/days/{D}/series?kind=base&maxPoints=100"), params: day },
  "GET /api/v1/surveys/[surveyId]/days/[date]/runs": { request: u("/api/v1/surveys/{S}/days/{D}/runs"), params: day },
  "POST /api/v1/surveys/[surveyId]/days/[date]/runs": {
    // One run per day at a time (409 otherwise): let the previous caller's run finish first.
    request: async (h) => {
      await settleRuns();
      return new Request(`${ORIGIN}/api/v1/surveys/${fx.surveyId}/days/${fx.day}/runs`, { method: "POST", headers: h });
    },
    params: day,
  },
  "GET /api/v1/surveys/[surveyId]/days/[date]/runs/[run]": { request: u("/api/v1/surveys/{S}/days/{D}/runs/1"), params: run1 },
  "GET /api/v1/surveys/[surveyId]/days/[date]/runs/[run]/compare": { request: u("/api/v1/surveys/{S}/days/{D}/runs/1/compare?with=2"), params: run1 },
  "GET /api/v1/surveys/[surveyId]/days/[date]/runs/[run]/corrected.csv": { request: u("/api/v1/surveys/{S}/days/{D}/runs/1/corrected.csv"), params: run1 },
  "GET /api/v1/surveys/[surveyId]/days/[date]/runs/[run]/corrected.geojson": { request: u("/api/v1/surveys/{S}/days/{D}/runs/1/corrected.geojson"), params: run1 },
  "GET /api/v1/surveys/[surveyId]/logs": { request: u("/api/v1/surveys/{S}/logs"), params: survey },
  "POST /api/v1/surveys/[surveyId]/logs": {
    request: (h) => new Request(`${ORIGIN}/api/v1/surveys/${fx.surveyId}/logs`, { method: "POST", headers: h, body: uploadForm() }),
    params: survey,
  },
  "GET /api/v1/surveys/[surveyId]/logs/[logId]/original": { request: (h) => new Request(`${ORIGIN}/api/v1/surveys/${fx.surveyId}/logs/${fx.roverLogId}/original`, { headers: h }), params: (f) => ({ surveyId: f.surveyId, logId: String(f.roverLogId) }) },
  "GET /api/v1/surveys/[surveyId]/logs/[logId]/problems": { request: (h) => new Request(`${ORIGIN}/api/v1/surveys/${fx.surveyId}/logs/${fx.roverLogId}/problems`, { headers: h }), params: (f) => ({ surveyId: f.surveyId, logId: String(f.roverLogId) }) },
  // Review (issue 6): each POST starts from the state it needs, so only the caller decides the outcome.
  "GET /api/v1/surveys/[surveyId]/days/[date]/review": { request: u("/api/v1/surveys/{S}/days/{D}/review"), params: day },
  "POST /api/v1/surveys/[surveyId]/days/[date]/review/submit": {
    request: async (h) => {
      await getDb()("day_reviews").where({ survey_id: fx.surveyId, day: fx.day }).delete();
      h.set("content-type", "application/json");
      return new Request(`${ORIGIN}/api/v1/surveys/${fx.surveyId}/days/${fx.day}/review/submit`, { method: "POST", headers: h, body: JSON.stringify({ comment: "matrix" }) });
    },
    params: day,
  },
  "POST /api/v1/surveys/[surveyId]/days/[date]/review/decision": {
    request: async (h) => {
      const now = new Date().toISOString();
      await getDb()("day_reviews").insert({ survey_id: fx.surveyId, day: fx.day, state: "awaiting_review", submitted_by: fx.processor.userId, submitted_at: now, updated_at: now }).onConflict(["survey_id", "day"]).merge();
      h.set("content-type", "application/json");
      return new Request(`${ORIGIN}/api/v1/surveys/${fx.surveyId}/days/${fx.day}/review/decision`, { method: "POST", headers: h, body: JSON.stringify({ decision: "accept" }) });
    },
    params: day,
  },
  "GET /api/v1/surveys/[surveyId]/kp": { request: u("/api/v1/surveys/{S}/kp"), params: survey },
  "POST /api/v1/surveys/[surveyId]/kp": {
    request: (h) => {
      h.set("content-type", "text/csv");
      return new Request(`${ORIGIN}/api/v1/surveys/${fx.surveyId}/kp`, { method: "POST", headers: h, body: "start,kp\n2026-05-04T12:00Z,2o\n" });
    },
    params: survey,
  },
};

type Fn = (...args: unknown[]) => Promise<unknown>;
type ActionCall = (fn: Fn) => Promise<unknown>;
const fd = (fields: Record<string, string | string[]>) => {
  const out = new FormData();
  for (const [k, v] of Object.entries(fields)) for (const one of [v].flat()) out.append(k, one);
  return out;
};
const IDLE = { status: "idle" };
const fresh = () => randomUUID().slice(0, 8);

async function settingsFields(): Promise<Record<string, string>> {
  const { settings } = await readSettings(getDb(), fx.surveyId);
  return Object.fromEntries(Object.entries(settings).map(([k, v]) => [k, v === null ? "" : String(v)]));
}

const ACTION_CALLS: Record<string, ActionCall> = {
  "app/(auth)/sign-in/actions.ts#signInAction": async (fn) => {
    signInUser ??= await makeUser({ password: signInPassword });
    return fn(IDLE, fd({ email: signInUser.email, password: signInPassword, next: "/surveys" }));
  },
  "app/(auth)/forgot-password/actions.ts#requestPasswordResetAction": (fn) => fn(IDLE, fd({ email: `nobody-${fresh()}@test.example` })),
  "app/(auth)/reset-password/[token]/actions.ts#resetPasswordAction": async (fn) => {
    const someone = await makeUser();
    await requestPasswordReset({ email: someone.email });
    const token = tokenFromMail((await lastMailTo(someone.email))?.text_body, "reset-password");
    return fn(token, IDLE, fd({ password: "a-new-long-password", confirm: "a-new-long-password" }));
  },
  "app/(auth)/invitations/[token]/actions.ts#acceptInvitationAction": async (fn) => {
    const email = `invitee-${fresh()}@test.example`;
    await inviteToSurvey(fx.admin, fx.otherSurveyId, { email, role: "crew" });
    const token = tokenFromMail((await lastMailTo(email))?.text_body, "invitations");
    return fn(token, IDLE, fd({ account: "new", name: "Invited Person", password: "invitee-password-1", confirm: "invitee-password-1" }));
  },
  "app/(workspace)/actions.ts#signOutAction": (fn) => fn(),
  "app/(workspace)/profile/actions.ts#createApiTokenAction": (fn) => fn(IDLE, fd({ name: `laptop ${fresh()}` })),
  "app/(workspace)/profile/actions.ts#revokeApiTokenAction": async (fn) => {
    // The caller's own token when signed in (someone else's would be "not found" by design).
    const owner = currentCaller === "anonymous" ? fx.admin : users.get(currentCaller)!;
    const { apiToken } = await createApiToken(owner, { name: `to revoke ${fresh()}` });
    return fn(fd({ tokenId: apiToken.id }));
  },
  "app/(workspace)/profile/actions.ts#signOutEverywhereAction": (fn) => fn(),
  "app/(workspace)/surveys/new/actions.ts#createSurveyAction": (fn) =>
    fn(IDLE, fd({ name: "Matrix survey", code: `M-${fresh().toUpperCase()}`, client: "", areaDescription: "", timeZone: "UTC", notes: "" })),
  "app/(workspace)/surveys/[surveyId]/edit/actions.ts#updateSurveyAction": (fn) =>
    fn(fx.surveyId, IDLE, fd({ name: `Matrix target ${fresh()}`, code: fx.surveyCode, client: "", areaDescription: "", timeZone: "UTC", notes: "" })),
  // "restore" on a survey that is not archived: passes the check, changes nothing, keeps the survey writable.
  "app/(workspace)/surveys/[surveyId]/edit/actions.ts#setArchivedAction": (fn) => fn(fx.surveyId, IDLE, fd({ intent: "restore" })),
  "app/(workspace)/surveys/[surveyId]/members/actions.ts#inviteAction": (fn) => fn(fx.surveyId, IDLE, fd({ email: `guest-${fresh()}@test.example`, role: "crew" })),
  "app/(workspace)/surveys/[surveyId]/members/actions.ts#memberAction": async (fn) => {
    const member = await makeUser();
    await addMember(fx.surveyId, member.userId, "crew");
    return fn(fx.surveyId, IDLE, fd({ userId: member.userId, intent: "remove", role: "", memberName: member.name }));
  },
  "app/(workspace)/surveys/[surveyId]/members/actions.ts#revokeInvitationAction": async (fn) => {
    const email = `pending-${fresh()}@test.example`;
    const { invitationId } = await inviteToSurvey(fx.admin, fx.surveyId, { email, role: "crew" });
    return fn(fx.surveyId, IDLE, fd({ invitationId, email }));
  },
  "app/(workspace)/surveys/[surveyId]/settings/actions.ts#updateProcessingSettingsAction": async (fn) => fn(fx.surveyId, IDLE, fd(await settingsFields())),
  "app/(workspace)/surveys/[surveyId]/days/[date]/actions.ts#updateDatumAction": (fn) => fn(fx.surveyId, fx.day, IDLE, fd({ datumKind: "value", datumValueNt: "49300" })),
  "app/(workspace)/surveys/[surveyId]/days/[date]/actions.ts#savePairingAction": (fn) =>
    fn(fx.surveyId, fx.day, IDLE, fd({ method: "base", baseLogId: String(fx.baseLogId), fallbackBaseLogId: "", roverLogIds: [String(fx.roverLogId)] })),
  // Review (issue 6): each call starts from the state its action needs, so only the caller decides the outcome.
  "app/(workspace)/surveys/[surveyId]/days/[date]/review-actions.ts#submitDayAction": async (fn) => {
    await getDb()("day_reviews").where({ survey_id: fx.surveyId, day: fx.day }).delete();
    return fn(fx.surveyId, fx.day, IDLE, fd({ comment: "matrix" }));
  },
  "app/(workspace)/surveys/[surveyId]/days/[date]/review-actions.ts#decideDayAction": async (fn) => {
    const now = new Date().toISOString();
    await getDb()("day_reviews").insert({ survey_id: fx.surveyId, day: fx.day, state: "awaiting_review", submitted_by: fx.processor.userId, submitted_at: now, updated_at: now }).onConflict(["survey_id", "day"]).merge();
    return fn(fx.surveyId, fx.day, IDLE, fd({ decision: "accept" }));
  },
  "app/(workspace)/surveys/[surveyId]/qa/actions.ts#updateQaThresholdsAction": async (fn) => {
    const { DEFAULT_QA_THRESHOLDS } = await import("@/src/server/qa-assessment/thresholds");
    return fn(fx.surveyId, IDLE, fd({ ...Object.fromEntries(Object.entries(DEFAULT_QA_THRESHOLDS).map(([k, v]) => [k, String(v)])), spikeCount: String(10 + Number(fresh().replace(/\D/g, "").slice(0, 3) || 1)) }));
  },
  "app/(workspace)/surveys/[surveyId]/qa/actions.ts#saveKpAction": (fn) => fn(fx.surveyId, IDLE, fd({ text: "2026-05-04T09:00Z,3+" })),
  "app/(workspace)/profile/notification-actions.ts#saveNotificationPreferencesAction": (fn) => fn(IDLE, fd({ enabled: ["review.awaiting", "review.accepted"] })),
};

let currentCaller: CallerId = "anonymous";
/** Entries that end the session they are called with (sign-in rotates it, sign-out ends it). */
const SESSION_ENDING = /\/auth\/sign-(in|out)$|#(signInAction|acceptInvitationAction|signOutAction|signOutEverywhereAction)$/;

describe("every table entry has a call recipe in this test", () => {
  it("routes", () => expect(Object.keys(ROUTE_ACCESS).filter((k) => !ROUTE_CALLS[k]), "add a ROUTE_CALLS recipe in tests/server/authz-matrix.test.ts").toEqual([]));
  it("actions", () => expect(Object.keys(ACTION_ACCESS).filter((k) => !ACTION_CALLS[k]), "add an ACTION_CALLS recipe in tests/server/authz-matrix.test.ts").toEqual([]));
});

describe.each(Object.entries(ROUTE_ACCESS) as [string, Entry][])("route %s", (key, entry) => {
  it.each(CALLERS)("as %s", async (caller) => {
    const recipe = ROUTE_CALLS[key];
    const file = routes.get(key);
    if (!recipe || !file) throw new Error(`no recipe or no handler for ${key}`);
    const handler = (await import(file))[key.split(" ")[0]] as (r: Request, c: { params: Promise<Record<string, string>> }) => Promise<Response>;
    const headers = new Headers({ host: "localhost:3000" });
    if (entry.changesState) headers.set("origin", ORIGIN);
    const session = caller === "anonymous" ? null : SESSION_ENDING.test(key) ? (await createSession(users.get(caller)!.userId)).id : await sessionOf(caller);
    if (session) headers.set("cookie", `${SESSION_COOKIE_NAME}=${session}`);
    const res = await handler(await recipe.request(headers), { params: Promise.resolve(recipe.params(fx)) });
    const { outcome, detail } = await routeOutcome(res);
    expect({ outcome, detail: outcome === expected(entry, caller) ? "" : detail }).toEqual({ outcome: expected(entry, caller), detail: "" });
  });
});

describe.each(Object.entries(ACTION_ACCESS) as [string, Entry][])("action %s", (key, entry) => {
  it.each(CALLERS)("as %s", async (caller) => {
    const recipe = ACTION_CALLS[key];
    const file = actions.get(key);
    if (!recipe || !file) throw new Error(`no recipe or no action for ${key}`);
    const fn = (await import(file))[key.split("#")[1]] as Fn;
    currentCaller = caller;
    jar.cookies.clear();
    // Sign-in, invitation acceptance and sign-out end the session they are called with: give them one of their own.
    const session = caller === "anonymous" ? null : SESSION_ENDING.test(key) ? (await createSession(users.get(caller)!.userId)).id : await sessionOf(caller);
    if (session) jar.cookies.set(SESSION_COOKIE_NAME, session);
    const { outcome, detail } = await actionOutcome(() => recipe(fn));
    if (key.endsWith("#signOutEverywhereAction")) sessions.delete(caller); // all of the caller's sessions ended
    expect({ outcome, detail: outcome === expected(entry, caller) ? "" : detail }).toEqual({ outcome: expected(entry, caller), detail: "" });
  });
});

// The helper that applies an entry in code agrees with what the handlers themselves did above.
describe.each([...Object.entries(ROUTE_ACCESS), ...Object.entries(ACTION_ACCESS)] as [string, Entry][])("assertRouteAccess for %s", (_key, entry) => {
  it.each(CALLERS)("as %s", async (caller) => {
    let outcome: Outcome | "error" = "allowed";
    try {
      await assertRouteAccess(entry, caller === "anonymous" ? null : users.get(caller)!, fx.surveyId);
    } catch (err) {
      outcome = classifyError(err);
    }
    expect(outcome).toBe(expected(entry, caller));
  });
});
