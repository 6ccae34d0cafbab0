import { describe, expect, it } from "vitest";
import { setupTestDatabase, TEST_ON_POSTGRES } from "../support/test-db";

setupTestDatabase({ SESSION_TTL_HOURS: "2" });

const accounts = await import("@/src/server/auth/accounts");
const { getDb } = await import("@/src/server/db/client");
const { makeUser } = await import("../support/fixtures");

describe("password sign-in", () => {
  it("stores argon2id hashes and accepts the right password", async () => {
    const hash = await accounts.hashPassword("correct horse battery");
    expect(hash.startsWith("$argon2id$")).toBe(true);
    expect(await accounts.verifyPassword(hash, "correct horse battery")).toBe(true);
    expect(await accounts.verifyPassword(hash, "correct horse batterY")).toBe(false);

    const user = await makeUser({ password: "a-good-long-password" });
    const actor = await accounts.authenticate(user.email.toUpperCase(), "a-good-long-password");
    expect(actor).toEqual({ userId: user.userId, email: user.email, name: user.name, isAdmin: false });
  });

  it("refuses a wrong password and an unknown e-mail with the same message", async () => {
    const user = await makeUser({ password: "a-good-long-password" });
    expect(await accounts.authenticate(user.email, "a-wrong-password")).toBeNull();

    const wrong = await accounts.authenticateInput({ email: user.email, password: "a-wrong-password" }).catch((e: unknown) => e);
    const unknown = await accounts.authenticateInput({ email: "nobody@test.example", password: "a-wrong-password" }).catch((e: unknown) => e);
    expect(wrong).toMatchObject({ code: "validation_failed", formError: accounts.WRONG_CREDENTIALS });
    expect(unknown).toMatchObject({ code: "validation_failed", formError: accounts.WRONG_CREDENTIALS });
    expect((unknown as Error).message).toBe((wrong as Error).message);
  });

  it("gives field errors for malformed input", async () => {
    const err = await accounts.authenticateInput({ email: "not-an-email", password: "" }).catch((e: unknown) => e);
    expect(err).toMatchObject({ code: "validation_failed" });
    expect(Object.keys((err as { fieldErrors: object }).fieldErrors).sort()).toEqual(["email", "password"]);
  });
});

describe("sessions", () => {
  it("creates a session that validates to the actor, stored with expiry in seconds", async () => {
    const user = await makeUser();
    const before = Date.now();
    const session = await accounts.createSession(user.userId);
    const row = await getDb()("sessions").where({ id: session.id }).first();
    expect(row.user_id).toBe(user.userId);
    // SESSION_TTL_HOURS=2 → expires about 7200 s from now
    expect(row.expires_at).toBeGreaterThanOrEqual(Math.floor(before / 1000) + 7200 - 1);
    expect(row.expires_at).toBeLessThanOrEqual(Math.floor(Date.now() / 1000) + 7200 + 1);
    expect(await accounts.validateSessionId(session.id)).toMatchObject({ userId: user.userId });
  });

  it("treats an expired session as invalid and deletes it", async () => {
    const user = await makeUser();
    const session = await accounts.createSession(user.userId);
    await getDb()("sessions").where({ id: session.id }).update({ expires_at: Math.floor(Date.now() / 1000) - 1 });
    expect(await accounts.validateSessionId(session.id)).toBeNull();
    expect(await getDb()("sessions").where({ id: session.id }).first()).toBeUndefined();
  });

  it("sweeps expired sessions of other users when a new session starts", async () => {
    const [a, b] = [await makeUser(), await makeUser()];
    const old = await accounts.createSession(a.userId);
    await getDb()("sessions").where({ id: old.id }).update({ expires_at: Math.floor(Date.now() / 1000) - 60 });
    await accounts.createSession(b.userId);
    expect(await getDb()("sessions").where({ id: old.id }).first()).toBeUndefined();
  });

  it("rejects unknown ids and ends a session on sign-out", async () => {
    const user = await makeUser();
    expect(await accounts.validateSessionId("no-such-session")).toBeNull();
    const session = await accounts.createSession(user.userId);
    await accounts.invalidateSession(session.id);
    expect(await accounts.validateSessionId(session.id)).toBeNull();
  });

  it("builds an httpOnly SameSite=Lax cookie, not secure on http", async () => {
    const cookie = accounts.sessionCookie("abc").serialize();
    expect(cookie).toMatch(/^fieldtide_session=abc;/);
    expect(cookie).toMatch(/HttpOnly/);
    expect(cookie).toMatch(/SameSite=Lax/);
    expect(cookie).not.toMatch(/Secure/);
    expect(cookie).toMatch(/Max-Age=7200/);
  });
});

describe("lucia beside an open write transaction", () => {
  it.skipIf(TEST_ON_POSTGRES)("SQLite: a sign-in during an open write transaction waits for it instead of stalling on a lock", async () => {
    const user = await makeUser();
    let release!: () => void;
    const gate = new Promise<void>((r) => (release = r));
    let committed = false;
    const trx = getDb().transaction(async (t) => {
      await t("users").where({ id: user.userId }).update({ updated_at: new Date().toISOString() });
      await gate;
      committed = true;
    });
    await new Promise((r) => setTimeout(r, 20)); // the transaction now holds the write lock
    const sessionPromise = accounts.createSession(user.userId).then((s) => ({ s, committedFirst: committed }));
    setTimeout(release, 50);
    await trx;
    const { s, committedFirst } = await sessionPromise;
    // A second connection would block the event loop in SQLite's busy wait (the release timer
    // could not fire) and then reject with "database is locked"; here the session waits its turn.
    expect(committedFirst).toBe(true);
    expect(await accounts.validateSessionId(s.id)).toMatchObject({ userId: user.userId });
  });

  it.runIf(TEST_ON_POSTGRES)("PostgreSQL: a sign-in goes through while another transaction holds the user's row", async () => {
    const user = await makeUser();
    let release!: () => void;
    const gate = new Promise<void>((r) => (release = r));
    let updated!: () => void;
    const rowLocked = new Promise<void>((r) => (updated = r));
    let committed = false;
    const trx = getDb().transaction(async (t) => {
      await t("users").where({ id: user.userId }).update({ updated_at: new Date().toISOString() });
      updated();
      await gate;
      committed = true;
    });
    await rowLocked;
    // the session comes from another pooled connection; the open UPDATE takes no lock the
    // session's foreign-key check needs, so this resolves before the transaction ends (else: timeout)
    const s = await accounts.createSession(user.userId);
    expect(committed).toBe(false);
    release();
    await trx;
    expect(await accounts.validateSessionId(s.id)).toMatchObject({ userId: user.userId });
  });
});
