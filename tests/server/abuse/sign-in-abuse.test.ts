/**
 * Sign-in abuse: failed sign-ins throttled per account and per client address (sliding window in
 * SQLite) on the JSON route (429) and the form (field message); a new session id on every sign-in;
 * session expiry and lucia's extend-on-use; sign out everywhere; revoked API tokens refused at once.
 * Limits are the throttle's own constants (common practice: 5 per account, 20 per address, 15 min).
 */
import path from "node:path";
import { beforeAll, describe, expect, it, vi } from "vitest";
import { setupTestDatabase } from "../../support/test-db";

const jar = vi.hoisted(() => ({ cookies: new Map<string, string>(), address: "198.51.100.7" }));
vi.mock("next/headers", () => ({
  cookies: async () => ({
    get: (name: string) => (jar.cookies.has(name) ? { name, value: jar.cookies.get(name)! } : undefined),
    set: (name: string, value: string) => (value === "" ? jar.cookies.delete(name) : jar.cookies.set(name, value)),
    delete: (name: string) => jar.cookies.delete(name),
  }),
  headers: async () => new Headers({ host: "localhost:3000", "x-forwarded-for": jar.address }),
}));
vi.mock("next/cache", () => ({ revalidatePath: () => undefined }));

const testDb = setupTestDatabase({ APP_URL: "http://localhost:3000" });
process.env.UPLOAD_DIR = path.join(testDb.dir, "uploads");

const signInRoute = await import("@/app/api/v1/auth/sign-in/route");
const logsRoute = await import("@/app/api/v1/surveys/[surveyId]/logs/route");
const { signInAction } = await import("@/app/(auth)/sign-in/actions");
const { signOutEverywhereAction } = await import("@/app/(workspace)/profile/actions");
const throttle = await import("@/src/server/auth/throttle");
const { createSession, checkSession, validateSessionId } = await import("@/src/server/auth/accounts");
const { SESSION_COOKIE_NAME } = await import("@/src/server/auth/lucia");
const { createApiToken, revokeApiToken } = await import("@/src/server/api-tokens/service");
const { getDb } = await import("@/src/server/db/client");
const { makeUser, makeSurvey, addMember } = await import("../../support/fixtures");

const ORIGIN = "http://localhost:3000";
const { MAX_FAILURES_PER_ACCOUNT: PER_ACCOUNT, MAX_FAILURES_PER_ADDRESS: PER_ADDRESS, WINDOW_MS } = throttle;

function signIn(email: string, password: string, address: string): Promise<Response> {
  return signInRoute.POST(
    new Request(`${ORIGIN}/api/v1/auth/sign-in`, {
      method: "POST",
      headers: { "content-type": "application/json", host: "localhost:3000", "x-forwarded-for": address },
      body: JSON.stringify({ email, password }),
    }),
  );
}

const formOf = (fields: Record<string, string>) => {
  const fd = new FormData();
  for (const [k, v] of Object.entries(fields)) fd.append(k, v);
  return fd;
};

/** Runs a server action; a Next redirect comes back as its target URL. */
async function runAction(fn: () => Promise<unknown>): Promise<{ redirect?: string; state?: unknown }> {
  try {
    return { state: await fn() };
  } catch (err) {
    const digest = (err as { digest?: string }).digest;
    if (typeof digest === "string" && digest.startsWith("NEXT_REDIRECT")) return { redirect: digest.split(";")[2] };
    throw err;
  }
}

describe("failed sign-in throttle", () => {
  it("locks an account after its limit of failures, even for the right password, with a 429 and a wait in minutes", async () => {
    const user = await makeUser();
    for (let i = 0; i < PER_ACCOUNT; i++) expect((await signIn(user.email, "wrong-password-123", `203.0.113.${i + 1}`)).status).toBe(401);
    const locked = await signIn(user.email, user.password, "203.0.113.99"); // right password, other address
    expect(locked.status).toBe(429);
    expect((await locked.json()).error.message).toBe("Too many failed sign-ins; try again in 15 minutes.");
    // Another account from the same addresses is unaffected.
    const other = await makeUser();
    expect((await signIn(other.email, other.password, "203.0.113.1")).status).toBe(200);
  });

  it("locks a client address after its limit of failures across many accounts; other addresses still sign in", async () => {
    const user = await makeUser();
    for (let i = 0; i < PER_ADDRESS; i++) expect((await signIn(`guess-${i}@test.example`, "wrong-password-123", "192.0.2.50")).status).toBe(401);
    expect((await signIn(user.email, user.password, "192.0.2.50")).status).toBe(429);
    expect((await signIn(user.email, user.password, "192.0.2.51")).status).toBe(200);
  });

  it("slides: failures older than the window do not count, and the wait is until the oldest counted one leaves", async () => {
    const user = await makeUser();
    const key = throttle.signInKey(user.email, "192.0.2.77");
    const now = Date.now();
    for (let i = 0; i < PER_ACCOUNT; i++) await throttle.recordSignInFailure(key, now - WINDOW_MS - 60_000 * (i + 1)); // all outside
    expect((await signIn(user.email, user.password, "192.0.2.77")).status).toBe(200);
    // 5 failures 12, 11, 10, 9, 8 minutes ago: the oldest leaves the 15-min window in 3 min.
    for (let i = 0; i < PER_ACCOUNT; i++) await throttle.recordSignInFailure(key, now - (12 - i) * 60_000);
    const res = await signIn(user.email, user.password, "192.0.2.78");
    expect(res.status).toBe(429);
    expect((await res.json()).error.message).toBe("Too many failed sign-ins; try again in 3 minutes.");
  });

  it("clears the account's failures on a successful sign-in", async () => {
    const user = await makeUser();
    for (let i = 0; i < PER_ACCOUNT - 1; i++) await signIn(user.email, "wrong-password-123", "192.0.2.90");
    expect((await signIn(user.email, user.password, "192.0.2.90")).status).toBe(200);
    expect(await getDb()("sign_in_failures").where({ account: user.email.toLowerCase() }).count<{ n: number }[]>({ n: "*" })).toEqual([{ n: 0 }]);
    for (let i = 0; i < PER_ACCOUNT - 1; i++) await signIn(user.email, "wrong-password-123", "192.0.2.90");
    expect((await signIn(user.email, user.password, "192.0.2.90")).status).toBe(200);
  });

  it("counts an e-mail in any letter case as the same account", async () => {
    const user = await makeUser();
    for (let i = 0; i < PER_ACCOUNT; i++) await signIn(i % 2 ? user.email.toUpperCase() : user.email, "wrong-password-123", "192.0.2.120");
    expect((await signIn(` ${user.email.toUpperCase()} `, user.password, "192.0.2.121")).status).toBe(429);
  });

  it("gives the sign-in form the message as a field message on the e-mail", async () => {
    const user = await makeUser();
    jar.address = "198.51.100.30";
    for (let i = 0; i < PER_ACCOUNT; i++) {
      const { state } = await runAction(() => signInAction({ status: "idle" }, formOf({ email: user.email, password: "wrong-password-123" })));
      expect(state).toMatchObject({ status: "error", formError: "E-mail or password is wrong." });
    }
    const { state } = await runAction(() => signInAction({ status: "idle" }, formOf({ email: user.email, password: user.password })));
    expect(state).toEqual({ status: "error", fieldErrors: { email: ["Too many failed sign-ins; try again in 15 minutes."] } });
  });
});

describe("sessions", () => {
  it("gives a new session id on sign-in and ends a session id planted before it", async () => {
    const user = await makeUser();
    const planted = (await createSession(user.userId)).id;
    jar.cookies.clear();
    jar.cookies.set(SESSION_COOKIE_NAME, planted);
    jar.address = "198.51.100.40";
    const { redirect } = await runAction(() => signInAction({ status: "idle" }, formOf({ email: user.email, password: user.password, next: "/surveys" })));
    expect(redirect).toBe("/surveys");
    const now = jar.cookies.get(SESSION_COOKIE_NAME);
    expect(now).toBeTruthy();
    expect(now).not.toBe(planted);
    expect(await validateSessionId(planted)).toBeNull();
    expect((await validateSessionId(now!))?.userId).toBe(user.userId);
  });

  it("the JSON sign-in route also ends the session id it was sent with and answers with a new one", async () => {
    const user = await makeUser();
    const planted = (await createSession(user.userId)).id;
    const res = await signInRoute.POST(
      new Request(`${ORIGIN}/api/v1/auth/sign-in`, {
        method: "POST",
        headers: { "content-type": "application/json", host: "localhost:3000", cookie: `${SESSION_COOKIE_NAME}=${planted}`, "x-forwarded-for": "198.51.100.41" },
        body: JSON.stringify({ email: user.email, password: user.password }),
      }),
    );
    expect(res.status).toBe(200);
    const fresh = /fieldtide_session=([^;]+)/.exec(res.headers.get("set-cookie") ?? "")?.[1];
    expect(fresh).toBeTruthy();
    expect(fresh).not.toBe(planted);
    expect(await validateSessionId(planted)).toBeNull();
    expect((await validateSessionId(fresh!))?.userId).toBe(user.userId);
  });

  it("refuses an expired session and extends one used in the second half of its life (lucia extend-on-use)", async () => {
    const user = await makeUser();
    const expired = (await createSession(user.userId)).id;
    await getDb()("sessions").where({ id: expired }).update({ expires_at: Math.floor(Date.now() / 1000) - 60 });
    expect(await validateSessionId(expired)).toBeNull();

    const ttlMs = 168 * 3_600_000; // SESSION_TTL_HOURS default (contract)
    const ageing = (await createSession(user.userId)).id;
    await getDb()("sessions").where({ id: ageing }).update({ expires_at: Math.floor((Date.now() + 3_600_000) / 1000) });
    const check = await checkSession(ageing);
    expect(check?.fresh).toBe(true);
    expect(Math.abs(check!.expiresAt.getTime() - (Date.now() + ttlMs))).toBeLessThan(60_000);
    const stored = await getDb()("sessions").where({ id: ageing }).first();
    expect(Math.abs(stored.expires_at * 1000 - (Date.now() + ttlMs))).toBeLessThan(60_000);
  });

  it("signs out everywhere: every session of the user ends, other users' sessions stay", async () => {
    const user = await makeUser();
    const other = await makeUser();
    const mine = [await createSession(user.userId), await createSession(user.userId), await createSession(user.userId)].map((s) => s.id);
    const theirs = (await createSession(other.userId)).id;
    jar.cookies.clear();
    jar.cookies.set(SESSION_COOKIE_NAME, mine[0]);
    const { redirect } = await runAction(() => signOutEverywhereAction());
    expect(redirect).toBe("/sign-in?note=signed-out");
    for (const id of mine) expect(await validateSessionId(id)).toBeNull();
    expect(jar.cookies.has(SESSION_COOKIE_NAME)).toBe(false);
    expect((await validateSessionId(theirs))?.userId).toBe(other.userId);
  });
});

describe("API tokens", () => {
  let surveyId: string;
  beforeAll(async () => {
    surveyId = await makeSurvey();
  });
  it("a revoked token is refused with 401 on the very next request", async () => {
    const crew = await makeUser();
    await addMember(surveyId, crew.userId, "crew");
    const { token, apiToken } = await createApiToken(crew, { name: "Truck laptop" });
    const list = () => logsRoute.GET(new Request(`${ORIGIN}/api/v1/surveys/${surveyId}/logs`, { headers: { authorization: `Bearer ${token}` } }), { params: Promise.resolve({ surveyId }) });
    expect((await list()).status).toBe(200);
    await revokeApiToken(crew, apiToken.id);
    const res = await list();
    expect(res.status).toBe(401);
    expect((await res.json()).error.message).toMatch(/unknown or revoked/);
  });
});
