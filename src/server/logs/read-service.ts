import "server-only";
/**
 * Reading a survey's logs: the paged, sorted, filtered table; one log with its days and
 * problems; its field-against-time series thinned for a chart; its problems as rows for a CSV;
 * its original file. Every reader checks "logs.read" on the survey first.
 */
import type { Knex } from "knex";
import "@/src/lib/zod-jitless";
import { z } from "zod";
import type { Actor } from "../auth/actor";
import { assertSurveyPermission } from "../authz/permissions";
import { getDb } from "../db/client";
import { selectTimeField } from "../db/engine";
import { NotFoundError, parseInput } from "../errors";
import { openStored, storedExists } from "../storage/original-files";
import type { ProblemRow } from "./errors";
import { lttbIndices } from "@/src/core/series/lttb";
import type { LogKind, SensorType, TimeBasisChoice } from "./schema";
import { logOriginalUrl, logUrl } from "./urls";

export const LOG_SORT_KEYS = ["uploadedAt", "originalName", "kind", "instrument", "operator", "firstTime", "readingCount", "rejectedCount"] as const;
export type LogSortKey = (typeof LOG_SORT_KEYS)[number];

const SORT_COLUMN: Record<LogSortKey, string> = {
  uploadedAt: "field_logs.uploaded_at",
  originalName: "field_logs.original_name",
  kind: "field_logs.kind",
  instrument: "field_logs.instrument",
  operator: "field_logs.operator",
  firstTime: "field_logs.first_time_ms",
  readingCount: "field_logs.reading_count",
  rejectedCount: "field_logs.rejected_count",
};

const blank = (v: unknown) => (typeof v === "string" && v.trim() === "" ? undefined : v);

export const LogListQuerySchema = z.object({
  page: z.preprocess(blank, z.coerce.number().int().min(1).default(1)),
  pageSize: z.preprocess(blank, z.coerce.number().int().min(1).max(200).default(25)),
  sort: z.preprocess(blank, z.enum(LOG_SORT_KEYS).default("uploadedAt")),
  dir: z.preprocess(blank, z.enum(["asc", "desc"]).default("desc")),
  kind: z.preprocess(blank, z.enum(["base", "rover"]).optional()),
  day: z.preprocess(blank, z.string().regex(/^\d{4}-\d{2}-\d{2}$/, "Day must be yyyy-mm-dd.").optional()),
  operator: z.preprocess(blank, z.string().max(120).optional()),
  instrument: z.preprocess(blank, z.string().max(80).optional()),
});
export type LogListQuery = z.infer<typeof LogListQuerySchema>;

export interface LogListItem {
  id: number;
  url: string;
  kind: LogKind;
  originalName: string;
  instrument: string;
  sensorType: SensorType;
  operator: string;
  readingCount: number;
  rejectedCount: number;
  issueCount: number;
  firstTimeMs: number | null;
  lastTimeMs: number | null;
  days: string[];
  uploadedAt: string;
  uploadedBy: string | null;
}

export interface LogListPage {
  items: LogListItem[];
  total: number;
  query: LogListQuery;
  /** Values present in the survey, for the filter controls. */
  facets: { days: string[]; operators: string[]; instruments: string[] };
}

type LogRow = {
  id: number;
  survey_id: string;
  kind: LogKind;
  original_name: string;
  storage_key: string;
  sha256: string;
  size_bytes: number;
  instrument: string;
  sensor_type: SensorType;
  operator: string;
  base_site_name: string | null;
  base_latitude_deg: number | null;
  base_longitude_deg: number | null;
  base_height_m: number | null;
  time_basis: TimeBasisChoice;
  clock_offset_s: number;
  delimiter: string;
  header: string;
  mapping: string;
  profile_id: string | null;
  row_count: number;
  reading_count: number;
  rejected_count: number;
  issue_count: number;
  first_time_ms: number | null;
  last_time_ms: number | null;
  warnings: string;
  uploaded_by: string | null;
  uploaded_at: string;
};

async function daysByLog(db: Knex, logIds: number[]): Promise<Map<number, string[]>> {
  const out = new Map<number, string[]>();
  if (logIds.length === 0) return out;
  const rows = await db("log_days").select("log_id", "day").whereIn("log_id", logIds).orderBy("day");
  for (const r of rows as { log_id: number; day: string }[]) {
    const list = out.get(r.log_id) ?? [];
    list.push(r.day);
    out.set(r.log_id, list);
  }
  return out;
}

export async function listLogs(actor: Actor, surveyId: string, input: unknown = {}): Promise<LogListPage> {
  const db = getDb();
  await assertSurveyPermission(actor, surveyId, "logs.read", db);
  const query = parseInput(LogListQuerySchema, input);
  const base = db("field_logs").where("field_logs.survey_id", surveyId);
  if (query.kind) base.where("field_logs.kind", query.kind);
  if (query.operator) base.where("field_logs.operator", query.operator);
  if (query.instrument) base.where("field_logs.instrument", query.instrument);
  if (query.day) base.whereExists(db("log_days").select(db.raw("1")).whereRaw("log_days.log_id = field_logs.id").where("log_days.day", query.day));
  const [{ n }] = await base.clone().count<{ n: number }[]>({ n: "*" });
  const rows = (await base
    .clone()
    .leftJoin("users", "users.id", "field_logs.uploaded_by")
    .select("field_logs.*", "users.name as uploader_name")
    .orderBy(SORT_COLUMN[query.sort], query.dir)
    .orderBy("field_logs.id", query.dir)
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize)) as (LogRow & { uploader_name: string | null })[];
  const days = await daysByLog(db, rows.map((r) => r.id));
  const [dayFacet, operatorFacet, instrumentFacet] = await Promise.all([
    db("log_days").distinct("day").where({ survey_id: surveyId }).orderBy("day"),
    db("field_logs").distinct("operator").where({ survey_id: surveyId }).whereNot({ operator: "" }).orderBy("operator"),
    db("field_logs").distinct("instrument").where({ survey_id: surveyId }).whereNot({ instrument: "" }).orderBy("instrument"),
  ]);
  return {
    items: rows.map((r) => ({
      id: r.id,
      url: logUrl(surveyId, r.id),
      kind: r.kind,
      originalName: r.original_name,
      instrument: r.instrument,
      sensorType: r.sensor_type,
      operator: r.operator,
      readingCount: r.reading_count,
      rejectedCount: r.rejected_count,
      issueCount: r.issue_count,
      firstTimeMs: r.first_time_ms,
      lastTimeMs: r.last_time_ms,
      days: days.get(r.id) ?? [],
      uploadedAt: r.uploaded_at,
      uploadedBy: r.uploader_name,
    })),
    total: Number(n),
    query,
    facets: {
      days: dayFacet.map((d: { day: string }) => d.day),
      operators: operatorFacet.map((d: { operator: string }) => d.operator),
      instruments: instrumentFacet.map((d: { instrument: string }) => d.instrument),
    },
  };
}

export interface LogDetail extends LogListItem {
  sha256: string;
  sizeBytes: number;
  rowCount: number;
  timeBasis: TimeBasisChoice;
  clockOffsetS: number;
  delimiter: string;
  header: string[];
  mapping: Record<string, string>;
  baseSite: { name: string; latitudeDeg: number | null; longitudeDeg: number | null; heightM: number | null } | null;
  warnings: string[];
  dayCounts: { day: string; readingCount: number; firstTimeMs: number; lastTimeMs: number }[];
  originalUrl: string;
  originalAvailable: boolean;
  /** First problems in file order (see listLogProblems for all). */
  problems: ProblemRow[];
}

function parseLogId(logId: unknown): number {
  const id = Number(logId);
  if (!Number.isSafeInteger(id) || id <= 0) throw new NotFoundError("Log not found.");
  return id;
}

async function loadLog(db: Knex, surveyId: string, logId: unknown): Promise<LogRow> {
  const row = await db<LogRow>("field_logs").where({ id: parseLogId(logId), survey_id: surveyId }).first();
  if (!row) throw new NotFoundError("Log not found.");
  return row;
}

function toProblem(r: { kind: "rejected" | "issue"; line: number; column_name: string; value: string; reason: string; message: string }): ProblemRow {
  return { kind: r.kind, line: r.line, column: r.column_name, value: r.value, reason: r.reason, message: r.message };
}

export async function getLog(actor: Actor, surveyId: string, logId: unknown, opts: { problemLimit?: number } = {}): Promise<LogDetail> {
  const db = getDb();
  await assertSurveyPermission(actor, surveyId, "logs.read", db);
  const row = await loadLog(db, surveyId, logId);
  const [dayRows, problemRows, uploader] = await Promise.all([
    db("log_days").where({ log_id: row.id }).orderBy("day"),
    db("log_problems").where({ log_id: row.id }).orderBy("line").limit(opts.problemLimit ?? 200),
    row.uploaded_by ? db("users").select("name").where({ id: row.uploaded_by }).first() : Promise.resolve(null),
  ]);
  return {
    id: row.id,
    url: logUrl(surveyId, row.id),
    kind: row.kind,
    originalName: row.original_name,
    instrument: row.instrument,
    sensorType: row.sensor_type,
    operator: row.operator,
    readingCount: row.reading_count,
    rejectedCount: row.rejected_count,
    issueCount: row.issue_count,
    firstTimeMs: row.first_time_ms,
    lastTimeMs: row.last_time_ms,
    days: dayRows.map((d: { day: string }) => d.day),
    uploadedAt: row.uploaded_at,
    uploadedBy: uploader?.name ?? null,
    sha256: row.sha256,
    sizeBytes: row.size_bytes,
    rowCount: row.row_count,
    timeBasis: row.time_basis,
    clockOffsetS: row.clock_offset_s,
    delimiter: row.delimiter,
    header: JSON.parse(row.header),
    mapping: JSON.parse(row.mapping),
    baseSite:
      row.kind === "base" && row.base_site_name
        ? { name: row.base_site_name, latitudeDeg: row.base_latitude_deg, longitudeDeg: row.base_longitude_deg, heightM: row.base_height_m }
        : null,
    warnings: JSON.parse(row.warnings),
    dayCounts: dayRows.map((d: { day: string; reading_count: number; first_time_ms: number; last_time_ms: number }) => ({
      day: d.day,
      readingCount: d.reading_count,
      firstTimeMs: d.first_time_ms,
      lastTimeMs: d.last_time_ms,
    })),
    originalUrl: logOriginalUrl(surveyId, row.id),
    originalAvailable: await storedExists(row.storage_key),
    problems: problemRows.map(toProblem),
  };
}

export async function listLogProblems(actor: Actor, surveyId: string, logId: unknown): Promise<{ fileName: string; problems: ProblemRow[] }> {
  const db = getDb();
  await assertSurveyPermission(actor, surveyId, "logs.read", db);
  const row = await loadLog(db, surveyId, logId);
  const problems = await db("log_problems").where({ log_id: row.id }).orderBy("line");
  return { fileName: row.original_name, problems: problems.map(toProblem) };
}

export const CHART_POINTS = 2000;

/** Field against time, thinned to at most `maxPoints` with largest-triangle-three-buckets. */
export async function getLogFieldSeries(actor: Actor, surveyId: string, logId: unknown, maxPoints = CHART_POINTS): Promise<{ timeMs: number[]; fieldNt: number[]; totalPoints: number }> {
  const db = getDb();
  await assertSurveyPermission(actor, surveyId, "logs.read", db);
  const row = await loadLog(db, surveyId, logId);
  const n = row.reading_count;
  const times = new Float64Array(n);
  const fields = new Float64Array(n);
  const k = await selectTimeField(db, row.id, times, fields);
  const xs = times.subarray(0, k);
  const ys = fields.subarray(0, k);
  const keep = lttbIndices(xs, ys, maxPoints);
  return { timeMs: Array.from(keep, (i) => xs[i]), fieldNt: Array.from(keep, (i) => ys[i]), totalPoints: k };
}

/** The stored original as a stream, with the name it was uploaded under. */
export async function openLogOriginal(actor: Actor, surveyId: string, logId: unknown): Promise<{ stream: NodeJS.ReadableStream; fileName: string; sizeBytes: number; sha256: string }> {
  const db = getDb();
  await assertSurveyPermission(actor, surveyId, "logs.read", db);
  const row = await loadLog(db, surveyId, logId);
  const stream = await openStored(row.storage_key);
  if (!stream) throw new NotFoundError("The original file is missing from storage.");
  return { stream, fileName: row.original_name, sizeBytes: row.size_bytes, sha256: row.sha256 };
}
