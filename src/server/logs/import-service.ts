import "server-only";
/**
 * Importing one base or rover log into a survey: the one service behind the upload page, the
 * API route, the demo loader and the benchmark.
 *
 * Order: permission → options (zod) → the staged original (already hashed on disk) is checked
 * (empty, binary) → ONE transaction: duplicate check, header and profile, the file streamed
 * through the core's log parser with each parsed chunk handed to the engine's bulk path, bad
 * rows refused (or kept aside when the user accepts the good rows), survey days, overlap
 * warnings, audit → the original is renamed into place as the last step before commit.
 * Any failure rolls the transaction back and removes the file: the log lands whole or not at all.
 */
import { randomUUID } from "node:crypto";
import type { Readable } from "node:stream";
import type { Knex } from "knex";
import { createLogStreamParser, delimiterName, LogFormatError, type Delimiter, type LogReadings, type LogParseSummary } from "@/src/core/logs";
import { createZoneOffsetLookup } from "@/src/core/time";
import { recordAudit } from "../audit/record";
import type { Actor } from "../auth/actor";
import { assertSurveyPermission } from "../authz/permissions";
import { getDb } from "../db/client";
import { openReadingsWriter, serializeOn } from "../db/engine";
import { parseInput } from "../errors";
import { commitStaged, discardStaged, newStorageKey, openStaged, removeStored, stageUpload, type StagedFile } from "../storage/original-files";
import { nowIso } from "../time";
import { LogImportRefusedError, type ProblemRow } from "./errors";
import { headerSignature, previewHead } from "./header-signature";
import { findProfileForHeader, saveProfileInTransaction } from "./profiles";
import { DELIMITER_BY_NAME, LogUploadOptionsSchema, type LogUploadOptions } from "./schema";
import { logUrl } from "./urls";

const MS_PER_DAY = 86_400_000;
const PROGRESS_EVERY_ROWS = 50_000;

export interface ImportedLogSummary {
  id: number;
  url: string;
  kind: "base" | "rover";
  originalName: string;
  sha256: string;
  sizeBytes: number;
  rowCount: number;
  readingCount: number;
  rejectedCount: number;
  issueCount: number;
  firstTimeMs: number | null;
  lastTimeMs: number | null;
  days: string[];
}

export interface LogImportResult {
  status: "imported";
  log: ImportedLogSummary;
  delimiter: string;
  mapping: Record<string, string>;
  profile: { id: string; name: string; applied: boolean; saved: boolean } | null;
  warnings: string[];
  overlaps: { id: number; originalName: string; url: string }[];
  /** Rows refused or flagged, kept with the log (at most the first 10 000 of each kind). */
  problems: ProblemRow[];
}

export interface ImportControls {
  /** Abort the import (e.g. the client went away); everything is rolled back. */
  signal?: AbortSignal;
  /** Called every 50 000 rows with the data rows read so far. */
  onProgress?: (rowsRead: number) => void;
}

/** Throws NotFoundError / ForbiddenError before any byte of an upload is read. */
export async function assertCanUploadLogs(actor: Actor, surveyId: string): Promise<void> {
  await assertSurveyPermission(actor, surveyId, "logs.upload");
}

/** Stages a byte stream (hash, size limit, temp file) and imports it; the temp file never outlives the call. */
export async function importLogStream(
  actor: Actor,
  surveyId: string,
  source: Readable | AsyncIterable<Uint8Array>,
  fields: unknown,
  controls: ImportControls = {},
): Promise<LogImportResult> {
  await assertCanUploadLogs(actor, surveyId);
  parseFields(fields); // bad options are refused before any byte is read
  const staged = await stageUpload(source);
  return importStagedLog(actor, surveyId, staged, fields, controls);
}

function parseFields(fields: unknown): LogUploadOptions & { fileName: string } {
  const record = (fields ?? {}) as Record<string, unknown>;
  const options = parseInput(LogUploadOptionsSchema, record);
  const rawName = typeof record.fileName === "string" ? record.fileName : "";
  // Only for display and the download name: never part of a path.
  const fileName = rawName.replace(/[\u0000-\u001f\u007f/\\]/g, "_").trim().slice(0, 200) || "upload.txt";
  return { ...options, fileName };
}

/**
 * Imports a staged file. `fields` are the upload options (unknown, zod-parsed) plus `fileName`.
 * The staged temp file is always consumed: moved into place on success, removed otherwise.
 */
export async function importStagedLog(
  actor: Actor,
  surveyId: string,
  staged: StagedFile,
  fields: unknown,
  controls: ImportControls = {},
): Promise<LogImportResult> {
  let storageKey: string | null = null;
  let fileStoring = false;
  try {
    await assertCanUploadLogs(actor, surveyId);
    const options = parseFields(fields);
    checkBytes(staged, options.fileName);
    const key = newStorageKey();
    storageKey = key;
    const result = await getDb().transaction(async (trx) => {
      const outcome = await importInTransaction(trx, actor, surveyId, staged, options, controls, key);
      fileStoring = true;
      await commitStaged(staged, key); // last step: the file is stored only if everything before it held
      return outcome;
    });
    return result;
  } catch (err) {
    // the store or the commit itself failed: no row names the key, so its object goes (a failed
    // removal is left to the boot-time orphan sweep rather than hiding the import's own error)
    if (fileStoring && storageKey) await removeStored(storageKey).catch(() => undefined);
    throw err;
  } finally {
    discardStaged(staged);
  }
}

function checkBytes(staged: StagedFile, fileName: string): void {
  if (staged.sizeBytes === 0) {
    throw new LogImportRefusedError(`“${fileName}” is empty (0 bytes): there is nothing to import.`, { reason: "empty", fileName });
  }
  if (staged.looksBinary) {
    throw new LogImportRefusedError(
      `“${fileName}” is not a text log (it contains binary data). Export the instrument's log as CSV or plain text and upload that.`,
      { reason: "binary", fileName },
    );
  }
}

type Options = LogUploadOptions & { fileName: string };

interface SurveyRow {
  id: string;
  time_zone: string;
  archived_at: string | null;
}

async function importInTransaction(
  trx: Knex.Transaction,
  actor: Actor,
  surveyId: string,
  staged: StagedFile,
  options: Options,
  controls: ImportControls,
  storageKey: string,
): Promise<LogImportResult> {
  await assertSurveyPermission(actor, surveyId, "logs.upload", trx);
  await serializeOn(trx, `log-sha256:${surveyId}:${staged.sha256}`); // the same file sent twice at once: the second sees the first
  const survey = (await trx<SurveyRow>("surveys").where({ id: surveyId }).first())!;
  if (survey.archived_at) {
    throw new LogImportRefusedError("This survey is archived: restore it before adding logs.", { reason: "archived", fileName: options.fileName });
  }
  const existing = await trx("field_logs").select("id", "original_name").where({ survey_id: surveyId, sha256: staged.sha256 }).first();
  if (existing) {
    const url = logUrl(surveyId, existing.id);
    throw new LogImportRefusedError(`This file is already in the survey as “${existing.original_name}” (same SHA-256). Nothing was imported.`, {
      reason: "duplicate",
      fileName: options.fileName,
      existingLog: { id: existing.id, originalName: existing.original_name, url },
    });
  }

  // Header → matching profile (only when the user gave no mapping of their own).
  const headText = new TextDecoder(staged.utf8 ? "utf-8" : "windows-1252").decode(staged.head);
  const forcedDelimiter: Delimiter | undefined = options.delimiter ? DELIMITER_BY_NAME[options.delimiter] : undefined;
  const preview = previewHead(headText.includes("\n") ? headText : headText + "\n", { delimiter: forcedDelimiter, maxRows: 0 });
  const signature = preview ? headerSignature(preview.header) : null;
  let profile: LogImportResult["profile"] = null;
  let mapping = options.mapping;
  let delimiter = forcedDelimiter;
  if (!mapping && signature) {
    const found = await findProfileForHeader(trx, surveyId, signature);
    if (found) {
      mapping = found.mapping;
      delimiter ??= found.delimiter ?? undefined;
      profile = { id: found.id, name: found.name, applied: true, saved: false };
    }
  }

  const now = nowIso();
  const [{ id: logId }] = (await trx("field_logs")
    .insert({
      survey_id: surveyId,
      kind: options.kind,
      original_name: options.fileName,
      storage_key: storageKey,
      sha256: staged.sha256,
      size_bytes: staged.sizeBytes,
      instrument: options.instrument,
      sensor_type: options.sensorType,
      operator: options.operator,
      base_site_name: options.kind === "base" ? (options.baseSiteName ?? null) : null,
      base_latitude_deg: options.kind === "base" ? (options.baseLatitudeDeg ?? null) : null,
      base_longitude_deg: options.kind === "base" ? (options.baseLongitudeDeg ?? null) : null,
      base_height_m: options.kind === "base" ? (options.baseHeightM ?? null) : null,
      time_basis: options.timeBasis,
      clock_offset_s: options.clockOffsetS,
      delimiter: "",
      header: "[]",
      mapping: "{}",
      profile_id: profile?.id ?? null,
      row_count: 0,
      reading_count: 0,
      rejected_count: 0,
      issue_count: 0,
      uploaded_by: actor.userId,
      uploaded_at: now,
    })
    .returning("id")) as { id: number }[];

  const parsed = await parseIntoTable(trx, logId, staged, options, survey.time_zone, { mapping, delimiter }, controls);
  const { summary, days } = parsed;
  const problems = problemRows(summary);

  if (summary.rowCount === 0) {
    throw new LogImportRefusedError(`“${options.fileName}” has a header row but no readings.`, { reason: "header_only", fileName: options.fileName, rowCount: 0 });
  }
  if (summary.acceptedCount === 0) {
    throw new LogImportRefusedError(`None of the ${summary.rowCount} rows of “${options.fileName}” could be read.`, {
      reason: "no_good_rows",
      fileName: options.fileName,
      rowCount: summary.rowCount,
      rejectedCount: summary.rejectedCount,
      issueCount: summary.issueCount,
      problems,
    });
  }
  if ((summary.rejectedCount > 0 || summary.issueCount > 0) && !options.acceptGoodRows) {
    const parts = [
      summary.rejectedCount > 0 ? `${summary.rejectedCount} bad ${summary.rejectedCount === 1 ? "row" : "rows"}` : null,
      summary.issueCount > 0 ? `${summary.issueCount} ${summary.issueCount === 1 ? "row" : "rows"} with times going backwards or repeated` : null,
    ].filter(Boolean);
    throw new LogImportRefusedError(
      `“${options.fileName}” has ${parts.join(" and ")} of ${summary.rowCount}. Nothing was imported. Fix the file, or import the good rows and keep the others listed with the log.`,
      {
        reason: "bad_rows",
        fileName: options.fileName,
        rowCount: summary.rowCount,
        rejectedCount: summary.rejectedCount,
        issueCount: summary.issueCount,
        problems,
      },
    );
  }

  await insertProblems(trx, logId, problems);
  const dayRows = [...days.entries()].sort((a, b) => a[0] - b[0]);
  const dayLabels = dayRows.map(([d]) => new Date(d * MS_PER_DAY).toISOString().slice(0, 10));
  if (dayRows.length > 0) {
    await trx("log_days").insert(
      dayRows.map(([, agg], i) => ({
        log_id: logId,
        survey_id: surveyId,
        day: dayLabels[i],
        reading_count: agg.count,
        first_time_ms: agg.first,
        last_time_ms: agg.last,
      })),
    );
  }
  const warnings = [...summary.warnings];
  if (!staged.utf8) warnings.push("the file is not UTF-8: it was read as Windows-1252 (Western European)");
  const overlaps = await overlappingLogs(trx, surveyId, logId, options.instrument, parsed.firstMs, parsed.lastMs);
  for (const o of overlaps) {
    warnings.push(`overlaps in time with “${o.originalName}” from the same instrument ${options.instrument}: check that this is not the same data twice`);
  }

  const usedMapping = Object.fromEntries(Object.entries(summary.mapping.names).filter(([, v]) => v !== undefined)) as Record<string, string>;
  await trx("field_logs")
    .where({ id: logId })
    .update({
      delimiter: delimiterName(summary.delimiter),
      header: JSON.stringify(summary.header),
      mapping: JSON.stringify(usedMapping),
      row_count: summary.rowCount,
      reading_count: parsed.stored,
      rejected_count: summary.rejectedCount,
      issue_count: summary.issueCount,
      first_time_ms: Number.isFinite(parsed.firstMs) ? parsed.firstMs : null,
      last_time_ms: Number.isFinite(parsed.lastMs) ? parsed.lastMs : null,
      warnings: JSON.stringify(warnings),
    });

  if (options.saveProfileAs) {
    const saved = await saveProfileInTransaction(trx, actor, surveyId, {
      name: options.saveProfileAs,
      headerSignature: headerSignature(summary.header),
      delimiter: options.delimiter ? summary.delimiter : null,
      mapping: usedMapping,
    });
    profile = { id: saved.id, name: saved.name, applied: profile?.applied ?? false, saved: true };
    await trx("field_logs").where({ id: logId }).update({ profile_id: saved.id });
  }

  await recordAudit(trx, {
    surveyId,
    actorUserId: actor.userId,
    action: "log.import",
    details: { logId, kind: options.kind, file: options.fileName, sha256: staged.sha256, readings: parsed.stored, rejected: summary.rejectedCount, issues: summary.issueCount },
  });

  return {
    status: "imported",
    log: {
      id: logId,
      url: logUrl(surveyId, logId),
      kind: options.kind,
      originalName: options.fileName,
      sha256: staged.sha256,
      sizeBytes: staged.sizeBytes,
      rowCount: summary.rowCount,
      readingCount: parsed.stored,
      rejectedCount: summary.rejectedCount,
      issueCount: summary.issueCount,
      firstTimeMs: Number.isFinite(parsed.firstMs) ? parsed.firstMs : null,
      lastTimeMs: Number.isFinite(parsed.lastMs) ? parsed.lastMs : null,
      days: dayLabels,
    },
    delimiter: delimiterName(summary.delimiter),
    mapping: usedMapping,
    profile,
    warnings,
    overlaps,
    problems,
  };
}

type DayAggregate = { count: number; first: number; last: number };

const num = (v: number) => (v === v ? v : null);

/** Streams the staged file through the parser; each parsed chunk goes straight into log_readings. */
async function parseIntoTable(
  trx: Knex.Transaction,
  logId: number,
  staged: StagedFile,
  options: Options,
  surveyTimeZone: string,
  format: { mapping: Record<string, string> | undefined; delimiter: Delimiter | undefined },
  controls: ImportControls,
): Promise<{ summary: LogParseSummary; days: Map<number, DayAggregate>; stored: number; firstMs: number; lastMs: number }> {
  // The engine's bulk path inside this transaction (prepared inserts on SQLite, COPY on PostgreSQL).
  const writer = await openReadingsWriter(trx, logId);
  const offsetAt = createZoneOffsetLookup(surveyTimeZone);
  const days = new Map<number, DayAggregate>();
  let stored = 0;
  let firstMs = Infinity;
  let lastMs = -Infinity;
  let lastDay = NaN;
  let lastAgg: DayAggregate | null = null;

  const onBatch = (b: LogReadings) => {
    const { timeMs, fieldNt, latDeg, lonDeg, heightM, line, station, sourceLine } = b;
    for (let i = 0; i < b.count; i++) {
      const t = timeMs[i];
      const day = Math.floor((t + offsetAt(t)) / MS_PER_DAY);
      writer.add(
        t,
        fieldNt[i],
        latDeg ? num(latDeg[i]) : null,
        lonDeg ? num(lonDeg[i]) : null,
        heightM ? num(heightM[i]) : null,
        line ? line[i] || null : null,
        station ? station[i] || null : null,
        sourceLine[i],
        day,
      );
      if (day !== lastDay) {
        lastDay = day;
        lastAgg = days.get(day) ?? null;
        if (!lastAgg) {
          lastAgg = { count: 0, first: t, last: t };
          days.set(day, lastAgg);
        }
      }
      const agg = lastAgg!;
      agg.count++;
      if (t < agg.first) agg.first = t;
      if (t > agg.last) agg.last = t;
      if (t < firstMs) firstMs = t;
      if (t > lastMs) lastMs = t;
    }
    stored += b.count;
  };

  let parser;
  try {
    parser = createLogStreamParser(
      {
        mapping: format.mapping,
        delimiter: format.delimiter,
        timeZone: options.timeBasis === "local" ? surveyTimeZone : "UTC",
        timeBasis: options.timeBasis === "gps" ? "gps" : "utc",
        clockOffsetS: options.clockOffsetS,
      },
      { onBatch },
    );
  } catch (err) {
    await writer.abort(err as Error);
    if (err instanceof RangeError) throw unreadable(options.fileName, err.message);
    throw err;
  }
  // UTF-8 goes to the parser as bytes (it reads numbers and times from them); anything else is decoded first.
  const decoder = staged.utf8 ? null : new TextDecoder("windows-1252");
  let nextProgress = PROGRESS_EVERY_ROWS;
  let readSoFar = 0;
  try {
    for await (const chunk of openStaged(staged)) {
      controls.signal?.throwIfAborted();
      parser.push(decoder ? decoder.decode(chunk as Buffer, { stream: true }) : (chunk as Buffer));
      await writer.flush();
      readSoFar = stored;
      if (controls.onProgress && readSoFar >= nextProgress) {
        controls.onProgress(readSoFar);
        nextProgress = readSoFar + PROGRESS_EVERY_ROWS;
      }
    }
    if (decoder) parser.push(decoder.decode());
    controls.signal?.throwIfAborted();
    const summary = parser.end();
    await writer.finish();
    return { summary, days, stored, firstMs, lastMs };
  } catch (err) {
    await writer.abort(err as Error);
    if (err instanceof LogFormatError) throw unreadable(options.fileName, explainFormatError(err.message, headHint(staged)));
    throw err;
  }
}

function headHint(staged: StagedFile): string {
  return new TextDecoder("utf-8").decode(staged.head.subarray(0, 400)).split("\n")[0] ?? "";
}

/** Adds a hint when the header holds one cell that another delimiter would split. */
function explainFormatError(message: string, headerLine: string): string {
  const counts: [string, number][] = [
    ["semicolons", (headerLine.match(/;/g) ?? []).length],
    ["tabs", (headerLine.match(/\t/g) ?? []).length],
    ["commas", (headerLine.match(/,/g) ?? []).length],
    ["pipes", (headerLine.match(/\|/g) ?? []).length],
  ];
  const best = counts.sort((a, b) => b[1] - a[1])[0];
  if (best[1] > 0 && /found "[^"]*"$/.test(message) && !message.includes('", "')) {
    return `${message}. The header seems to be separated by ${best[0]}: choose that delimiter (or leave it on automatic).`;
  }
  return message;
}

function unreadable(fileName: string, message: string): LogImportRefusedError {
  return new LogImportRefusedError(`“${fileName}” cannot be read as a log: ${message}.`.replace(/\.\.$/, "."), { reason: "unreadable", fileName });
}

function problemRows(summary: LogParseSummary): ProblemRow[] {
  const rows: ProblemRow[] = [
    ...summary.rejected.map((p) => ({ kind: "rejected" as const, line: p.line, column: p.column, value: p.value, reason: p.reason, message: p.message })),
    ...summary.issues.map((p) => ({ kind: "issue" as const, line: p.line, column: p.column, value: p.value, reason: p.reason, message: p.message })),
  ];
  return rows.sort((a, b) => a.line - b.line);
}

async function insertProblems(trx: Knex.Transaction, logId: number, problems: ProblemRow[]): Promise<void> {
  const rows = problems.map((p) => ({ log_id: logId, kind: p.kind, line: p.line, column_name: p.column, value: p.value, reason: p.reason, message: p.message }));
  for (let i = 0; i < rows.length; i += 100) await trx("log_problems").insert(rows.slice(i, i + 100));
}

async function overlappingLogs(
  trx: Knex.Transaction,
  surveyId: string,
  logId: number,
  instrument: string,
  firstMs: number,
  lastMs: number,
): Promise<{ id: number; originalName: string; url: string }[]> {
  if (!instrument || !Number.isFinite(firstMs)) return [];
  const rows = await trx("field_logs")
    .select("id", "original_name")
    .where({ survey_id: surveyId, instrument })
    .whereNot({ id: logId })
    .where("first_time_ms", "<=", lastMs)
    .where("last_time_ms", ">=", firstMs)
    .orderBy("id");
  return rows.map((r: { id: number; original_name: string }) => ({ id: r.id, originalName: r.original_name, url: logUrl(surveyId, r.id) }));
}
