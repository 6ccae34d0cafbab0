import "server-only";
/**
 * Authorization for everything survey-scoped. Every data-layer function calls
 * assertSurveyPermission before it reads or writes.
 */
import type { Knex } from "knex";
import type { Actor } from "../auth/actor";
import { getDb } from "../db/client";
import { ForbiddenError, NotFoundError } from "../errors";
import { roleAllows, type Permission } from "./permission-table";
import type { SurveyRole } from "./roles";

export { PERMISSIONS, PERMISSION_NAMES, roleAllows, type Permission } from "./permission-table";
export { SURVEY_ROLES, SURVEY_ROLE_LABELS, isSurveyRole, type SurveyRole } from "./roles";

export const SURVEY_NOT_FOUND = "Survey not found.";

/** The actor's role on the survey ("admin" for org admins), or null when not on it / no such survey. */
export async function roleOnSurvey(actor: Actor, surveyId: string, db: Knex | Knex.Transaction = getDb()): Promise<SurveyRole | "admin" | null> {
  if (typeof surveyId !== "string" || surveyId.length === 0) return null;
  const survey = await db("surveys").select("id").where({ id: surveyId }).first();
  if (!survey) return null;
  if (actor.isAdmin) return "admin";
  const member = await db("survey_members").select("role").where({ survey_id: surveyId, user_id: actor.userId }).first();
  return member ? (member.role as SurveyRole) : null;
}

/**
 * NotFoundError when the survey does not exist or the actor is not on it (and not admin);
 * ForbiddenError when on it with a role that lacks the permission. Returns the role used.
 */
export async function assertSurveyPermission(
  actor: Actor,
  surveyId: string,
  permission: Permission,
  db: Knex | Knex.Transaction = getDb(),
): Promise<SurveyRole | "admin"> {
  const role = await roleOnSurvey(actor, surveyId, db);
  if (role === null) throw new NotFoundError(SURVEY_NOT_FOUND);
  if (!roleAllows(role, permission)) throw new ForbiddenError();
  return role;
}

/** Org-wide actions (create a survey, read the captured mailbox): admin only. */
export function assertAdmin(actor: Actor): void {
  if (!actor.isAdmin) throw new ForbiddenError("Only an org admin may do this.");
}
