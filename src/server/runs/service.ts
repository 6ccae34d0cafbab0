import "server-only";
/**
 * Correction runs of a survey day: numbered 1, 2, 3 … per day, each with its full parameters,
 * the reference model's name and version, the input logs with their SHA-256, who ran it and when.
 * A rerun makes a new run; old runs stay readable; two runs can be compared.
 *
 * A run executes in this process without blocking it (see execute.ts): startRun returns the
 * queued run at once; the page polls getRun for progress. A run that a stopped server left
 * queued or running is marked failed when runs are next read.
 */
import type { Knex } from "knex";
import { refuseIfArchived } from "../surveys/writable";
import type { Actor } from "../auth/actor";
import { assertSurveyPermission } from "../authz/permissions";
import { getDb } from "../db/client";
import { serializeOn } from "../db/engine";
import { ConflictError, NotFoundError, ValidationError } from "../errors";
import { getDay, parseDay, resolvePairing } from "../days/service";
import { readSettings } from "../processing/service";
import { ReferenceModelFileError, loadReferenceModel } from "@/src/lib/reference-model";
import { nowIso } from "../time";
import { computeRun, RunInputError, storeRunOutcome } from "./execute";
import { buildRunParameters, parameterDifferences, type RunParameters } from "./parameters";
import { PROCESS_ID } from "./process-id";
import { COLUMN_DTYPES, decodeColumn, type ColumnDtype, type RunColumns, type RunDictionaries } from "./run-columns";

export type RunStatus = "queued" | "running" | "done" | "failed";

export interface RunInput {
  logId: number;
  kind: "base" | "rover";
  role: "base" | "fallback-base" | "rover";
  originalName: string;
  sha256: string;
  readingCount: number;
}

export interface RunRecord {
  id: number;
  surveyId: string;
  day: string;
  number: number;
  status: RunStatus;
  progress: number;
  parameters: RunParameters;
  modelName: string | null;
  modelVersion: string | null;
  inputs: RunInput[];
  summary: Record<string, unknown> | null;
  error: string | null;
  readingCount: number;
  createdBy: string | null;
  createdAt: string;
  startedAt: string | null;
  finishedAt: string | null;
}

export const INTERRUPTED_MESSAGE = "Interrupted: the server stopped before this run finished. Run the correction again.";

type RunRow = {
  id: number; survey_id: string; day: string; number: number; status: RunStatus; progress: number; parameters: string;
  model_name: string | null; model_version: string | null; inputs: string; summary: string | null; error: string | null;
  reading_count: number; created_by_name: string | null; created_at: string; started_at: string | null; finished_at: string | null;
};

function toRecord(r: RunRow): RunRecord {
  let summary: Record<string, unknown> | null = r.summary ? JSON.parse(r.summary) : null;
  if (summary) {
    const { dictionaries: _d, ...rest } = summary;
    summary = rest;
  }
  return {
    id: r.id, surveyId: r.survey_id, day: r.day, number: r.number, status: r.status, progress: r.progress,
    parameters: JSON.parse(r.parameters), modelName: r.model_name, modelVersion: r.model_version, inputs: JSON.parse(r.inputs),
    summary, error: r.error, readingCount: r.reading_count, createdBy: r.created_by_name, createdAt: r.created_at,
    startedAt: r.started_at, finishedAt: r.finished_at,
  };
}

function runQuery(db: Knex | Knex.Transaction) {
  return db("correction_runs as r")
    .leftJoin("users as u", "u.id", "r.created_by")
    .select("r.*", "u.name as created_by_name");
}

/** Runs left unfinished by another server process were cut off: mark them failed. */
export async function markInterruptedRuns(db: Knex | Knex.Transaction): Promise<number> {
  return db("correction_runs")
    .whereIn("status", ["queued", "running"])
    .whereNot({ process_id: PROCESS_ID })
    .update({ status: "failed", error: INTERRUPTED_MESSAGE, finished_at: nowIso() });
}

const inFlight = new Map<number, Promise<RunRecord>>();

/**
 * Queue a new run of the day with the survey's current settings and the day's pairing; returns the
 * queued run at once (status "queued"); the correction proceeds in the background.
 */
export async function startRun(actor: Actor, surveyId: string, dayInput: unknown): Promise<RunRecord> {
  await assertSurveyPermission(actor, surveyId, "runs.create");
  const day = parseDay(dayInput);
  await getDay(actor, surveyId, day); // 404 for a day without logs
  const db = getDb();
  await markInterruptedRuns(db);
  const survey = await db("surveys").where({ id: surveyId }).first("time_zone", "archived_at");
  refuseIfArchived(survey, "running corrections");
  const { settings, revision } = await readSettings(db, surveyId);
  const pairing = await resolvePairing(db, surveyId, day, settings);
  let parameters: RunParameters;
  try {
    parameters = buildRunParameters(day, survey.time_zone, settings, revision, pairing);
  } catch (err) {
    if (err instanceof RangeError) throw new ValidationError({}, err.message);
    throw err;
  }
  if (parameters.pairing.roverLogIds.length === 0) throw new ValidationError({}, "No rover log on this day: upload the day's rover log first.");
  let model: { name: string; version: string } | null = null;
  if (parameters.referenceModel) {
    try {
      const m = loadReferenceModel(parameters.referenceModel);
      model = { name: m.name, version: m.version };
    } catch (err) {
      if (err instanceof ReferenceModelFileError) {
        throw new ValidationError({ referenceModel: [err.message] }, "The reference model is not available on this server: choose another in the processing settings.");
      }
      throw err;
    }
  }
  const inputs: RunInput[] = [
    ...(pairing.baseLog && parameters.pairing.method === "base" ? [{ log: pairing.baseLog, role: "base" as const }] : []),
    ...(pairing.fallbackBaseLog && parameters.pairing.method === "base" ? [{ log: pairing.fallbackBaseLog, role: "fallback-base" as const }] : []),
    ...pairing.roverLogs.map((log) => ({ log, role: "rover" as const })),
  ].map(({ log, role }) => ({ logId: log.id, kind: log.kind, role, originalName: log.originalName, sha256: log.sha256, readingCount: log.readingCount }));

  const runId = await db.transaction(async (trx) => {
    await assertSurveyPermission(actor, surveyId, "runs.create", trx);
    await serializeOn(trx, `run-number:${surveyId}:${day}`); // two requests never take the same number
    const active = await trx("correction_runs").where({ survey_id: surveyId, day }).whereIn("status", ["queued", "running"]).first("number");
    if (active) throw new ConflictError(`Run ${active.number} of this day is still in progress: wait for it to finish.`);
    const last = await trx("correction_runs").where({ survey_id: surveyId, day }).max({ n: "number" }).first();
    const number = (Number(last?.n) || 0) + 1;
    const now = nowIso();
    const [{ id }] = (await trx("correction_runs").insert({
      survey_id: surveyId, day, number, status: "queued", progress: 0, parameters: JSON.stringify(parameters),
      model_name: model?.name ?? null, model_version: model?.version ?? null, inputs: JSON.stringify(inputs),
      process_id: PROCESS_ID, created_by: actor.userId, created_at: now,
    }).returning("id")) as { id: number }[];
    await trx("audit_events").insert({
      id: crypto.randomUUID(), survey_id: surveyId, actor_user_id: actor.userId, action: "run.create",
      details: JSON.stringify({ day, number, runId: id }), created_at: now,
    });
    return id;
  });
  const promise = executeRun(db, runId, parameters);
  inFlight.set(runId, promise);
  void promise.finally(() => inFlight.delete(runId));
  return readRun(db, runId);
}

async function executeRun(db: Knex, runId: number, parameters: RunParameters): Promise<RunRecord> {
  await new Promise<void>((resolve) => setImmediate(resolve)); // let startRun answer first
  try {
    await db("correction_runs").where({ id: runId }).update({ status: "running", started_at: nowIso() });
    const outcome = await computeRun(db, parameters, async (fraction) => {
      await db("correction_runs").where({ id: runId }).update({ progress: Math.min(0.99, fraction) });
    });
    await storeRunOutcome(db, runId, outcome);
  } catch (err) {
    const message =
      err instanceof RunInputError || err instanceof ReferenceModelFileError
        ? err.message
        : "The correction failed on our side; nothing of this run was kept. Please try again.";
    if (!(err instanceof RunInputError)) console.error(`correction run ${runId} failed:`, err);
    await db("correction_runs").where({ id: runId }).update({ status: "failed", error: message, finished_at: nowIso() }).catch(() => undefined);
  }
  return readRun(db, runId);
}

/** Resolves when the run has finished (at once when it is not running in this process). */
export async function waitForRun(actor: Actor, surveyId: string, day: unknown, number: unknown): Promise<RunRecord> {
  const run = await getRun(actor, surveyId, day, number);
  const pending = inFlight.get(run.id);
  if (pending) await pending;
  return getRun(actor, surveyId, day, number);
}

async function readRun(db: Knex, runId: number): Promise<RunRecord> {
  return toRecord((await runQuery(db).where("r.id", runId).first()) as RunRow);
}

function parseRunNumber(n: unknown): number {
  const v = typeof n === "number" ? n : typeof n === "string" && /^\d{1,9}$/.test(n) ? Number(n) : NaN;
  if (!Number.isInteger(v) || v < 1) throw new NotFoundError("No such run.");
  return v;
}

export async function listRuns(actor: Actor, surveyId: string, day: unknown): Promise<RunRecord[]> {
  await assertSurveyPermission(actor, surveyId, "days.read");
  const d = parseDay(day);
  const db = getDb();
  await markInterruptedRuns(db);
  const rows = (await runQuery(db).where({ "r.survey_id": surveyId, "r.day": d }).orderBy("r.number", "desc")) as RunRow[];
  return rows.map(toRecord);
}

export async function getRun(actor: Actor, surveyId: string, day: unknown, number: unknown): Promise<RunRecord> {
  await assertSurveyPermission(actor, surveyId, "days.read");
  return readRunByNumber(getDb(), surveyId, parseDay(day), parseRunNumber(number));
}

async function readRunByNumber(db: Knex, surveyId: string, day: string, number: number): Promise<RunRecord> {
  await markInterruptedRuns(db);
  const row = (await runQuery(db).where({ "r.survey_id": surveyId, "r.day": day, "r.number": number }).first()) as RunRow | undefined;
  if (!row) throw new NotFoundError("No such run.");
  return toRecord(row);
}

/** The latest finished run of the day, or null. */
export async function latestDoneRun(actor: Actor, surveyId: string, day: unknown): Promise<RunRecord | null> {
  await assertSurveyPermission(actor, surveyId, "days.read");
  const row = (await runQuery(getDb()).where({ "r.survey_id": surveyId, "r.day": parseDay(day), "r.status": "done" }).orderBy("r.number", "desc").first()) as RunRow | undefined;
  return row ? toRecord(row) : null;
}

// ---- results --------------------------------------------------------------------------------

export interface RunResult {
  run: RunRecord;
  columns: RunColumns;
  dictionaries: RunDictionaries;
}

const RESULT_CACHE_SIZE = 4;
const resultCache: { id: number; columns: RunColumns; dictionaries: RunDictionaries }[] = [];

async function loadColumns(db: Knex, runId: number): Promise<{ columns: RunColumns; dictionaries: RunDictionaries }> {
  const hit = resultCache.find((c) => c.id === runId);
  if (hit) return hit;
  const rows = (await db("correction_run_columns").where({ run_id: runId }).select("name", "dtype", "data")) as { name: string; dtype: ColumnDtype; data: Buffer }[];
  const summary = JSON.parse((await db("correction_runs").where({ id: runId }).first("summary")).summary);
  const columns = { count: 0 } as RunColumns;
  for (const r of rows) (columns as unknown as Record<string, unknown>)[r.name] = decodeColumn(r.dtype, r.data);
  for (const name of Object.keys(COLUMN_DTYPES)) if (!(name in columns)) throw new Error(`run ${runId} lacks column ${name}`);
  columns.count = columns.timeMs.length;
  const entry = { id: runId, columns, dictionaries: summary.dictionaries as RunDictionaries };
  resultCache.push(entry);
  if (resultCache.length > RESULT_CACHE_SIZE) resultCache.shift();
  return entry;
}

/** Per-reading results of a finished run; `permission` is "days.read" for charts and "export" for downloads. */
export async function getRunResult(actor: Actor, surveyId: string, day: unknown, number: unknown, permission: "days.read" | "export" = "days.read"): Promise<RunResult> {
  await assertSurveyPermission(actor, surveyId, permission);
  const db = getDb();
  const run = await readRunByNumber(db, surveyId, parseDay(day), parseRunNumber(number));
  if (run.status !== "done") throw new ConflictError(run.status === "failed" ? `Run ${run.number} failed: ${run.error ?? ""}` : `Run ${run.number} is still ${run.status}.`);
  return { run, ...(await loadColumns(db, run.id)) };
}

export interface RunComparison {
  a: number;
  b: number;
  /** Readings present in both runs (matched by log and file line). */
  matched: number;
  onlyInA: number;
  onlyInB: number;
  /** Readings whose corrected value differs by more than half the exported step (0.0005 nT), or is present in one run only. */
  changedCount: number;
  largestChangeNt: number;
  largestChangeAtMs: number | null;
  largestResidualChangeNt: number;
  parameterChanges: { name: string; from: unknown; to: unknown }[];
}

export const CHANGE_TOLERANCE_NT = 0.0005;

export async function compareRuns(actor: Actor, surveyId: string, day: unknown, a: unknown, b: unknown): Promise<RunComparison> {
  const ra = await getRunResult(actor, surveyId, day, a);
  const rb = await getRunResult(actor, surveyId, day, b);
  const key = (c: RunColumns, i: number) => c.logId[i] * 2 ** 32 + c.sourceLine[i];
  const indexB = new Map<number, number>();
  for (let i = 0; i < rb.columns.count; i++) indexB.set(key(rb.columns, i), i);
  let matched = 0, changed = 0, largest = 0, largestAt: number | null = null, largestResidual = 0;
  for (let i = 0; i < ra.columns.count; i++) {
    const j = indexB.get(key(ra.columns, i));
    if (j === undefined) continue;
    matched++;
    const ca = ra.columns.correctedNt[i], cb = rb.columns.correctedNt[j];
    const aNaN = ca !== ca, bNaN = cb !== cb;
    if (aNaN !== bNaN) changed++;
    else if (!aNaN) {
      const d = Math.abs(ca - cb);
      if (d > CHANGE_TOLERANCE_NT) changed++;
      if (d > largest) {
        largest = d;
        largestAt = ra.columns.timeMs[i];
      }
    }
    const dr = Math.abs(ra.columns.residualNt[i] - rb.columns.residualNt[j]);
    if (dr > largestResidual) largestResidual = dr;
  }
  return {
    a: ra.run.number,
    b: rb.run.number,
    matched,
    onlyInA: ra.columns.count - matched,
    onlyInB: rb.columns.count - matched,
    changedCount: changed + (ra.columns.count - matched) + (rb.columns.count - matched),
    largestChangeNt: largest,
    largestChangeAtMs: largestAt,
    largestResidualChangeNt: largestResidual,
    parameterChanges: parameterDifferences(ra.run.parameters, rb.run.parameters),
  };
}
