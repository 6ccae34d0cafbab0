import "server-only";
/** Reading a survey's audit trail: the lead and the org admin ("audit.read"). */
import type { Actor } from "../auth/actor";
import { assertSurveyPermission } from "../authz/permissions";
import { getDb } from "../db/client";

export interface AuditEvent {
  id: string;
  action: string;
  actorName: string | null;
  actorEmail: string | null;
  details: Record<string, unknown>;
  createdAt: string;
}

/** Newest first, at most `limit` (default 500, at most 5 000); `action` filters by prefix (e.g. "day."). */
export async function listAuditEvents(actor: Actor, surveyId: string, opts: { limit?: number; action?: string } = {}): Promise<AuditEvent[]> {
  await assertSurveyPermission(actor, surveyId, "audit.read");
  const q = getDb()("audit_events as a")
    .leftJoin("users as u", "u.id", "a.actor_user_id")
    .where("a.survey_id", surveyId)
    .select("a.id", "a.action", "a.details", "a.created_at", "u.name as actor_name", "u.email as actor_email")
    .orderBy([{ column: "a.created_at", order: "desc" }, { column: "a.id", order: "desc" }])
    .limit(Math.min(Math.max(opts.limit ?? 500, 1), 5000));
  if (opts.action) q.where("a.action", "like", `${opts.action.replace(/[%_]/g, "")}%`);
  const rows = (await q) as { id: string; action: string; details: string; created_at: string; actor_name: string | null; actor_email: string | null }[];
  return rows.map((r) => {
    let details: Record<string, unknown> = {};
    try {
      details = JSON.parse(r.details) as Record<string, unknown>;
    } catch {
      details = {};
    }
    return { id: r.id, action: r.action, actorName: r.actor_name, actorEmail: r.actor_email, details, createdAt: r.created_at };
  });
}
