import "server-only";
/**
 * Chart data of a day, thinned on the server (LTTB, ≤ maxPoints per series, default 2 000) with
 * gaps as null breaks; the full data stays in the run for export.
 *   kind=base       drift curve of the day's base log, QA windows that break thresholds, datum
 *   kind=rover      raw rover field (per line with `line`, else the whole day)
 *   kind=corrected  a finished run: per line raw/corrected/residual against time and distance;
 *                   without `line`, the plan view (positions coloured by residual) and a histogram
 */
import "@/src/lib/zod-jitless";
import { z } from "zod";
import { mergeFallbackBase, prepareBaseSeries } from "@/src/core/correction";
import { computeBaseQa, type QaWindow } from "@/src/core/qa";
import { coreSettingsFor } from "../qa-assessment/thresholds";
import { readQaThresholds } from "../qa-assessment/thresholds-service";
import { median, mean } from "@/src/core/series";
import { lttbIndices } from "@/src/core/series/lttb";
import type { Actor } from "../auth/actor";
import { assertSurveyPermission } from "../authz/permissions";
import { getDb } from "../db/client";
import { NotFoundError, parseInput } from "../errors";
import { readSettings } from "../processing/service";
import { getRunResult, latestDoneRun, type RunRecord } from "../runs/service";
import type { RunColumns, RunDictionaries } from "../runs/run-columns";
import { concatReadings, loadLogReadings } from "./readings-store";
import { distanceAlongM } from "./line-distance";
import { parseDay, resolvePairing } from "./service";
import { thinWithBreaks } from "./thin-series";

export const DEFAULT_MAX_POINTS = 2000;

export const SeriesQuerySchema = z.object({
  kind: z.enum(["base", "rover", "corrected"], { message: "kind must be base, rover or corrected." }),
  line: z.preprocess((v) => (v === "" || v === null ? undefined : v), z.string().max(80).optional()),
  maxPoints: z.preprocess((v) => (v === "" || v === null ? undefined : v), z.coerce.number().int().min(10, "At least 10.").max(10_000, "At most 10 000.").default(DEFAULT_MAX_POINTS)),
  run: z.preprocess((v) => (v === "" || v === null ? undefined : v), z.coerce.number().int().min(1).optional()),
});

export interface LineInfo {
  line: string;
  count: number;
  firstMs: number;
  lastMs: number;
}

export type BaseSeriesResponse = {
  kind: "base";
  day: string;
  log: { id: number; originalName: string } | null;
  t: number[];
  fieldNt: (number | null)[];
  totalCount: number;
  datum: { valueNt: number | null; source: string };
  /**
   * The second base that fills the first one's gaps, drawn as the correction uses it: shifted by
   * the level difference between the two sites (see mergeFallbackBase). Null with one base.
   */
  fallback: {
    log: { id: number; originalName: string };
    t: number[];
    fieldNt: (number | null)[];
    totalCount: number;
    levelShiftNt: number;
    shiftFrom: "simultaneous" | "medians";
    samplesUsed: number;
  } | null;
  windows: QaWindow[];
  qa: {
    samplingIntervalS: number;
    rangeNt: number;
    longestGapS: number;
    gapThresholdS: number;
    maxChordDeviationNt: number;
    chordWindowS: number;
    chordThresholdNt: number;
    maxChangeNt: number;
    noiseRmsNt: number;
    spikeCount: number;
    verdict: { level: string; reasons: string[] };
  } | null;
  notes: string[];
};

export type RoverSeriesResponse = {
  kind: "rover";
  day: string;
  line: string | null;
  lines: LineInfo[];
  t: number[];
  distanceM: (number | null)[];
  rawNt: (number | null)[];
  totalCount: number;
};

export type CorrectedSeriesResponse = {
  kind: "corrected";
  day: string;
  run: { number: number; status: string; datumNt: number | null; modelName: string | null } | null;
  line: string | null;
  lines: LineInfo[];
  /** Per line (with `line`): rows against time; distance per row. */
  profile: { t: number[]; distanceM: (number | null)[]; rawNt: (number | null)[]; correctedNt: (number | null)[]; residualNt: (number | null)[]; totalCount: number } | null;
  /** Without `line`: thinned positions coloured by residual (or corrected when there is no residual). */
  plan: { latDeg: number[]; lonDeg: number[]; valueNt: number[]; value: "residual" | "corrected"; totalCount: number; withPosition: number } | null;
  histogram: { value: "residual" | "corrected"; edgesNt: number[]; counts: number[]; below: number; above: number; p2Nt: number; p98Nt: number; medianNt: number } | null;
};

export type DaySeriesResponse = BaseSeriesResponse | RoverSeriesResponse | CorrectedSeriesResponse;

type QaCacheEntry = {
  key: string;
  value: { t: number[]; fieldNt: (number | null)[]; totalCount: number; windows: QaWindow[]; qa: BaseSeriesResponse["qa"]; medianNt: number; meanNt: number; fallback: BaseSeriesResponse["fallback"] };
};
const qaCache: QaCacheEntry[] = [];

export async function getDaySeries(actor: Actor, surveyId: string, dayInput: unknown, query: unknown): Promise<DaySeriesResponse> {
  await assertSurveyPermission(actor, surveyId, "days.read");
  const day = parseDay(dayInput);
  const q = parseInput(SeriesQuerySchema, query);
  if (q.kind === "base") return baseSeries(actor, surveyId, day, q.maxPoints);
  if (q.kind === "rover") return roverSeries(surveyId, day, q.line ?? null, q.maxPoints);
  return correctedSeries(actor, surveyId, day, q.line ?? null, q.maxPoints, q.run);
}

async function baseSeries(actor: Actor, surveyId: string, day: string, maxPoints: number): Promise<BaseSeriesResponse> {
  const db = getDb();
  const { settings } = await readSettings(db, surveyId);
  const pairing = await resolvePairing(db, surveyId, day, settings);
  const log = pairing.baseLog;
  const latest = await latestDoneRun(actor, surveyId, day);
  if (!log) {
    return { kind: "base", day, log: null, t: [], fieldNt: [], totalCount: 0, datum: { valueNt: null, source: "no base log" }, fallback: null, windows: [], qa: null, notes: pairing.notes };
  }
  // The shaded windows follow the survey's own QA thresholds, as the day's verdict does.
  const thresholds = await readQaThresholds(db, surveyId);
  const fallbackLog = pairing.fallbackBaseLog;
  const key = `${log.id}:${fallbackLog?.id ?? "-"}:${settings.maxBaseGapS}:${day}:${maxPoints}:t${thresholds.revision}`;
  let entry = qaCache.find((c) => c.key === key)?.value;
  if (!entry) {
    const readings = await loadLogReadings(db, log.id, day);
    const base = prepareBaseSeries(readings.timeMs, readings.fieldNt);
    const qa = base.timeMs.length >= 5 ? computeBaseQa(base.timeMs, base.fieldNt, coreSettingsFor(thresholds.thresholds, null)) : null;
    const gapS = qa ? qa.gaps.thresholdS : Infinity;
    const thinned = thinWithBreaks(base.timeMs, [base.fieldNt], maxPoints, (i) => (base.timeMs[i] - base.timeMs[i - 1]) / 1000 > gapS, 2);
    let fallback: BaseSeriesResponse["fallback"] = null;
    if (fallbackLog) {
      const fr = await loadLogReadings(db, fallbackLog.id, day);
      const fb = prepareBaseSeries(fr.timeMs, fr.fieldNt);
      const merged = mergeFallbackBase(base, fb, settings.maxBaseGapS);
      const shifted = fb.fieldNt.map((v) => v + merged.levelShiftNt);
      const ft = thinWithBreaks(fb.timeMs, [shifted], maxPoints, (i) => (fb.timeMs[i] - fb.timeMs[i - 1]) / 1000 > gapS, 2);
      fallback = {
        log: { id: fallbackLog.id, originalName: fallbackLog.originalName },
        t: ft.x,
        fieldNt: ft.ys[0],
        totalCount: fb.timeMs.length,
        levelShiftNt: merged.levelShiftNt,
        shiftFrom: merged.shiftFrom,
        samplesUsed: merged.fallbackSampleCount,
      };
    }
    entry = {
      t: thinned.x,
      fieldNt: thinned.ys[0],
      totalCount: base.timeMs.length,
      windows: qa ? qa.windows : [],
      qa: qa
        ? {
            samplingIntervalS: qa.samplingIntervalS,
            rangeNt: qa.rangeNt.rangeNt,
            longestGapS: qa.gaps.longestS,
            gapThresholdS: qa.gaps.thresholdS,
            maxChordDeviationNt: qa.chord.maxDeviationNt,
            chordWindowS: qa.chord.windowS,
            chordThresholdNt: qa.chord.thresholdNt,
            maxChangeNt: qa.change.maxChangeNt,
            noiseRmsNt: qa.noise.rmsNt,
            spikeCount: qa.spikes.count,
            verdict: { level: qa.verdict.level, reasons: qa.verdict.reasons.map((r) => r.text) },
          }
        : null,
      medianNt: median(base.fieldNt),
      meanNt: mean(base.fieldNt),
      fallback,
    };
    qaCache.push({ key, value: entry });
    if (qaCache.length > 8) qaCache.shift();
  }
  let datum: BaseSeriesResponse["datum"];
  const runDatum = latest?.summary?.datumNt;
  if (latest) datum = { valueNt: typeof runDatum === "number" ? runDatum : null, source: `run ${latest.number}` };
  else if (settings.datumKind === "value") datum = { valueNt: settings.datumValueNt, source: "settings (fixed value)" };
  else if (settings.datumKind === "median") datum = { valueNt: entry.medianNt, source: "settings (median of the day's base)" };
  else if (settings.datumKind === "mean") datum = { valueNt: entry.meanNt, source: "settings (mean of the day's base)" };
  else datum = { valueNt: null, source: "reference field at the base (varies with time)" };
  return {
    kind: "base",
    day,
    log: { id: log.id, originalName: log.originalName },
    t: entry.t,
    fieldNt: entry.fieldNt,
    totalCount: entry.totalCount,
    datum,
    fallback: entry.fallback,
    windows: entry.windows,
    qa: entry.qa,
    notes: pairing.notes,
  };
}

function linesOf(timeMs: ArrayLike<number>, lineOf: (i: number) => string, n: number): LineInfo[] {
  const map = new Map<string, LineInfo>();
  for (let i = 0; i < n; i++) {
    const l = lineOf(i);
    const info = map.get(l);
    if (!info) map.set(l, { line: l, count: 1, firstMs: timeMs[i], lastMs: timeMs[i] });
    else {
      info.count++;
      if (timeMs[i] < info.firstMs) info.firstMs = timeMs[i];
      if (timeMs[i] > info.lastMs) info.lastMs = timeMs[i];
    }
  }
  return [...map.values()].sort((a, b) => a.firstMs - b.firstMs);
}

/** Time gap that breaks a profile: 10 × the median spacing, at least 10 s. */
function profileGap(timeMs: ArrayLike<number>): (i: number) => boolean {
  const n = timeMs.length;
  const d = new Float64Array(Math.max(0, n - 1));
  for (let i = 1; i < n; i++) d[i - 1] = timeMs[i] - timeMs[i - 1];
  const limit = Math.max(10_000, 10 * (n > 1 ? median(d) : 0));
  return (i) => timeMs[i] - timeMs[i - 1] > limit;
}

function pick(a: ArrayLike<number>, idx: number[]): Float64Array {
  const out = new Float64Array(idx.length);
  for (let k = 0; k < idx.length; k++) out[k] = a[idx[k]];
  return out;
}

async function roverSeries(surveyId: string, day: string, line: string | null, maxPoints: number): Promise<RoverSeriesResponse> {
  const db = getDb();
  const pairing = await resolvePairing(db, surveyId, day);
  const parts = await Promise.all(pairing.roverLogs.map((l) => loadLogReadings(db, l.id, day)));
  const all = concatReadings(parts);
  const t = all.timeMs, f = all.fieldNt;
  const ln = all.line;
  const lines = linesOf(t, ln ? (i) => ln[i] : () => "", all.count);
  let idx: number[];
  if (line !== null) {
    if (!lines.some((l) => l.line === line)) throw new NotFoundError("No such line on this day.");
    idx = [];
    for (let i = 0; i < all.count; i++) if ((ln ? ln[i] : "") === line) idx.push(i);
  } else idx = Array.from({ length: all.count }, (_, i) => i);
  const la = all.latDeg ?? new Float64Array(all.count).fill(NaN);
  const lo = all.lonDeg ?? new Float64Array(all.count).fill(NaN);
  const ts = pick(t, idx);
  const dist = line !== null ? distanceAlongM(pick(la, idx), pick(lo, idx)) : new Float64Array(idx.length).fill(NaN);
  const thinned = thinWithBreaks(ts, [pick(f, idx), dist], maxPoints, profileGap(ts));
  return { kind: "rover", day, line, lines, t: thinned.x, distanceM: thinned.ys[1], rawNt: thinned.ys[0], totalCount: idx.length };
}

function lineIndexOf(c: RunColumns, d: RunDictionaries, line: string): number[] {
  const code = d.lines.indexOf(line);
  const out: number[] = [];
  if (code < 0) return out;
  for (let i = 0; i < c.count; i++) if (c.lineCode[i] === code) out.push(i);
  return out;
}

async function correctedSeries(actor: Actor, surveyId: string, day: string, line: string | null, maxPoints: number, runNumber?: number): Promise<CorrectedSeriesResponse> {
  let run: RunRecord | null;
  if (runNumber) run = (await getRunResult(actor, surveyId, day, runNumber)).run;
  else run = await latestDoneRun(actor, surveyId, day);
  if (!run) return { kind: "corrected", day, run: null, line, lines: [], profile: null, plan: null, histogram: null };
  const { columns: c, dictionaries: d } = await getRunResult(actor, surveyId, day, run.number);
  const lines = linesOf(c.timeMs, (i) => d.lines[c.lineCode[i]], c.count);
  const runInfo = { number: run.number, status: run.status, datumNt: (run.summary?.datumNt as number | null) ?? null, modelName: run.modelName };
  if (line !== null) {
    const idx = lineIndexOf(c, d, line);
    if (idx.length === 0) throw new NotFoundError("No such line in this run.");
    const ts = pick(c.timeMs, idx);
    const dist = distanceAlongM(pick(c.latDeg, idx), pick(c.lonDeg, idx));
    const thinned = thinWithBreaks(ts, [pick(c.correctedNt, idx), pick(c.rawNt, idx), pick(c.residualNt, idx), dist], Math.round(maxPoints * 1.5), profileGap(ts));
    return {
      kind: "corrected", day, run: runInfo, line, lines,
      profile: { t: thinned.x, correctedNt: thinned.ys[0], rawNt: thinned.ys[1], residualNt: thinned.ys[2], distanceM: thinned.ys[3], totalCount: idx.length },
      plan: null, histogram: null,
    };
  }
  // plan view: readings with a position and a value, thinned by LTTB along the walked path
  const hasResidual = c.residualNt.some((v) => v === v);
  const values = hasResidual ? c.residualNt : c.correctedNt;
  const valueKind = hasResidual ? "residual" : "corrected";
  const idx: number[] = [];
  for (let i = 0; i < c.count; i++) if (c.latDeg[i] === c.latDeg[i] && c.lonDeg[i] === c.lonDeg[i] && values[i] === values[i]) idx.push(i);
  const seq = Float64Array.from(idx, (_, k) => k);
  const kept = idx.length > maxPoints ? Array.from(lttbIndices(seq, pick(values, idx), maxPoints), (k) => idx[k]) : idx;
  const r = (v: number, dgt: number) => Math.round(v * 10 ** dgt) / 10 ** dgt;
  const plan = {
    latDeg: kept.map((i) => r(c.latDeg[i], 7)),
    lonDeg: kept.map((i) => r(c.lonDeg[i], 7)),
    valueNt: kept.map((i) => r(values[i], 2)),
    value: valueKind as "residual" | "corrected",
    totalCount: c.count,
    withPosition: idx.length,
  };
  return { kind: "corrected", day, run: runInfo, line: null, lines, profile: null, plan, histogram: histogramOf(values, valueKind) };
}

/** 40 bins between the 2nd and 98th percentiles (counts outside are reported apart), over every reading. */
function histogramOf(values: Float64Array, value: "residual" | "corrected"): CorrectedSeriesResponse["histogram"] {
  const finite = values.filter((v) => v === v).sort();
  if (finite.length === 0) return null;
  const q = (p: number) => finite[Math.min(finite.length - 1, Math.max(0, Math.round(p * (finite.length - 1))))];
  let lo = q(0.02), hi = q(0.98);
  if (!(hi > lo)) {
    lo -= 0.5;
    hi += 0.5;
  }
  const bins = 40;
  const width = (hi - lo) / bins;
  const counts = new Array<number>(bins).fill(0);
  let below = 0, above = 0;
  for (const v of finite) {
    if (v < lo) below++;
    else if (v > hi) above++;
    else counts[Math.min(bins - 1, Math.floor((v - lo) / width))]++;
  }
  const edgesNt = Array.from({ length: bins + 1 }, (_, k) => Math.round((lo + k * width) * 1000) / 1000);
  return { value, edgesNt, counts, below, above, p2Nt: lo, p98Nt: hi, medianNt: q(0.5) };
}
