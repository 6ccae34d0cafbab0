/** Route handlers called directly with real Request objects (no Next request context needed). */
import { describe, expect, it } from "vitest";
import { setupTestDatabase } from "../support/test-db";

setupTestDatabase({ APP_URL: "http://localhost:3000" });

const health = await import("@/app/api/health/route");
const signIn = await import("@/app/api/v1/auth/sign-in/route");
const signOut = await import("@/app/api/v1/auth/sign-out/route");
const accounts = await import("@/src/server/auth/accounts");
const { MIGRATION_NAMES } = await import("@/src/server/db/migration-source");
const { makeUser, countRows } = await import("../support/fixtures");
const pkg = (await import("@/package.json")).default;

function post(url: string, body: unknown, headers: Record<string, string> = {}): Request {
  return new Request(`http://localhost:3000${url}`, {
    method: "POST",
    headers: { "content-type": "application/json", host: "localhost:3000", ...headers },
    body: typeof body === "string" ? body : JSON.stringify(body),
  });
}

describe("GET /api/health", () => {
  it("reports version, database reachable and the migration level", async () => {
    const res = await health.GET();
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({
      status: "ok",
      version: pkg.version,
      database: { reachable: true, migration: { current: MIGRATION_NAMES.at(-1), latest: MIGRATION_NAMES.at(-1), pending: 0 } },
    });
  });
});

describe("POST /api/v1/auth/sign-in and sign-out", () => {
  it("signs in, sets an httpOnly Lax cookie for a valid session, and signs out", async () => {
    const user = await makeUser({ password: "route-password-1" });
    const res = await signIn.POST(post("/api/v1/auth/sign-in", { email: user.email, password: "route-password-1" }, { origin: "http://localhost:3000" }));
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ user: { id: user.userId, email: user.email, name: user.name, isAdmin: false } });
    const setCookie = res.headers.get("set-cookie") ?? "";
    expect(setCookie).toMatch(/HttpOnly/);
    expect(setCookie).toMatch(/SameSite=Lax/);
    const sessionId = /fieldtide_session=([^;]+)/.exec(setCookie)?.[1] ?? "";
    expect(await accounts.validateSessionId(sessionId)).toMatchObject({ userId: user.userId });

    const out = await signOut.POST(post("/api/v1/auth/sign-out", "", { cookie: `fieldtide_session=${sessionId}` }));
    expect(out.status).toBe(204);
    expect(out.headers.get("set-cookie")).toMatch(/fieldtide_session=;/);
    expect(await accounts.validateSessionId(sessionId)).toBeNull();
  });

  it("401 with the same message for a wrong password and an unknown e-mail; no session made", async () => {
    const user = await makeUser({ password: "route-password-2" });
    const sessions = await countRows("sessions");
    const wrong = await signIn.POST(post("/api/v1/auth/sign-in", { email: user.email, password: "nope-nope-nope" }));
    const unknown = await signIn.POST(post("/api/v1/auth/sign-in", { email: "ghost@test.example", password: "nope-nope-nope" }));
    expect([wrong.status, unknown.status]).toEqual([401, 401]);
    const [a, b] = [await wrong.json(), await unknown.json()];
    expect(a).toEqual({ error: { code: "unauthenticated", message: "E-mail or password is wrong." } });
    expect(b).toEqual(a);
    expect(wrong.headers.get("set-cookie")).toBeNull();
    expect(await countRows("sessions")).toBe(sessions);
  });

  it("400 with fieldErrors for bad input and for a non-JSON body", async () => {
    const res = await signIn.POST(post("/api/v1/auth/sign-in", { email: "nope" }));
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.error.code).toBe("validation_failed");
    expect(Object.keys(body.error.fieldErrors).sort()).toEqual(["email", "password"]);
    const notJson = await signIn.POST(post("/api/v1/auth/sign-in", "{oops"));
    expect(notJson.status).toBe(400);
    expect((await notJson.json()).error.formError).toMatch(/JSON/);
  });

  it("refuses a cross-site Origin (403) and accepts the request's own host", async () => {
    const user = await makeUser({ password: "route-password-3" });
    const creds = { email: user.email, password: "route-password-3" };
    const evil = await signIn.POST(post("/api/v1/auth/sign-in", creds, { origin: "https://evil.example" }));
    expect(evil.status).toBe(403);
    expect(evil.headers.get("set-cookie")).toBeNull();
    const viaIp = await signIn.POST(
      new Request("http://127.0.0.1:3000/api/v1/auth/sign-in", {
        method: "POST",
        headers: { "content-type": "application/json", host: "127.0.0.1:3000", origin: "http://127.0.0.1:3000" },
        body: JSON.stringify(creds),
      }),
    );
    expect(viaIp.status).toBe(200);
    const signOutEvil = await signOut.POST(post("/api/v1/auth/sign-out", "", { origin: "null" }));
    expect(signOutEvil.status).toBe(403);
  });
});
