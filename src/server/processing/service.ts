import "server-only";
/**
 * Processing settings per survey, with every change recorded (who, when, old → new). Reading is
 * open to every member; changing needs "processing.update" (processor or lead).
 */
import type { Knex } from "knex";
import { serializeOn } from "../db/engine";
import { assertSurveyWritable } from "../surveys/writable";
import type { Actor } from "../auth/actor";
import { assertSurveyPermission } from "../authz/permissions";
import { getDb } from "../db/client";
import { parseInput } from "../errors";
import { nowIso } from "../time";
import { DEFAULT_PROCESSING_SETTINGS, ProcessingSettingsSchema, type ProcessingSettings } from "./schema";

export interface ProcessingSettingsRecord {
  settings: ProcessingSettings;
  revision: number;
  updatedAt: string | null;
  updatedBy: string | null;
}

export interface SettingChange {
  id: number;
  revision: number;
  setting: keyof ProcessingSettings;
  oldValue: unknown;
  newValue: unknown;
  changedBy: string | null;
  changedAt: string;
}

/** Settings as stored (defaults for a survey that never saved any); no permission check: callers check. */
export async function readSettings(db: Knex | Knex.Transaction, surveyId: string): Promise<ProcessingSettingsRecord> {
  const row = await db("processing_settings as p")
    .leftJoin("users as u", "u.id", "p.updated_by")
    .where("p.survey_id", surveyId)
    .first("p.settings", "p.revision", "p.updated_at", "u.name as updated_by_name");
  if (!row) return { settings: { ...DEFAULT_PROCESSING_SETTINGS }, revision: 0, updatedAt: null, updatedBy: null };
  // Stored settings were valid when saved; parse again so that settings added later get their defaults.
  const parsed = ProcessingSettingsSchema.safeParse({ ...DEFAULT_PROCESSING_SETTINGS, ...JSON.parse(row.settings) });
  return {
    settings: parsed.success ? parsed.data : { ...DEFAULT_PROCESSING_SETTINGS },
    revision: row.revision,
    updatedAt: row.updated_at,
    updatedBy: row.updated_by_name ?? null,
  };
}

export async function getProcessingSettings(actor: Actor, surveyId: string): Promise<ProcessingSettingsRecord> {
  await assertSurveyPermission(actor, surveyId, "days.read");
  return readSettings(getDb(), surveyId);
}

/**
 * Replaces the settings (all fields; a form sends them all). Unchanged values leave no history;
 * returns the new record and the changes written.
 */
export async function updateProcessingSettings(
  actor: Actor,
  surveyId: string,
  input: unknown,
): Promise<{ record: ProcessingSettingsRecord; changes: SettingChange[] }> {
  await assertSurveyPermission(actor, surveyId, "processing.update");
  const next = parseInput(ProcessingSettingsSchema, input);
  if (next.datumKind !== "value") next.datumValueNt = next.datumValueNt ?? null;
  return getDb().transaction(async (trx) => {
    await assertSurveyPermission(actor, surveyId, "processing.update", trx);
    await assertSurveyWritable(trx, surveyId, "changing its processing settings");
    await serializeOn(trx, `processing-settings:${surveyId}`); // the next revision is read, then written
    const current = await readSettings(trx, surveyId);
    const now = nowIso();
    const revision = current.revision + 1;
    const changed = (Object.keys(next) as (keyof ProcessingSettings)[]).filter(
      (k) => JSON.stringify(next[k]) !== JSON.stringify(current.settings[k]),
    );
    if (changed.length === 0) return { record: current, changes: [] };
    if (current.revision === 0) {
      await trx("processing_settings").insert({ survey_id: surveyId, settings: JSON.stringify(next), revision, updated_by: actor.userId, updated_at: now });
    } else {
      await trx("processing_settings").where({ survey_id: surveyId }).update({ settings: JSON.stringify(next), revision, updated_by: actor.userId, updated_at: now });
    }
    const rows = changed.map((setting) => ({
      survey_id: surveyId,
      revision,
      setting,
      old_value: JSON.stringify(current.settings[setting] ?? null),
      new_value: JSON.stringify(next[setting] ?? null),
      changed_by: actor.userId,
      changed_at: now,
    }));
    await trx("processing_setting_changes").insert(rows);
    await trx("audit_events").insert({
      id: crypto.randomUUID(),
      survey_id: surveyId,
      actor_user_id: actor.userId,
      action: "processing.update",
      details: JSON.stringify({ revision, changed }),
      created_at: now,
    });
    const changes = await listChangesIn(trx, surveyId, revision);
    return { record: { settings: next, revision, updatedAt: now, updatedBy: actor.name }, changes };
  });
}

async function listChangesIn(db: Knex | Knex.Transaction, surveyId: string, revision?: number): Promise<SettingChange[]> {
  const q = db("processing_setting_changes as c")
    .leftJoin("users as u", "u.id", "c.changed_by")
    .where("c.survey_id", surveyId)
    .select("c.id", "c.revision", "c.setting", "c.old_value", "c.new_value", "c.changed_at", "u.name as changed_by_name")
    .orderBy("c.id", "desc");
  if (revision !== undefined) q.where("c.revision", revision);
  const rows = await q;
  return rows.map((r: { id: number; revision: number; setting: string; old_value: string | null; new_value: string | null; changed_at: string; changed_by_name: string | null }) => ({
    id: r.id,
    revision: r.revision,
    setting: r.setting as keyof ProcessingSettings,
    oldValue: r.old_value === null ? null : JSON.parse(r.old_value),
    newValue: r.new_value === null ? null : JSON.parse(r.new_value),
    changedBy: r.changed_by_name,
    changedAt: r.changed_at,
  }));
}

/** Names of the base station sites the survey's base logs were recorded at (choices for the main base site). */
export async function listBaseSiteNames(actor: Actor, surveyId: string): Promise<string[]> {
  await assertSurveyPermission(actor, surveyId, "days.read");
  const rows = (await getDb()("field_logs")
    .where({ survey_id: surveyId, kind: "base" })
    .whereNotNull("base_site_name")
    .distinct("base_site_name")
    .orderBy("base_site_name")) as { base_site_name: string }[];
  return rows.map((r) => r.base_site_name);
}

/** Change history, newest first. */
export async function listProcessingSettingChanges(actor: Actor, surveyId: string): Promise<SettingChange[]> {
  await assertSurveyPermission(actor, surveyId, "days.read");
  return listChangesIn(getDb(), surveyId);
}
