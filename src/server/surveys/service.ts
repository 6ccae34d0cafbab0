import "server-only";
/**
 * Surveys and their members. Every function takes the actor first and checks its role on the
 * survey (assertSurveyPermission) before touching data; inputs are `unknown` and parsed here.
 */
import { randomUUID } from "node:crypto";
import type { Knex } from "knex";
import "@/src/lib/zod-jitless";
import { z } from "zod";
import { isUniqueViolation } from "../db/engine";
import type { Actor } from "../auth/actor";
import { recordAudit } from "../audit/record";
import { assertAdmin, assertSurveyPermission, SURVEY_ROLES, type SurveyRole } from "../authz/permissions";
import { getDb } from "../db/client";
import { ConflictError, NotFoundError, ValidationError, parseInput } from "../errors";
import { nowIso } from "../time";
import { CODE_TAKEN, SurveyInputSchema, type SurveyInput } from "./schema";

export type Survey = {
  id: string;
  code: string;
  name: string;
  client: string;
  areaDescription: string;
  timeZone: string;
  notes: string;
  archivedAt: string | null;
  createdAt: string;
  updatedAt: string;
  myRole: SurveyRole | "admin";
};

export type Member = { userId: string; name: string; email: string; role: SurveyRole; joinedAt: string };

type SurveyRow = {
  id: string;
  code: string;
  name: string;
  client: string;
  area_description: string;
  time_zone: string;
  notes: string;
  archived_at: string | null;
  created_at: string;
  updated_at: string;
};

function toSurvey(row: SurveyRow, myRole: SurveyRole | "admin"): Survey {
  return {
    id: row.id,
    code: row.code,
    name: row.name,
    client: row.client,
    areaDescription: row.area_description,
    timeZone: row.time_zone,
    notes: row.notes,
    archivedAt: row.archived_at,
    createdAt: row.created_at,
    updatedAt: row.updated_at,
    myRole,
  };
}

function inputColumns(input: SurveyInput) {
  return {
    code: input.code,
    name: input.name,
    client: input.client,
    area_description: input.areaDescription,
    time_zone: input.timeZone,
    notes: input.notes,
  };
}

async function assertCodeFree(db: Knex | Knex.Transaction, code: string, exceptId?: string): Promise<void> {
  const q = db("surveys").select("id").where({ code });
  if (exceptId) q.whereNot({ id: exceptId });
  if (await q.first()) throw new ValidationError({ code: [CODE_TAKEN] });
}

async function loadSurveyRow(db: Knex | Knex.Transaction, surveyId: string): Promise<SurveyRow> {
  const row = await db<SurveyRow>("surveys").where({ id: surveyId }).first();
  if (!row) throw new NotFoundError("Survey not found.");
  return row;
}

/** Surveys the actor is on (all surveys for an admin); archived ones only when asked. */
export async function listSurveys(actor: Actor, opts: { includeArchived?: boolean } = {}): Promise<Survey[]> {
  const db = getDb();
  const q = db<SurveyRow>("surveys").select("surveys.*").orderBy("surveys.code", "asc");
  if (!opts.includeArchived) q.whereNull("surveys.archived_at");
  if (actor.isAdmin) {
    const rows = await q;
    return rows.map((r) => toSurvey(r, "admin"));
  }
  const rows = (await q
    .join("survey_members", "survey_members.survey_id", "surveys.id")
    .where("survey_members.user_id", actor.userId)
    .select("survey_members.role as my_role")) as Array<SurveyRow & { my_role: SurveyRole }>;
  return rows.map((r) => toSurvey(r, r.my_role));
}

export async function getSurvey(actor: Actor, surveyId: string): Promise<Survey> {
  const db = getDb();
  const role = await assertSurveyPermission(actor, surveyId, "survey.read", db);
  return toSurvey(await loadSurveyRow(db, surveyId), role);
}

/** Admin only. The new survey has no members yet; the admin invites its lead. */
export async function createSurvey(actor: Actor, input: unknown): Promise<Survey> {
  assertAdmin(actor);
  const data = parseInput(SurveyInputSchema, input);
  const id = randomUUID();
  const now = nowIso();
  try {
    await getDb().transaction(async (trx) => {
      await assertCodeFree(trx, data.code);
      await trx("surveys").insert({ id, ...inputColumns(data), archived_at: null, created_by: actor.userId, created_at: now, updated_at: now });
      await recordAudit(trx, { surveyId: id, actorUserId: actor.userId, action: "survey.create", details: { code: data.code, name: data.name } });
    });
  } catch (err) {
    if (isUniqueViolation(err)) throw new ValidationError({ code: [CODE_TAKEN] });
    throw err;
  }
  return getSurvey(actor, id);
}

export async function updateSurvey(actor: Actor, surveyId: string, input: unknown): Promise<Survey> {
  await assertSurveyPermission(actor, surveyId, "survey.update");
  const data = parseInput(SurveyInputSchema, input);
  try {
    await getDb().transaction(async (trx) => {
      const before = await loadSurveyRow(trx, surveyId);
      if (before.archived_at) throw new ConflictError("This survey is archived. Restore it before editing.");
      await assertCodeFree(trx, data.code, surveyId);
      const cols = inputColumns(data);
      const changed = Object.fromEntries(
        Object.entries(cols).filter(([k, v]) => (before as unknown as Record<string, unknown>)[k] !== v),
      );
      if (Object.keys(changed).length === 0) return;
      await trx("surveys").where({ id: surveyId }).update({ ...cols, updated_at: nowIso() });
      await recordAudit(trx, { surveyId, actorUserId: actor.userId, action: "survey.update", details: { changed: Object.keys(changed) } });
    });
  } catch (err) {
    if (isUniqueViolation(err)) throw new ValidationError({ code: [CODE_TAKEN] });
    throw err;
  }
  return getSurvey(actor, surveyId);
}

async function setArchived(actor: Actor, surveyId: string, archived: boolean): Promise<Survey> {
  await assertSurveyPermission(actor, surveyId, "survey.archive");
  await getDb().transaction(async (trx) => {
    const row = await loadSurveyRow(trx, surveyId);
    if (Boolean(row.archived_at) === archived) return;
    const now = nowIso();
    await trx("surveys").where({ id: surveyId }).update({ archived_at: archived ? now : null, updated_at: now });
    await recordAudit(trx, { surveyId, actorUserId: actor.userId, action: archived ? "survey.archive" : "survey.restore" });
  });
  return getSurvey(actor, surveyId);
}

export async function archiveSurvey(actor: Actor, surveyId: string): Promise<Survey> {
  return setArchived(actor, surveyId, true);
}

export async function restoreSurvey(actor: Actor, surveyId: string): Promise<Survey> {
  return setArchived(actor, surveyId, false);
}

// ---- members ----

export const MemberRoleSchema = z.enum(SURVEY_ROLES, { error: "Choose a role: crew, processor, reviewer or lead." });

type MemberRow = { user_id: string; name: string; email: string; role: SurveyRole; joined_at: string };

function toMember(r: MemberRow): Member {
  return { userId: r.user_id, name: r.name, email: r.email, role: r.role, joinedAt: r.joined_at };
}

function memberQuery(db: Knex | Knex.Transaction, surveyId: string) {
  return db("survey_members")
    .join("users", "users.id", "survey_members.user_id")
    .where("survey_members.survey_id", surveyId)
    .select("survey_members.user_id", "users.name", "users.email", "survey_members.role", "survey_members.joined_at");
}

export async function listMembers(actor: Actor, surveyId: string): Promise<Member[]> {
  await assertSurveyPermission(actor, surveyId, "members.read");
  const rows = (await memberQuery(getDb(), surveyId).orderBy("users.name", "asc")) as MemberRow[];
  return rows.map(toMember);
}

async function loadMember(trx: Knex.Transaction, surveyId: string, userId: string): Promise<MemberRow> {
  const row = (await memberQuery(trx, surveyId).andWhere("survey_members.user_id", userId).first()) as MemberRow | undefined;
  if (!row) throw new NotFoundError("Member not found.");
  return row;
}

async function assertAnotherLead(trx: Knex.Transaction, surveyId: string, userId: string): Promise<void> {
  const other = await trx("survey_members").where({ survey_id: surveyId, role: "lead" }).whereNot({ user_id: userId }).first();
  if (!other) throw new ConflictError("A survey keeps at least one lead. Make someone else lead first.");
}

export async function changeMemberRole(actor: Actor, surveyId: string, userId: string, role: unknown): Promise<Member> {
  await assertSurveyPermission(actor, surveyId, "members.manage");
  const parsed = MemberRoleSchema.safeParse(role);
  if (!parsed.success) throw new ValidationError({ role: [parsed.error.issues[0]?.message ?? "Choose a role."] });
  const newRole = parsed.data;
  return getDb().transaction(async (trx) => {
    const member = await loadMember(trx, surveyId, userId);
    if (member.role === newRole) return toMember(member);
    if (member.role === "lead") await assertAnotherLead(trx, surveyId, userId);
    await trx("survey_members").where({ survey_id: surveyId, user_id: userId }).update({ role: newRole });
    await recordAudit(trx, { surveyId, actorUserId: actor.userId, action: "member.role_change", details: { userId, from: member.role, to: newRole } });
    return toMember({ ...member, role: newRole });
  });
}

export async function removeMember(actor: Actor, surveyId: string, userId: string): Promise<void> {
  await assertSurveyPermission(actor, surveyId, "members.manage");
  await getDb().transaction(async (trx) => {
    const member = await loadMember(trx, surveyId, userId);
    if (member.role === "lead") await assertAnotherLead(trx, surveyId, userId);
    await trx("survey_members").where({ survey_id: surveyId, user_id: userId }).delete();
    await recordAudit(trx, { surveyId, actorUserId: actor.userId, action: "member.remove", details: { userId, role: member.role } });
  });
}
