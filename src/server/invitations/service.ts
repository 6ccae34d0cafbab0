import "server-only";
/**
 * Invitations: an admin or a survey lead invites an e-mail address to a survey with a role.
 * The mail carries `${APP_URL}/invitations/${token}`; the link works once, for 72 hours.
 * Only the SHA-256 of the token is stored. The mail is sent BEFORE anything is written, so
 * when sending fails nothing is kept (and no write lock is held during the SMTP exchange).
 */
import { randomUUID } from "node:crypto";
import type { Knex } from "knex";
import "@/src/lib/zod-jitless";
import { z } from "zod";
import { refuseIfArchived } from "../surveys/writable";
import type { Actor } from "../auth/actor";
import { hashPassword, verifyPassword } from "../auth/password";
import { EmailSchema, NewPasswordSchema } from "../auth/schema";
import { recordAudit } from "../audit/record";
import { assertSurveyPermission, SURVEY_ROLE_LABELS, type SurveyRole } from "../authz/permissions";
import { getDb } from "../db/client";
import { getEnv } from "../env";
import { ConflictError, InvalidTokenError, ValidationError, parseInput } from "../errors";
import { sendMail } from "../mail/mailer";
import { MemberRoleSchema } from "../surveys/service";
import { HOUR_MS, isoAfterMs, nowIso } from "../time";
import { hashToken, newLinkToken } from "../tokens";

export const INVITATION_TTL_MS = 72 * HOUR_MS;

export const InvitationInputSchema = z.object({ email: EmailSchema, role: MemberRoleSchema });

export const AcceptNewUserSchema = z.object({
  name: z.string({ error: "Enter your name." }).trim().min(1, { error: "Enter your name." }).max(120, { error: "At most 120 characters." }),
  password: NewPasswordSchema,
});
export const AcceptExistingUserSchema = z.object({
  password: z.string({ error: "Enter the password of your account." }).min(1, { error: "Enter the password of your account." }),
});

export type PendingInvitation = { id: string; email: string; role: SurveyRole; expiresAt: string; invitedBy: string | null };
export type InvitationView = { surveyId: string; surveyName: string; email: string; role: SurveyRole; expiresAt: string; existingUser: boolean };

type InvitationRow = {
  id: string;
  survey_id: string;
  email: string;
  role: SurveyRole;
  token_hash: string;
  invited_by: string | null;
  expires_at: string;
  used_at: string | null;
  revoked_at: string | null;
};

function pendingQuery(db: Knex | Knex.Transaction) {
  return db<InvitationRow>("invitations").whereNull("used_at").whereNull("revoked_at").where("expires_at", ">", nowIso());
}

export async function inviteToSurvey(actor: Actor, surveyId: string, input: unknown): Promise<{ invitationId: string }> {
  await assertSurveyPermission(actor, surveyId, "members.manage");
  const { email, role } = parseInput(InvitationInputSchema, input);
  const db = getDb();
  const survey = await db("surveys").select("code", "name", "archived_at").where({ id: surveyId }).first();
  refuseIfArchived(survey, "inviting anyone");
  const member = await db("survey_members")
    .join("users", "users.id", "survey_members.user_id")
    .where({ "survey_members.survey_id": surveyId, "users.email": email })
    .first();
  if (member) throw new ValidationError({ email: ["This person is already on the survey."] });

  const { token, tokenHash } = newLinkToken();
  const id = randomUUID();
  const expiresAt = isoAfterMs(INVITATION_TTL_MS);
  const link = `${getEnv().appUrl}/invitations/${token}`;
  await sendMail({
    to: email,
    subject: `Invitation to survey ${survey.code} on Fieldtide`,
    text: [
      `${actor.name} invites you to the survey ${survey.code} "${survey.name}" as ${SURVEY_ROLE_LABELS[role].toLowerCase()}.`,
      "",
      `Open this link to join (it works once, until ${expiresAt.replace("T", " ").slice(0, 16)} UTC):`,
      link,
      "",
      "If you did not expect this, ignore this message.",
    ].join("\n"),
  });

  await db.transaction(async (trx) => {
    // A newer invitation replaces an older pending one for the same address.
    await pendingQuery(trx).where({ survey_id: surveyId, email }).update({ revoked_at: nowIso() });
    await trx("invitations").insert({
      id,
      survey_id: surveyId,
      email,
      role,
      token_hash: tokenHash,
      invited_by: actor.userId,
      expires_at: expiresAt,
      used_at: null,
      accepted_user_id: null,
      revoked_at: null,
      created_at: nowIso(),
    });
    await recordAudit(trx, { surveyId, actorUserId: actor.userId, action: "invitation.create", details: { invitationId: id, email, role } });
  });
  return { invitationId: id };
}

/** Pending (unused, unrevoked, unexpired) invitations of a survey: leads and admins. */
export async function listInvitations(actor: Actor, surveyId: string): Promise<PendingInvitation[]> {
  await assertSurveyPermission(actor, surveyId, "members.manage");
  const rows = (await pendingQuery(getDb())
    .where("invitations.survey_id", surveyId)
    .leftJoin("users", "users.id", "invitations.invited_by")
    .select("invitations.id", "invitations.email", "invitations.role", "invitations.expires_at", "users.name as inviter")
    .orderBy("invitations.created_at", "desc")) as Array<{ id: string; email: string; role: SurveyRole; expires_at: string; inviter: string | null }>;
  return rows.map((r) => ({ id: r.id, email: r.email, role: r.role, expiresAt: r.expires_at, invitedBy: r.inviter }));
}

export async function revokeInvitation(actor: Actor, surveyId: string, invitationId: string): Promise<void> {
  await assertSurveyPermission(actor, surveyId, "members.manage");
  await getDb().transaction(async (trx) => {
    const n = await pendingQuery(trx).where({ id: invitationId, survey_id: surveyId }).update({ revoked_at: nowIso() });
    if (n === 0) throw new ConflictError("This invitation is no longer pending.");
    await recordAudit(trx, { surveyId, actorUserId: actor.userId, action: "invitation.revoke", details: { invitationId } });
  });
}

async function loadUsableInvitation(db: Knex | Knex.Transaction, token: string): Promise<InvitationRow> {
  const row = typeof token === "string" && token.length > 0 && token.length <= 200
    ? await db<InvitationRow>("invitations").where({ token_hash: hashToken(token) }).first()
    : undefined;
  if (!row) throw new InvalidTokenError("unknown", "This invitation link is not valid. Check that you copied all of it.");
  if (row.revoked_at) throw new InvalidTokenError("revoked", "This invitation was withdrawn. Ask the survey lead for a new one.");
  if (row.used_at) throw new InvalidTokenError("used", "This invitation has already been used. Sign in instead.");
  if (row.expires_at <= nowIso()) throw new InvalidTokenError("expired", "This invitation has expired. Ask the survey lead for a new one.");
  return row;
}

export async function getInvitation(token: string): Promise<InvitationView> {
  const db = getDb();
  const inv = await loadUsableInvitation(db, token);
  const survey = await db("surveys").select("name").where({ id: inv.survey_id }).first();
  const user = await db("users").select("id").where({ email: inv.email }).first();
  return { surveyId: inv.survey_id, surveyName: survey.name, email: inv.email, role: inv.role, expiresAt: inv.expires_at, existingUser: Boolean(user) };
}

/**
 * New address: input {name, password} creates the account. Existing account: input {password}
 * of that account. Either way the person joins the survey with the invited role; the link is spent.
 */
export async function acceptInvitation(token: string, input: unknown): Promise<{ surveyId: string; userId: string }> {
  const db = getDb();
  const inv = await loadUsableInvitation(db, token);
  const existing = await db("users").select("id", "password_hash").where({ email: inv.email }).first();
  let newUser: { id: string; name: string; passwordHash: string } | null = null;
  if (existing) {
    const { password } = parseInput(AcceptExistingUserSchema, input);
    if (!(await verifyPassword(existing.password_hash, password))) {
      throw new ValidationError({ password: ["That is not the password of this account."] });
    }
  } else {
    const { name, password } = parseInput(AcceptNewUserSchema, input);
    newUser = { id: randomUUID(), name, passwordHash: await hashPassword(password) };
  }
  const userId: string = existing ? existing.id : newUser!.id;

  await db.transaction(async (trx) => {
    const now = nowIso();
    if (newUser) {
      const clash = await trx("users").select("id").where({ email: inv.email }).first();
      if (clash) throw new ConflictError("An account with this e-mail was just created. Open the link again and use its password.");
      await trx("users").insert({ id: newUser.id, email: inv.email, name: newUser.name, password_hash: newUser.passwordHash, is_admin: 0, created_at: now, updated_at: now });
    }
    const spent = await trx("invitations")
      .where({ id: inv.id })
      .whereNull("used_at")
      .whereNull("revoked_at")
      .where("expires_at", ">", now)
      .update({ used_at: now, accepted_user_id: userId });
    if (spent === 0) throw new InvalidTokenError("used", "This invitation has already been used. Sign in instead.");
    const member = await trx("survey_members").where({ survey_id: inv.survey_id, user_id: userId }).first();
    if (!member) {
      await trx("survey_members").insert({ survey_id: inv.survey_id, user_id: userId, role: inv.role, joined_at: now });
      await recordAudit(trx, { surveyId: inv.survey_id, actorUserId: userId, action: "member.add", details: { userId, role: inv.role, via: "invitation" } });
    }
    await recordAudit(trx, { surveyId: inv.survey_id, actorUserId: userId, action: "invitation.accept", details: { invitationId: inv.id, newAccount: Boolean(newUser) } });
  });
  return { surveyId: inv.survey_id, userId };
}
