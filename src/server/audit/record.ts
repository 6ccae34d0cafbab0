import "server-only";
/** Audit trail: one row per survey change, member change, invitation, log, setting, run, export and review step. */
import { randomUUID } from "node:crypto";
import type { Knex } from "knex";
import { nowIso } from "../time";

export type AuditAction =
  | "survey.create"
  | "survey.update"
  | "survey.archive"
  | "survey.restore"
  | "member.add"
  | "member.role_change"
  | "member.remove"
  | "invitation.create"
  | "invitation.revoke"
  | "invitation.accept"
  | "password.reset"
  | "log.import"
  | "processing.update"
  | "run.create"
  | "run.export"
  | "qa.thresholds_update"
  | "kp.update"
  | "day.submit"
  | "day.accept"
  | "day.resurvey";

export async function recordAudit(
  db: Knex | Knex.Transaction,
  event: { surveyId: string | null; actorUserId: string | null; action: AuditAction; details?: Record<string, unknown> },
): Promise<void> {
  await db("audit_events").insert({
    id: randomUUID(),
    survey_id: event.surveyId,
    actor_user_id: event.actorUserId,
    action: event.action,
    details: JSON.stringify(event.details ?? {}),
    created_at: nowIso(),
  });
}
