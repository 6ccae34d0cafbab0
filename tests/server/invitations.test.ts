import { describe, expect, it } from "vitest";
import { setupTestDatabase } from "../support/test-db";
import { lastMailTo, startTestSmtp, tokenFromMail } from "../support/smtp";

await startTestSmtp();
setupTestDatabase({ APP_URL: "http://fieldtide.test:3000" });

const inv = await import("@/src/server/invitations/service");
const surveys = await import("@/src/server/surveys/service");
const accounts = await import("@/src/server/auth/accounts");
const { InvalidTokenError, ValidationError } = await import("@/src/server/errors");
const { getDb } = await import("@/src/server/db/client");
const { makeUser, makeSurvey, addMember, countRows } = await import("../support/fixtures");

async function leadWithSurvey() {
  const surveyId = await makeSurvey();
  const lead = await makeUser();
  await addMember(surveyId, lead.userId, "lead");
  return { surveyId, lead };
}

async function inviteAndGetToken(email: string, role = "processor") {
  const { surveyId, lead } = await leadWithSurvey();
  const { invitationId } = await inv.inviteToSurvey(lead, surveyId, { email, role });
  const mail = await lastMailTo(email.toLowerCase());
  return { surveyId, lead, invitationId, token: tokenFromMail(mail?.text_body, "invitations"), mail };
}

describe("inviting", () => {
  it("mails a single-use link under APP_URL and stores only the token's SHA-256", async () => {
    const { token, invitationId, mail, surveyId } = await inviteAndGetToken("Newcomer@Test.Example");
    expect(mail?.text_body).toContain(`http://fieldtide.test:3000/invitations/${token}`);
    expect(mail?.subject).toMatch(/^Invitation to survey /);
    expect(Buffer.from(token, "base64url")).toHaveLength(32);
    const row = await getDb()("invitations").where({ id: invitationId }).first();
    expect(row.email).toBe("newcomer@test.example");
    expect(row.token_hash).toMatch(/^[0-9a-f]{64}$/);
    expect(row.token_hash).not.toContain(token);
    // 72 h validity
    const hours = (Date.parse(row.expires_at) - Date.parse(row.created_at)) / 3_600_000;
    expect(hours).toBeCloseTo(72, 3);
    const audit = await getDb()("audit_events").where({ survey_id: surveyId, action: "invitation.create" });
    expect(audit).toHaveLength(1);
  });

  it("validation errors give fieldErrors and write nothing, mail included", async () => {
    const { surveyId, lead } = await leadWithSurvey();
    const before = [await countRows("invitations"), await countRows("audit_events"), await countRows("captured_mail")];
    const err = await inv.inviteToSurvey(lead, surveyId, { email: "not an address", role: "boss" }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(ValidationError);
    expect(Object.keys((err as InstanceType<typeof ValidationError>).fieldErrors).sort()).toEqual(["email", "role"]);
    expect([await countRows("invitations"), await countRows("audit_events"), await countRows("captured_mail")]).toEqual(before);
  });

  it("refuses to invite someone already on the survey", async () => {
    const { surveyId, lead } = await leadWithSurvey();
    const member = await makeUser();
    await addMember(surveyId, member.userId, "crew");
    const err = await inv.inviteToSurvey(lead, surveyId, { email: member.email, role: "lead" }).catch((e: unknown) => e);
    expect((err as InstanceType<typeof ValidationError>).fieldErrors).toHaveProperty("email");
  });

  it("lists pending invitations and a newer invitation replaces an older one", async () => {
    const { surveyId, lead } = await leadWithSurvey();
    await inv.inviteToSurvey(lead, surveyId, { email: "twice@test.example", role: "crew" });
    const first = tokenFromMail((await lastMailTo("twice@test.example"))?.text_body, "invitations");
    await inv.inviteToSurvey(lead, surveyId, { email: "twice@test.example", role: "reviewer" });
    const pending = await inv.listInvitations(lead, surveyId);
    expect(pending).toEqual([expect.objectContaining({ email: "twice@test.example", role: "reviewer", invitedBy: lead.name })]);
    await expect(inv.getInvitation(first)).rejects.toMatchObject({ reason: "revoked" });
  });
});

describe("accepting", () => {
  it("a new person sets name and password, joins with the role, can sign in; the link then fails", async () => {
    const { token, surveyId } = await inviteAndGetToken("fresh@test.example", "processor");
    const view = await inv.getInvitation(token);
    expect(view).toMatchObject({ surveyId, email: "fresh@test.example", role: "processor", existingUser: false });

    const result = await inv.acceptInvitation(token, { name: "Fresh Person", password: "a-long-enough-password" });
    expect(result.surveyId).toBe(surveyId);
    const actor = await accounts.authenticate("fresh@test.example", "a-long-enough-password");
    expect(actor?.userId).toBe(result.userId);
    expect((await surveys.getSurvey(actor!, surveyId)).myRole).toBe("processor");

    const reuse = await inv.acceptInvitation(token, { name: "Again", password: "a-long-enough-password" }).catch((e: unknown) => e);
    expect(reuse).toBeInstanceOf(InvalidTokenError);
    expect(reuse).toMatchObject({ reason: "used", status: 410 });
    await expect(inv.getInvitation(token)).rejects.toMatchObject({ reason: "used" });
  });

  it("a short password is a field error and spends nothing", async () => {
    const { token, invitationId } = await inviteAndGetToken("short@test.example");
    const users = await countRows("users");
    const err = await inv.acceptInvitation(token, { name: "", password: "short" }).catch((e: unknown) => e);
    expect(Object.keys((err as InstanceType<typeof ValidationError>).fieldErrors).sort()).toEqual(["name", "password"]);
    expect(await countRows("users")).toBe(users);
    expect((await getDb()("invitations").where({ id: invitationId }).first()).used_at).toBeNull();
  });

  it("an expired link is refused", async () => {
    const { token, invitationId } = await inviteAndGetToken("late@test.example");
    await getDb()("invitations").where({ id: invitationId }).update({ expires_at: new Date(Date.now() - 1000).toISOString() });
    await expect(inv.getInvitation(token)).rejects.toMatchObject({ reason: "expired" });
    await expect(inv.acceptInvitation(token, { name: "Late", password: "a-long-enough-password" })).rejects.toMatchObject({ reason: "expired" });
    expect(await getDb()("users").where({ email: "late@test.example" }).first()).toBeUndefined();
  });

  it("an unknown or garbled link is refused", async () => {
    await expect(inv.getInvitation("not-a-token")).rejects.toMatchObject({ reason: "unknown", status: 400 });
    await expect(inv.getInvitation("")).rejects.toMatchObject({ reason: "unknown" });
  });

  it("an existing account joins with its own password; a wrong password is refused", async () => {
    const existing = await makeUser({ password: "existing-account-pass" });
    const { token, surveyId } = await inviteAndGetToken(existing.email, "reviewer");
    expect((await inv.getInvitation(token)).existingUser).toBe(true);
    const users = await countRows("users");

    const wrong = await inv.acceptInvitation(token, { password: "not-the-password" }).catch((e: unknown) => e);
    expect((wrong as InstanceType<typeof ValidationError>).fieldErrors).toHaveProperty("password");
    expect(await surveys.listSurveys(existing)).toEqual([]);

    const result = await inv.acceptInvitation(token, { password: "existing-account-pass" });
    expect(result).toEqual({ surveyId, userId: existing.userId });
    expect(await countRows("users")).toBe(users);
    expect((await surveys.listSurveys(existing)).map((s) => [s.id, s.myRole])).toEqual([[surveyId, "reviewer"]]);
  });

  it("a revoked invitation cannot be accepted", async () => {
    const { token, invitationId, surveyId, lead } = await inviteAndGetToken("revoked@test.example");
    await inv.revokeInvitation(lead, surveyId, invitationId);
    await expect(inv.acceptInvitation(token, { name: "R", password: "a-long-enough-password" })).rejects.toMatchObject({ reason: "revoked" });
    expect(await inv.listInvitations(lead, surveyId)).toEqual([]);
  });
});
