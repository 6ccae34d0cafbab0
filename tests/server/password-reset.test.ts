import { describe, expect, it } from "vitest";
import { setupTestDatabase } from "../support/test-db";
import { lastMailTo, startTestSmtp, tokenFromMail } from "../support/smtp";

await startTestSmtp();
setupTestDatabase();

const reset = await import("@/src/server/auth/password-reset");
const accounts = await import("@/src/server/auth/accounts");
const { ValidationError } = await import("@/src/server/errors");
const { getDb } = await import("@/src/server/db/client");
const { makeUser, countRows } = await import("../support/fixtures");

describe("password reset", () => {
  it("request → mail → new password works, old does not, every session ended, link single use", async () => {
    const user = await makeUser({ password: "the-old-password" });
    const s1 = await accounts.createSession(user.userId);
    const s2 = await accounts.createSession(user.userId);

    await reset.requestPasswordReset({ email: user.email.toUpperCase() });
    const token = tokenFromMail((await lastMailTo(user.email))?.text_body, "reset-password");
    expect(await reset.getPasswordReset(token)).toMatchObject({ email: user.email });
    const row = await getDb()("password_resets").where({ user_id: user.userId }).first();
    expect((Date.parse(row.expires_at) - Date.parse(row.created_at)) / 3_600_000).toBeCloseTo(1, 3);

    await expect(reset.resetPassword(token, { password: "the-new-password", confirm: "the-new-password" })).resolves.toEqual({ userId: user.userId });
    expect(await accounts.authenticate(user.email, "the-old-password")).toBeNull();
    expect(await accounts.authenticate(user.email, "the-new-password")).toMatchObject({ userId: user.userId });
    expect(await accounts.validateSessionId(s1.id)).toBeNull();
    expect(await accounts.validateSessionId(s2.id)).toBeNull();

    await expect(reset.resetPassword(token, { password: "a-third-password", confirm: "a-third-password" })).rejects.toMatchObject({ reason: "used" });
    expect(await accounts.authenticate(user.email, "a-third-password")).toBeNull();
  });

  it("answers the same for an unknown address and sends nothing", async () => {
    const before = [await countRows("captured_mail"), await countRows("password_resets")];
    await expect(reset.requestPasswordReset({ email: "nobody-here@test.example" })).resolves.toBeUndefined();
    expect([await countRows("captured_mail"), await countRows("password_resets")]).toEqual(before);
  });

  it("a newer request replaces the older link; expiry is refused", async () => {
    const user = await makeUser();
    await reset.requestPasswordReset({ email: user.email });
    const first = tokenFromMail((await lastMailTo(user.email))?.text_body, "reset-password");
    await reset.requestPasswordReset({ email: user.email });
    const second = tokenFromMail((await lastMailTo(user.email))?.text_body, "reset-password");
    expect(second).not.toBe(first);
    await expect(reset.getPasswordReset(first)).rejects.toMatchObject({ reason: "used" });
    await getDb()("password_resets").where({ user_id: user.userId }).whereNull("used_at").update({ expires_at: new Date(Date.now() - 1).toISOString() });
    await expect(reset.resetPassword(second, { password: "another-password", confirm: "another-password" })).rejects.toMatchObject({ reason: "expired" });
  });

  it("mismatched or short passwords are field errors and change nothing", async () => {
    const user = await makeUser({ password: "keep-this-password" });
    await reset.requestPasswordReset({ email: user.email });
    const token = tokenFromMail((await lastMailTo(user.email))?.text_body, "reset-password");
    const hashBefore = (await getDb()("users").where({ id: user.userId }).first()).password_hash;
    const err = await reset.resetPassword(token, { password: "short", confirm: "different" }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(ValidationError);
    expect((err as InstanceType<typeof ValidationError>).fieldErrors).toHaveProperty("password");
    const err2 = await reset.resetPassword(token, { password: "long-enough-one", confirm: "long-enough-two" }).catch((e: unknown) => e);
    expect((err2 as InstanceType<typeof ValidationError>).fieldErrors).toEqual({ confirm: ["The passwords do not match."] });
    expect((await getDb()("users").where({ id: user.userId }).first()).password_hash).toBe(hashBefore);
    await expect(reset.getPasswordReset(token)).resolves.toMatchObject({ email: user.email });
    await expect(reset.requestPasswordReset({ email: "nope" })).rejects.toBeInstanceOf(ValidationError);
  });
});
