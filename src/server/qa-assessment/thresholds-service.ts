import "server-only";
/**
 * A survey's QA thresholds with every change recorded (who, when, old → new) and on the audit
 * trail. Every member reads them; the processor or the lead changes them ("qa.update").
 */
import type { Knex } from "knex";
import { serializeOn } from "../db/engine";
import { assertSurveyWritable } from "../surveys/writable";
import type { Actor } from "../auth/actor";
import { recordAudit } from "../audit/record";
import { assertSurveyPermission } from "../authz/permissions";
import { getDb } from "../db/client";
import { parseInput } from "../errors";
import { nowIso } from "../time";
import { DEFAULT_QA_THRESHOLDS, QA_THRESHOLD_KEYS, QaThresholdsSchema, type QaThresholdKey, type QaThresholds } from "./thresholds";

export interface QaThresholdsRecord {
  thresholds: QaThresholds;
  /** 0 while the survey uses the defaults. */
  revision: number;
  updatedAt: string | null;
  updatedBy: string | null;
}

export interface QaThresholdChange {
  id: number;
  revision: number;
  setting: QaThresholdKey;
  oldValue: number | null;
  newValue: number | null;
  changedBy: string | null;
  changedAt: string;
}

/** No permission check: callers check. */
export async function readQaThresholds(db: Knex | Knex.Transaction, surveyId: string): Promise<QaThresholdsRecord> {
  const row = await db("qa_thresholds as q")
    .leftJoin("users as u", "u.id", "q.updated_by")
    .where("q.survey_id", surveyId)
    .first("q.thresholds", "q.revision", "q.updated_at", "u.name as updated_by_name");
  if (!row) return { thresholds: { ...DEFAULT_QA_THRESHOLDS }, revision: 0, updatedAt: null, updatedBy: null };
  const parsed = QaThresholdsSchema.safeParse({ ...DEFAULT_QA_THRESHOLDS, ...JSON.parse(row.thresholds) });
  return { thresholds: parsed.success ? parsed.data : { ...DEFAULT_QA_THRESHOLDS }, revision: row.revision, updatedAt: row.updated_at, updatedBy: row.updated_by_name ?? null };
}

export async function getQaThresholds(actor: Actor, surveyId: string): Promise<QaThresholdsRecord> {
  await assertSurveyPermission(actor, surveyId, "days.read");
  return readQaThresholds(getDb(), surveyId);
}

/** Replaces all thresholds (a form sends them all); unchanged values leave no history. */
export async function updateQaThresholds(actor: Actor, surveyId: string, input: unknown): Promise<{ record: QaThresholdsRecord; changed: QaThresholdKey[] }> {
  await assertSurveyPermission(actor, surveyId, "qa.update");
  const next = parseInput(QaThresholdsSchema, input);
  return getDb().transaction(async (trx) => {
    await assertSurveyPermission(actor, surveyId, "qa.update", trx);
    await assertSurveyWritable(trx, surveyId, "changing its QA thresholds");
    await serializeOn(trx, `qa-thresholds:${surveyId}`); // the next revision is read, then written
    const current = await readQaThresholds(trx, surveyId);
    const changed = QA_THRESHOLD_KEYS.filter((k) => next[k] !== current.thresholds[k]);
    if (changed.length === 0) return { record: current, changed };
    const now = nowIso();
    const revision = current.revision + 1;
    const row = { survey_id: surveyId, thresholds: JSON.stringify(next), revision, updated_by: actor.userId, updated_at: now };
    await trx("qa_thresholds").insert(row).onConflict("survey_id").merge();
    await trx("qa_threshold_changes").insert(
      changed.map((setting) => ({
        survey_id: surveyId, revision, setting, old_value: JSON.stringify(current.thresholds[setting]), new_value: JSON.stringify(next[setting]),
        changed_by: actor.userId, changed_at: now,
      })),
    );
    await recordAudit(trx, {
      surveyId, actorUserId: actor.userId, action: "qa.thresholds_update",
      details: { revision, changes: Object.fromEntries(changed.map((k) => [k, { from: current.thresholds[k], to: next[k] }])) },
    });
    return { record: { thresholds: next, revision, updatedAt: now, updatedBy: actor.name }, changed };
  });
}

/** Newest first. */
export async function listQaThresholdChanges(actor: Actor, surveyId: string): Promise<QaThresholdChange[]> {
  await assertSurveyPermission(actor, surveyId, "days.read");
  const rows = await getDb()("qa_threshold_changes as c")
    .leftJoin("users as u", "u.id", "c.changed_by")
    .where("c.survey_id", surveyId)
    .select("c.id", "c.revision", "c.setting", "c.old_value", "c.new_value", "c.changed_at", "u.name as changed_by_name")
    .orderBy("c.id", "desc");
  return rows.map((r: { id: number; revision: number; setting: string; old_value: string | null; new_value: string | null; changed_at: string; changed_by_name: string | null }) => ({
    id: r.id,
    revision: r.revision,
    setting: r.setting as QaThresholdKey,
    oldValue: r.old_value === null ? null : (JSON.parse(r.old_value) as number),
    newValue: r.new_value === null ? null : (JSON.parse(r.new_value) as number),
    changedBy: r.changed_by_name,
    changedAt: r.changed_at,
  }));
}
