/**
 * Every survey-scoped data-layer function × every role, driven by the PERMISSIONS table:
 * own survey with the permission → allowed; own survey without → ForbiddenError (nothing written);
 * a survey the caller is not on → NotFoundError (nothing returned, nothing written); admin → allowed.
 */
import { randomUUID } from "node:crypto";
import { describe, expect, it } from "vitest";
import { setupTestDatabase } from "../support/test-db";
import { startTestSmtp } from "../support/smtp";

await startTestSmtp();
setupTestDatabase();

const surveys = await import("@/src/server/surveys/service");
const invitations = await import("@/src/server/invitations/service");
const mailbox = await import("@/src/server/mail/mailbox");
const { PERMISSIONS, SURVEY_ROLES, roleAllows } = await import("@/src/server/authz/permissions");
const { ForbiddenError, NotFoundError } = await import("@/src/server/errors");
const { getDb } = await import("@/src/server/db/client");
const { makeUser, makeSurvey, addMember, countRows } = await import("../support/fixtures");
type Actor = import("@/src/server/auth/actor").Actor;
type Permission = keyof typeof PERMISSIONS;

type Ctx = { surveyId: string; otherMemberId: string; invitationId: string };
type Case = { name: string; permission: Permission; call: (actor: Actor, ctx: Ctx) => Promise<unknown> };

const validInput = () => ({ name: "Renamed grid", code: `R-${randomUUID().slice(0, 6).toUpperCase()}`, timeZone: "Europe/London" });

const CASES: Case[] = [
  { name: "getSurvey", permission: "survey.read", call: (a, c) => surveys.getSurvey(a, c.surveyId) },
  { name: "updateSurvey", permission: "survey.update", call: (a, c) => surveys.updateSurvey(a, c.surveyId, validInput()) },
  { name: "archiveSurvey", permission: "survey.archive", call: (a, c) => surveys.archiveSurvey(a, c.surveyId) },
  { name: "restoreSurvey", permission: "survey.archive", call: (a, c) => surveys.restoreSurvey(a, c.surveyId) },
  { name: "listMembers", permission: "members.read", call: (a, c) => surveys.listMembers(a, c.surveyId) },
  { name: "changeMemberRole", permission: "members.manage", call: (a, c) => surveys.changeMemberRole(a, c.surveyId, c.otherMemberId, "processor") },
  { name: "removeMember", permission: "members.manage", call: (a, c) => surveys.removeMember(a, c.surveyId, c.otherMemberId) },
  { name: "inviteToSurvey", permission: "members.manage", call: (a, c) => invitations.inviteToSurvey(a, c.surveyId, { email: `new-${randomUUID().slice(0, 8)}@test.example`, role: "crew" }) },
  { name: "listInvitations", permission: "members.manage", call: (a, c) => invitations.listInvitations(a, c.surveyId) },
  { name: "revokeInvitation", permission: "members.manage", call: (a, c) => invitations.revokeInvitation(a, c.surveyId, c.invitationId) },
];

/** Exports that are not survey-scoped, each with where it is tested. */
const NOT_SURVEY_SCOPED = new Set([
  "listSurveys", // visibility test below
  "createSurvey", // admin-only test below
  "getInvitation", // token-scoped: invitations.test.ts
  "acceptInvitation", // token-scoped: invitations.test.ts
]);

async function makeContext(): Promise<Ctx> {
  const surveyId = await makeSurvey();
  const otherLead = await makeUser();
  await addMember(surveyId, otherLead.userId, "lead"); // keeps a lead when the actor's own role changes
  const other = await makeUser();
  await addMember(surveyId, other.userId, "crew");
  const invitationId = randomUUID();
  await getDb()("invitations").insert({
    id: invitationId, survey_id: surveyId, email: `pending-${invitationId.slice(0, 8)}@test.example`, role: "crew",
    token_hash: randomUUID().replace(/-/g, "").padEnd(64, "0"), invited_by: otherLead.userId,
    expires_at: new Date(Date.now() + 3_600_000).toISOString(), created_at: new Date().toISOString(),
  });
  return { surveyId, otherMemberId: other.userId, invitationId };
}

async function snapshot(surveyId: string) {
  return {
    audit: await countRows("audit_events"),
    invitations: await getDb()("invitations").where({ survey_id: surveyId }).select("id", "revoked_at").orderBy("id"),
    members: await getDb()("survey_members").where({ survey_id: surveyId }).select("user_id", "role").orderBy("user_id"),
    survey: await getDb()("surveys").where({ id: surveyId }).first(),
  };
}

describe("the test covers every survey-scoped service function", () => {
  it("lists each exported function either in CASES or as not survey-scoped", () => {
    const exported = [...Object.entries(surveys), ...Object.entries(invitations)]
      .filter(([, v]) => typeof v === "function")
      .map(([k]) => k);
    const covered = new Set([...CASES.map((c) => c.name), ...NOT_SURVEY_SCOPED]);
    expect(exported.filter((name) => !covered.has(name))).toEqual([]);
  });
});

describe.each(CASES)("$name needs $permission", (c) => {
  it.each(SURVEY_ROLES.map((r) => [r]))("role %s on own survey follows the table", async (role) => {
    const ctx = await makeContext();
    const actor = await makeUser();
    await addMember(ctx.surveyId, actor.userId, role);
    if (c.name === "restoreSurvey") await getDb()("surveys").where({ id: ctx.surveyId }).update({ archived_at: new Date().toISOString() });
    const before = await snapshot(ctx.surveyId);
    if (roleAllows(role, c.permission)) {
      await expect(c.call(actor, ctx)).resolves.not.toThrow();
    } else {
      await expect(c.call(actor, ctx)).rejects.toBeInstanceOf(ForbiddenError);
      expect(await snapshot(ctx.surveyId)).toEqual(before);
    }
  });

  it.each(SURVEY_ROLES.map((r) => [r]))("role %s elsewhere gets NotFoundError on a foreign survey, nothing written", async (role) => {
    const ctx = await makeContext();
    const actor = await makeUser();
    await addMember(await makeSurvey(), actor.userId, role);
    const before = await snapshot(ctx.surveyId);
    const result = await c.call(actor, ctx).then((value) => ({ value }), (error: unknown) => ({ error }));
    expect(result).not.toHaveProperty("value");
    expect((result as { error: unknown }).error).toBeInstanceOf(NotFoundError);
    expect(await snapshot(ctx.surveyId)).toEqual(before);
  });

  it("org admin (not a member) is allowed", async () => {
    const ctx = await makeContext();
    const admin = await makeUser({ isAdmin: true });
    if (c.name === "restoreSurvey") await getDb()("surveys").where({ id: ctx.surveyId }).update({ archived_at: new Date().toISOString() });
    await expect(c.call(admin, ctx)).resolves.not.toThrow();
  });

  it("a survey id that does not exist is NotFoundError, even for an admin", async () => {
    const ctx = await makeContext();
    const admin = await makeUser({ isAdmin: true });
    await expect(c.call(admin, { ...ctx, surveyId: randomUUID() })).rejects.toBeInstanceOf(NotFoundError);
  });
});

describe("org-wide functions", () => {
  it("createSurvey is admin only, for every survey role", async () => {
    for (const role of SURVEY_ROLES) {
      const actor = await makeUser();
      await addMember(await makeSurvey(), actor.userId, role);
      const before = await countRows("surveys");
      await expect(surveys.createSurvey(actor, validInput())).rejects.toBeInstanceOf(ForbiddenError);
      expect(await countRows("surveys")).toBe(before);
    }
    const admin = await makeUser({ isAdmin: true });
    await expect(surveys.createSurvey(admin, validInput())).resolves.toMatchObject({ name: "Renamed grid", myRole: "admin" });
  });

  it("listSurveys shows only the caller's surveys with the caller's role; admin sees all", async () => {
    const mine = await makeSurvey();
    const foreign = await makeSurvey();
    const user = await makeUser();
    await addMember(mine, user.userId, "reviewer");
    const listed = await surveys.listSurveys(user);
    expect(listed.map((s) => [s.id, s.myRole])).toEqual([[mine, "reviewer"]]);
    const all = await surveys.listSurveys(await makeUser({ isAdmin: true }));
    expect(all.map((s) => s.id)).toEqual(expect.arrayContaining([mine, foreign]));
    expect(new Set(all.map((s) => s.myRole))).toEqual(new Set(["admin"]));
  });

  it("the captured mailbox is admin only", async () => {
    const lead = await makeUser();
    await addMember(await makeSurvey(), lead.userId, "lead");
    await expect(mailbox.listCapturedMail(lead)).rejects.toBeInstanceOf(ForbiddenError);
    await expect(mailbox.getCapturedMail(lead, 1)).rejects.toBeInstanceOf(ForbiddenError);
    await expect(mailbox.listCapturedMail(await makeUser({ isAdmin: true }))).resolves.toBeInstanceOf(Array);
  });
});
