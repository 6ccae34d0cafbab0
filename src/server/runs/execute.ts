import "server-only";
/**
 * Executes one correction run: loads the paired logs, builds the base series (with fallback or
 * looping), corrects the rover readings with the core in chunks, yielding to the event loop
 * between chunks (setImmediate) so the server keeps answering, and stores the progress in the
 * run row. The results and the "done" status are written in one transaction: a run is whole or
 * it is failed.
 */
import type { Knex } from "knex";
import {
  createCorrector,
  createReferenceEvaluator,
  duplicateTimeMarks,
  sliceRoverReadings,
  loopBaseFromStation,
  mergeFallbackBase,
  prepareBaseSeries,
  type BasePosition,
  type BaseSeries,
  type CorrectionOptions,
  type ReferenceFieldEvaluator,
} from "@/src/core/correction";
import type { LogReadings } from "@/src/core/logs";
import { median } from "@/src/core/series";
import { loadReferenceModel } from "@/src/lib/reference-model";
import { concatReadings, loadLogReadings } from "../days/readings-store";
import { nowIso } from "../time";
import { codeStrings, COLUMN_DTYPES, encodeColumn, type RunColumns, type RunDictionaries } from "./run-columns";
import type { RunParameters } from "./parameters";

/** Readings corrected between two yields to the event loop. */
export const CHUNK_READINGS = 20_000;

const yieldToEventLoop = () => new Promise<void>((resolve) => setImmediate(resolve));

/** A failure the user can act on; its message is stored with the run. */
export class RunInputError extends Error {}

export interface ExecutionOutcome {
  columns: RunColumns;
  dictionaries: RunDictionaries;
  summary: Record<string, unknown>;
}

function basePositionOf(p: RunParameters, baseReadings: LogReadings | null): BasePosition | null {
  if (p.basePosition) return p.basePosition;
  if (baseReadings && baseReadings.latDeg && baseReadings.lonDeg) {
    const latDeg = median(baseReadings.latDeg);
    const lonDeg = median(baseReadings.lonDeg);
    if (Number.isFinite(latDeg) && Number.isFinite(lonDeg)) {
      const h = baseReadings.heightM ? median(baseReadings.heightM) : NaN;
      return { latDeg, lonDeg, heightM: Number.isFinite(h) ? h : 0 };
    }
  }
  return null;
}

/** Runs the correction of `p` (no database writes except progress through `onProgress`). */
export async function computeRun(db: Knex, p: RunParameters, onProgress: (fraction: number) => Promise<void>): Promise<ExecutionOutcome> {
  const parts: LogReadings[] = [];
  for (const id of p.pairing.roverLogIds) parts.push(await loadLogReadings(db, id, p.day));
  const rover = concatReadings(parts);
  if (rover.count === 0) throw new RunInputError("The day has no rover readings to correct.");

  let base: BaseSeries;
  let baseReadings: LogReadings | null = null;
  let occupations: Uint32Array | null = null;
  const facts: Record<string, unknown> = {};
  if (p.pairing.method === "base") {
    baseReadings = await loadLogReadings(db, p.pairing.baseLogId!);
    const primary = prepareBaseSeries(baseReadings.timeMs, baseReadings.fieldNt);
    facts.baseSampleCount = primary.timeMs.length;
    facts.baseDuplicatesMerged = primary.duplicateSamplesMerged;
    base = primary;
    if (p.pairing.fallbackBaseLogId) {
      const fb = await loadLogReadings(db, p.pairing.fallbackBaseLogId);
      const merged = mergeFallbackBase(primary, prepareBaseSeries(fb.timeMs, fb.fieldNt), p.maxGapS);
      base = merged.base;
      facts.fallback = { levelShiftNt: merged.levelShiftNt, shiftFrom: merged.shiftFrom, samplesUsed: merged.fallbackSampleCount };
    }
  } else {
    if (!rover.station) throw new RunInputError(`Looping needs a station column in the rover log (station id “${p.pairing.loopStation}”).`);
    const loop = loopBaseFromStation(rover.timeMs, rover.fieldNt, rover.station, p.pairing.loopStation);
    if (loop.base.timeMs.length < 2) {
      throw new RunInputError(`Looping needs at least two rover readings at station “${p.pairing.loopStation}”; found ${loop.base.timeMs.length}.`);
    }
    base = loop.base;
    occupations = loop.occupationIndices;
    facts.loopOccupations = loop.occupationIndices.length;
  }

  const basePosition = basePositionOf(p, baseReadings);
  let reference: ReferenceFieldEvaluator | null = null;
  if (p.referenceModel) {
    const model = loadReferenceModel(p.referenceModel);
    reference = createReferenceEvaluator(model, rover, { baseTimeMs: base.timeMs, basePosition });
    facts.model = { name: model.name, version: model.version };
  }
  const options: CorrectionOptions = {
    datum: p.datum,
    method: p.method,
    maxGapS: p.pairing.method === "loop" ? Infinity : p.maxGapS,
    instrumentOffsetNt: p.instrumentOffsetNt,
    basePosition,
    baseOccupations: occupations,
  };
  let corrector;
  try {
    corrector = createCorrector(base, reference, options);
  } catch (err) {
    if (err instanceof RangeError) throw new RunInputError(err.message);
    throw err;
  }
  const n = rover.count;
  const marks = duplicateTimeMarks(rover.timeMs, n);
  const out = {
    baseNt: new Float64Array(n), diurnalNt: new Float64Array(n), correctedNt: new Float64Array(n),
    referenceNt: new Float64Array(n), residualNt: new Float64Array(n), flags: new Uint8Array(n),
  };
  for (let start = 0; start < n; start += CHUNK_READINGS) {
    const end = Math.min(n, start + CHUNK_READINGS);
    const batch = corrector.correctBatch(sliceRoverReadings(rover, start, end), marks.subarray(start, end));
    out.baseNt.set(batch.baseNt, start);
    out.diurnalNt.set(batch.diurnalNt, start);
    out.correctedNt.set(batch.correctedNt, start);
    out.referenceNt.set(batch.referenceNt, start);
    out.residualNt.set(batch.residualNt, start);
    out.flags.set(batch.flags, start);
    await onProgress(end / n);
    await yieldToEventLoop();
  }
  const summary = corrector.summary();
  if (summary.correctedCount === 0) {
    throw new RunInputError("No rover reading could be corrected: the base record does not cover the rover's times (check time bases and clock offsets).");
  }

  const lines = codeStrings(rover.line, n);
  const stations = codeStrings(rover.station, n);
  const nanIfNull = (a: Float64Array | null) => a ?? new Float64Array(n).fill(NaN);
  const logIds = Int32Array.from(rover.logIndex, (k) => p.pairing.roverLogIds[k]);
  const columns: RunColumns = {
    count: n,
    timeMs: rover.timeMs,
    rawNt: rover.fieldNt,
    latDeg: nanIfNull(rover.latDeg),
    lonDeg: nanIfNull(rover.lonDeg),
    heightM: nanIfNull(rover.heightM),
    ...out,
    logId: logIds,
    sourceLine: Int32Array.from(rover.sourceLine),
    lineCode: lines.codes,
    stationCode: stations.codes,
  };
  const dictionaries: RunDictionaries = {
    lines: lines.dictionary,
    stations: stations.dictionary,
    hasPosition: rover.latDeg !== null,
    hasHeight: rover.heightM !== null,
    hasLine: rover.line !== null,
    hasStation: rover.station !== null,
  };
  return {
    columns,
    dictionaries,
    summary: { ...summary, datumNt: summary.datumNt, basePosition, baseSampleCountUsed: base.timeMs.length, ...facts },
  };
}

/** Writes the outcome and marks the run done, in one transaction. */
export async function storeRunOutcome(db: Knex, runId: number, outcome: ExecutionOutcome): Promise<void> {
  await db.transaction(async (trx) => {
    for (const [name, dtype] of Object.entries(COLUMN_DTYPES)) {
      const data = outcome.columns[name as keyof typeof COLUMN_DTYPES];
      await trx("correction_run_columns").insert({ run_id: runId, name, dtype, data: encodeColumn(data) });
    }
    await trx("correction_runs")
      .where({ id: runId })
      .update({
        status: "done",
        progress: 1,
        reading_count: outcome.columns.count,
        summary: JSON.stringify({ ...outcome.summary, dictionaries: outcome.dictionaries }),
        finished_at: nowIso(),
      });
  });
}
