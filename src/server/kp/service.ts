import "server-only";
/**
 * 3-hourly Kp values held for a survey (from a space-weather service, entered or uploaded as CSV).
 * Every member reads them; a reviewer, processor or lead enters them ("kp.update"). A value for an
 * interval already held replaces it. The assessment of each day takes the largest Kp of the
 * intervals that overlap the day's logs.
 */
import type { Knex } from "knex";
import "@/src/lib/zod-jitless";
import { z } from "zod";
import { assertSurveyWritable } from "../surveys/writable";
import type { Actor } from "../auth/actor";
import { recordAudit } from "../audit/record";
import { assertSurveyPermission } from "../authz/permissions";
import { getDb } from "../db/client";
import { parseInput, ValidationError } from "../errors";
import { nowIso } from "../time";
import { KP_INTERVAL_MS, parseKpText } from "./parse";

export interface KpValue {
  intervalStart: string;
  intervalStartMs: number;
  kp: number;
  source: "entered" | "csv";
  enteredBy: string | null;
  enteredAt: string;
}

const KpInputSchema = z.object({
  text: z.string({ message: "Give the Kp values as text or a CSV file." }).max(500_000, "At most 500 000 characters."),
  source: z.enum(["entered", "csv"]).default("entered"),
});

type KpRow = { interval_start: string; kp: number; source: "entered" | "csv"; entered_at: string; entered_by_name: string | null };

function toValue(r: KpRow): KpValue {
  return { intervalStart: r.interval_start, intervalStartMs: Date.parse(r.interval_start), kp: r.kp, source: r.source, enteredBy: r.entered_by_name, enteredAt: r.entered_at };
}

/** Kp rows overlapping [fromMs, toMs] (all when no range). No permission check: callers check. */
export async function readKp(db: Knex | Knex.Transaction, surveyId: string, range?: { fromMs: number; toMs: number }): Promise<KpValue[]> {
  const q = db("kp_values as k")
    .leftJoin("users as u", "u.id", "k.entered_by")
    .where("k.survey_id", surveyId)
    .select("k.interval_start", "k.kp", "k.source", "k.entered_at", "u.name as entered_by_name")
    .orderBy("k.interval_start");
  if (range) {
    q.where("k.interval_start", ">", new Date(range.fromMs - KP_INTERVAL_MS).toISOString()).andWhere("k.interval_start", "<=", new Date(range.toMs).toISOString());
  }
  return ((await q) as KpRow[]).map(toValue);
}

/** Largest Kp of the intervals that overlap [fromMs, toMs], or null when none is held. */
export function kpMaxOf(values: KpValue[], fromMs: number, toMs: number): number | null {
  let max: number | null = null;
  for (const v of values) {
    if (v.intervalStartMs + KP_INTERVAL_MS > fromMs && v.intervalStartMs <= toMs && (max === null || v.kp > max)) max = v.kp;
  }
  return max;
}

export async function listKp(actor: Actor, surveyId: string, range?: { fromMs: number; toMs: number }): Promise<KpValue[]> {
  await assertSurveyPermission(actor, surveyId, "days.read");
  return readKp(getDb(), surveyId, range);
}

/** Saves every row or none: any bad row is a ValidationError on `text` listing the rows. */
export async function saveKpValues(actor: Actor, surveyId: string, input: unknown): Promise<{ saved: number; replaced: number }> {
  await assertSurveyPermission(actor, surveyId, "kp.update");
  const v = parseInput(KpInputSchema, input);
  const { entries, errors } = parseKpText(v.text);
  if (errors.length > 0) throw new ValidationError({ text: errors.slice(0, 20) }, errors.length > 20 ? `${errors.length} rows need attention; the first 20 are listed.` : undefined);
  return getDb().transaction(async (trx) => {
    await assertSurveyPermission(actor, surveyId, "kp.update", trx);
    await assertSurveyWritable(trx, surveyId, "adding Kp values");
    const now = nowIso();
    const starts = entries.map((e) => new Date(e.intervalStartMs).toISOString());
    let replaced = 0;
    for (let i = 0; i < starts.length; i += 500) {
      const got = await trx("kp_values").where({ survey_id: surveyId }).whereIn("interval_start", starts.slice(i, i + 500)).count({ n: "*" }).first();
      replaced += Number(got?.n ?? 0);
    }
    const rows = entries.map((e, i) => ({ survey_id: surveyId, interval_start: starts[i], kp: e.kp, source: v.source, entered_by: actor.userId, entered_at: now }));
    for (let i = 0; i < rows.length; i += 200) {
      await trx("kp_values").insert(rows.slice(i, i + 200)).onConflict(["survey_id", "interval_start"]).merge();
    }
    const kps = entries.map((e) => e.kp);
    await recordAudit(trx, {
      surveyId, actorUserId: actor.userId, action: "kp.update",
      details: { count: rows.length, replaced, source: v.source, from: starts[0], to: starts.at(-1), maxKp: Math.max(...kps) },
    });
    return { saved: rows.length, replaced };
  });
}
