import "server-only";
/**
 * Survey days (local calendar dates that hold logs) and their pairing: which base log(s) and
 * rover logs a day's correction uses. Defaults: the day's base log at the survey's main base
 * site, a second base log of the day as fallback where the first has a gap, all rover logs of the
 * day; with no base log, the looping method from rover readings at the reoccupation station.
 */
import type { Knex } from "knex";
import "@/src/lib/zod-jitless";
import { z } from "zod";
import { assertSurveyWritable } from "../surveys/writable";
import type { Actor } from "../auth/actor";
import { assertSurveyPermission } from "../authz/permissions";
import { getDb } from "../db/client";
import { NotFoundError, ValidationError, parseInput } from "../errors";
import { readSettings } from "../processing/service";
import type { ProcessingSettings } from "../processing/schema";
import { nowIso } from "../time";
import { localDayNumber } from "./readings-store";

export const DAY_PATTERN = /^\d{4}-\d{2}-\d{2}$/;

export interface DayLog {
  id: number;
  kind: "base" | "rover";
  originalName: string;
  sha256: string;
  instrument: string;
  baseSiteName: string | null;
  baseLatitudeDeg: number | null;
  baseLongitudeDeg: number | null;
  baseHeightM: number | null;
  /** Readings of this log on the day. */
  readingCount: number;
  firstTimeMs: number;
  lastTimeMs: number;
  uploadedAt: string;
}

export type PairingMethod = "base" | "loop" | "none";

export interface DayPairing {
  method: PairingMethod;
  baseLog: DayLog | null;
  fallbackBaseLog: DayLog | null;
  roverLogs: DayLog[];
  /** True when a processor chose the logs; false for the defaults. */
  explicit: boolean;
  /** Rover readings of the day at the reoccupation station (looping method). */
  loopOccupations: number;
  /** Why this pairing (shown on the day page). */
  notes: string[];
}

export interface RunBrief {
  number: number;
  status: "queued" | "running" | "done" | "failed";
  createdAt: string;
}

export interface DaySummary {
  day: string;
  baseLogs: DayLog[];
  roverLogs: DayLog[];
  baseReadingCount: number;
  roverReadingCount: number;
  firstTimeMs: number;
  lastTimeMs: number;
  runCount: number;
  latestRun: RunBrief | null;
}

type LogDayRow = {
  day: string;
  reading_count: number;
  first_time_ms: number;
  last_time_ms: number;
  id: number;
  kind: "base" | "rover";
  original_name: string;
  sha256: string;
  instrument: string;
  base_site_name: string | null;
  base_latitude_deg: number | null;
  base_longitude_deg: number | null;
  base_height_m: number | null;
  uploaded_at: string;
};

function toDayLog(r: LogDayRow): DayLog {
  return {
    id: r.id,
    kind: r.kind,
    originalName: r.original_name,
    sha256: r.sha256,
    instrument: r.instrument,
    baseSiteName: r.base_site_name,
    baseLatitudeDeg: r.base_latitude_deg,
    baseLongitudeDeg: r.base_longitude_deg,
    baseHeightM: r.base_height_m,
    readingCount: r.reading_count,
    firstTimeMs: r.first_time_ms,
    lastTimeMs: r.last_time_ms,
    uploadedAt: r.uploaded_at,
  };
}

async function logDayRows(db: Knex | Knex.Transaction, surveyId: string, day?: string): Promise<LogDayRow[]> {
  const q = db("log_days as d")
    .join("field_logs as l", "l.id", "d.log_id")
    .where("d.survey_id", surveyId)
    .select(
      "d.day", "d.reading_count", "d.first_time_ms", "d.last_time_ms", "l.id", "l.kind", "l.original_name", "l.sha256", "l.instrument",
      "l.base_site_name", "l.base_latitude_deg", "l.base_longitude_deg", "l.base_height_m", "l.uploaded_at",
    )
    .orderBy([{ column: "d.day" }, { column: "l.id" }]);
  if (day) q.where("d.day", day);
  return q;
}

async function runBriefs(db: Knex | Knex.Transaction, surveyId: string, day?: string): Promise<Map<string, { count: number; latest: RunBrief }>> {
  const q = db("correction_runs").where({ survey_id: surveyId }).select("day", "number", "status", "created_at").orderBy([{ column: "day" }, { column: "number" }]);
  if (day) q.where({ day });
  const out = new Map<string, { count: number; latest: RunBrief }>();
  for (const r of await q) {
    const prev = out.get(r.day);
    out.set(r.day, { count: (prev?.count ?? 0) + 1, latest: { number: r.number, status: r.status, createdAt: r.created_at } });
  }
  return out;
}

function summarise(day: string, rows: LogDayRow[], runs: { count: number; latest: RunBrief } | undefined): DaySummary {
  const logs = rows.map(toDayLog);
  const baseLogs = logs.filter((l) => l.kind === "base");
  const roverLogs = logs.filter((l) => l.kind === "rover");
  return {
    day,
    baseLogs,
    roverLogs,
    baseReadingCount: baseLogs.reduce((s, l) => s + l.readingCount, 0),
    roverReadingCount: roverLogs.reduce((s, l) => s + l.readingCount, 0),
    firstTimeMs: Math.min(...logs.map((l) => l.firstTimeMs)),
    lastTimeMs: Math.max(...logs.map((l) => l.lastTimeMs)),
    runCount: runs?.count ?? 0,
    latestRun: runs?.latest ?? null,
  };
}

/** Every day of the survey with logs, newest first. */
export async function listDays(actor: Actor, surveyId: string): Promise<DaySummary[]> {
  await assertSurveyPermission(actor, surveyId, "days.read");
  const db = getDb();
  const rows = await logDayRows(db, surveyId);
  const runs = await runBriefs(db, surveyId);
  const byDay = new Map<string, LogDayRow[]>();
  for (const r of rows) (byDay.get(r.day) ?? byDay.set(r.day, []).get(r.day)!).push(r);
  return [...byDay.entries()].map(([day, rs]) => summarise(day, rs, runs.get(day))).reverse();
}

export function parseDay(day: unknown): string {
  if (typeof day !== "string" || !DAY_PATTERN.test(day) || Number.isNaN(Date.parse(`${day}T00:00:00Z`))) {
    throw new NotFoundError("No such survey day.");
  }
  return day;
}

/** One day with its logs and runs; NotFoundError when the survey holds no log on it. */
export async function getDay(actor: Actor, surveyId: string, day: unknown): Promise<DaySummary> {
  await assertSurveyPermission(actor, surveyId, "days.read");
  const d = parseDay(day);
  const db = getDb();
  const rows = await logDayRows(db, surveyId, d);
  if (rows.length === 0) throw new NotFoundError("No logs on this day.");
  return summarise(d, rows, (await runBriefs(db, surveyId, d)).get(d));
}

/** The main base site: the setting when it names a site with logs, else the site with the most base logs. */
async function mainBaseSite(db: Knex | Knex.Transaction, surveyId: string, settings: ProcessingSettings): Promise<string | null> {
  const sites = (await db("field_logs")
    .where({ survey_id: surveyId, kind: "base" })
    .whereNotNull("base_site_name")
    .select("base_site_name")
    .count({ n: "*" })
    .min({ first: "uploaded_at" })
    .groupBy("base_site_name")
    .orderBy([{ column: "n", order: "desc" }, { column: "first" }])) as { base_site_name: string; n: number }[];
  if (settings.mainBaseSite && sites.some((s) => s.base_site_name === settings.mainBaseSite)) return settings.mainBaseSite;
  return sites[0]?.base_site_name ?? null;
}

async function countLoopOccupations(db: Knex, roverLogs: DayLog[], day: string, station: string): Promise<number> {
  if (roverLogs.length === 0) return 0;
  const ids = roverLogs.map((l) => l.id);
  const row = await db("log_readings")
    .whereIn("log_id", ids)
    .where("local_day", localDayNumber(day))
    .whereRaw("lower(trim(station)) = ?", [station.trim().toLowerCase()])
    .count({ n: "*" })
    .first();
  return Number(row?.n ?? 0);
}

const byReadingsThenAge = (a: DayLog, b: DayLog) => b.readingCount - a.readingCount || a.id - b.id;

/** The pairing a day's run would use now. No permission check: callers check. */
export async function resolvePairing(db: Knex, surveyId: string, day: string, settings?: ProcessingSettings): Promise<DayPairing> {
  const s = settings ?? (await readSettings(db, surveyId)).settings;
  const logs = (await logDayRows(db, surveyId, day)).map(toDayLog);
  const bases = logs.filter((l) => l.kind === "base");
  const rovers = logs.filter((l) => l.kind === "rover");
  const explicit = await db("day_pairings").where({ survey_id: surveyId, day }).first();
  const notes: string[] = [];
  if (explicit) {
    const byId = (id: number | null) => (id === null ? null : (logs.find((l) => l.id === id) ?? null));
    const chosenRovers: number[] = JSON.parse(explicit.rover_log_ids);
    const roverLogs = chosenRovers.length > 0 ? rovers.filter((l) => chosenRovers.includes(l.id)) : rovers;
    const method = explicit.method as "base" | "loop";
    const baseLog = method === "base" ? byId(explicit.base_log_id) : null;
    const loopOccupations = method === "loop" ? await countLoopOccupations(db, roverLogs, day, s.loopStation) : 0;
    notes.push("Logs chosen by a processor for this day.");
    return {
      method: method === "base" && !baseLog ? "none" : method,
      baseLog,
      fallbackBaseLog: method === "base" ? byId(explicit.fallback_base_log_id) : null,
      roverLogs,
      explicit: true,
      loopOccupations,
      notes,
    };
  }
  if (bases.length > 0) {
    const site = await mainBaseSite(db, surveyId, s);
    const atMain = bases.filter((l) => l.baseSiteName === site).sort(byReadingsThenAge);
    const baseLog = atMain[0] ?? [...bases].sort(byReadingsThenAge)[0];
    if (atMain.length > 0) notes.push(`Base log of the main base site “${site}”.`);
    else notes.push(`No base log at the main base site “${site ?? "none"}” on this day: using the fullest base log.`);
    const fallbackBaseLog = bases.filter((l) => l.id !== baseLog.id).sort(byReadingsThenAge)[0] ?? null;
    if (fallbackBaseLog) notes.push(`“${fallbackBaseLog.originalName}” fills gaps of the first base.`);
    return { method: "base", baseLog, fallbackBaseLog, roverLogs: rovers, explicit: false, loopOccupations: 0, notes };
  }
  const loopOccupations = await countLoopOccupations(db, rovers, day, s.loopStation);
  if (loopOccupations >= 2) {
    notes.push(`No base log on this day: looping from ${loopOccupations} rover readings at station “${s.loopStation}”.`);
    return { method: "loop", baseLog: null, fallbackBaseLog: null, roverLogs: rovers, explicit: false, loopOccupations, notes };
  }
  notes.push(`No base log for this day: upload one, or record repeat readings at the base with station id “${s.loopStation}”.`);
  return { method: "none", baseLog: null, fallbackBaseLog: null, roverLogs: rovers, explicit: false, loopOccupations, notes };
}

export async function getDayPairing(actor: Actor, surveyId: string, day: unknown): Promise<DayPairing> {
  await assertSurveyPermission(actor, surveyId, "days.read");
  return resolvePairing(getDb(), surveyId, parseDay(day));
}

const PairingInputSchema = z.object({
  method: z.enum(["default", "base", "loop"], { message: "Choose default, base or loop." }),
  baseLogId: z.coerce.number().int().positive().nullable().optional(),
  fallbackBaseLogId: z.coerce.number().int().positive().nullable().optional(),
  roverLogIds: z.array(z.coerce.number().int().positive()).default([]),
});

/** Save a processor's choice of logs for the day ("default" removes it). */
export async function saveDayPairing(actor: Actor, surveyId: string, day: unknown, input: unknown): Promise<DayPairing> {
  await assertSurveyPermission(actor, surveyId, "processing.update");
  const d = parseDay(day);
  const v = parseInput(PairingInputSchema, input);
  const db = getDb();
  await assertSurveyWritable(db, surveyId, "changing which logs a day uses");
  const logs = (await logDayRows(db, surveyId, d)).map(toDayLog);
  if (logs.length === 0) throw new NotFoundError("No logs on this day.");
  if (v.method === "default") {
    await db("day_pairings").where({ survey_id: surveyId, day: d }).delete();
    return resolvePairing(db, surveyId, d);
  }
  const isBase = (id: number | null | undefined) => id == null || logs.some((l) => l.id === id && l.kind === "base");
  const errors: Record<string, string[]> = {};
  if (v.method === "base" && !v.baseLogId) errors.baseLogId = ["Choose the day's base log."];
  if (!isBase(v.baseLogId)) errors.baseLogId = ["Not a base log of this day."];
  if (!isBase(v.fallbackBaseLogId)) errors.fallbackBaseLogId = ["Not a base log of this day."];
  if (v.fallbackBaseLogId && v.fallbackBaseLogId === v.baseLogId) errors.fallbackBaseLogId = ["Choose a different log than the first base."];
  if (v.roverLogIds.some((id) => !logs.some((l) => l.id === id && l.kind === "rover"))) errors.roverLogIds = ["Not a rover log of this day."];
  if (Object.keys(errors).length > 0) throw new ValidationError(errors);
  const row = {
    survey_id: surveyId,
    day: d,
    method: v.method,
    base_log_id: v.method === "base" ? v.baseLogId : null,
    fallback_base_log_id: v.method === "base" ? (v.fallbackBaseLogId ?? null) : null,
    rover_log_ids: JSON.stringify(v.roverLogIds),
    updated_by: actor.userId,
    updated_at: nowIso(),
  };
  await db("day_pairings").insert(row).onConflict(["survey_id", "day"]).merge();
  return resolvePairing(db, surveyId, d);
}
