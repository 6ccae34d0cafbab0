import "server-only";
/**
 * The automatic assessment of a survey day: the core QA metrics of the day's base record (the base
 * log the day's pairing uses), judged by the core verdict against the survey's thresholds, with
 * the largest Kp held for the day's hours. Result: a suggested verdict quiet / disturbed / storm
 * with its reasons, stored with a fingerprint of its inputs (base log and its hash, thresholds
 * revision, Kp). It is refreshed whenever a day is read and its inputs differ from the stored
 * fingerprint — so a base log landing, a processor choosing another base, a threshold change or a
 * new Kp value is judged the next time anyone lists or opens the day (no hook in the import).
 * Each change of the suggested verdict is an "assessed" step in the day's review history.
 */
import type { Knex } from "knex";
import { prepareBaseSeries } from "@/src/core/correction";
import { computeBaseQa, judgeDay, type VerdictLevel, type VerdictLimits, type VerdictReason } from "@/src/core/qa";
import { resolvePairing, type DaySummary } from "../days/service";
import { loadLogReadings } from "../days/readings-store";
import { kpMaxOf, readKp, type KpValue } from "../kp/service";
import { nowIso } from "../time";
import { coreSettingsFor } from "./thresholds";
import { readQaThresholds } from "./thresholds-service";

/** Fewest base readings the metrics are computed from (the fourth difference needs five). */
const MIN_BASE_READINGS = 5;

export interface DayMetrics {
  sampleCount: number;
  samplingIntervalS: number;
  rangeNt: number;
  longestGapS: number;
  gapCount: number;
  maxChangeNt: number;
  changeWindowS: number;
  maxChordDeviationNt: number;
  noiseRmsNt: number;
  spikeCount: number;
}

export interface WorstMetric {
  metric: keyof VerdictLimits;
  value: number;
  limit: number;
  /** value / limit (disturbed limit); above 1 breaks it. */
  ratio: number;
  label: string;
}

export interface DayAssessment {
  day: string;
  /** null: no base record and no Kp to judge. */
  level: VerdictLevel | null;
  reasons: VerdictReason[];
  metrics: DayMetrics | null;
  kpMax: number | null;
  worst: WorstMetric | null;
  baseLogId: number | null;
  note: string | null;
  computedAt: string;
  thresholdsRevision: number;
}

const METRIC_LABELS: Record<keyof VerdictLimits, string> = {
  dailyRangeNt: "range",
  changeNt: "change",
  chordDeviationNt: "chord",
  noiseRmsNt: "noise",
  longestGapS: "gap",
  spikeCount: "spikes",
  kp: "Kp",
};

type Row = {
  day: string; fingerprint: string; base_log_id: number | null; level: VerdictLevel | null; reasons: string; metrics: string | null;
  kp_max: number | null; computed_at: string;
};

function fromRow(r: Row): DayAssessment {
  const stored = r.metrics ? (JSON.parse(r.metrics) as { metrics: DayMetrics | null; worst: WorstMetric | null; note: string | null; revision: number }) : null;
  return {
    day: r.day, level: r.level, reasons: JSON.parse(r.reasons), metrics: stored?.metrics ?? null, kpMax: r.kp_max, worst: stored?.worst ?? null,
    baseLogId: r.base_log_id, note: stored?.note ?? null, computedAt: r.computed_at, thresholdsRevision: stored?.revision ?? 0,
  };
}

function worstOf(values: Partial<Record<keyof VerdictLimits, number>>, limits: VerdictLimits): WorstMetric | null {
  let worst: WorstMetric | null = null;
  for (const metric of Object.keys(limits) as (keyof VerdictLimits)[]) {
    const limit = limits[metric];
    const value = values[metric];
    if (limit === undefined || value === undefined || !Number.isFinite(value)) continue;
    const ratio = limit > 0 ? value / limit : value > 0 ? Infinity : 0;
    if (!worst || ratio > worst.ratio) worst = { metric, value, limit, ratio, label: METRIC_LABELS[metric] };
  }
  return worst;
}

/**
 * The day's assessment, recomputed when its inputs changed. No permission check: callers check.
 * `summary` is the day's log summary (its span selects the Kp intervals).
 */
export async function assessDay(db: Knex, surveyId: string, summary: Pick<DaySummary, "day" | "firstTimeMs" | "lastTimeMs">, kpValues?: KpValue[]): Promise<DayAssessment> {
  const day = summary.day;
  const [pairing, thresholds] = await Promise.all([resolvePairing(db, surveyId, day), readQaThresholds(db, surveyId)]);
  const kp = kpValues ?? (await readKp(db, surveyId, { fromMs: summary.firstTimeMs, toMs: summary.lastTimeMs }));
  const kpMax = kpMaxOf(kp, summary.firstTimeMs, summary.lastTimeMs);
  const log = pairing.method === "base" ? pairing.baseLog : null;
  const fingerprint = [log ? `${log.id}:${log.sha256}:${log.readingCount}` : "no-base", `t${thresholds.revision}`, `kp${kpMax ?? "-"}`].join("|");
  const stored = (await db("day_assessments").where({ survey_id: surveyId, day }).first()) as Row | undefined;
  if (stored && stored.fingerprint === fingerprint) return fromRow(stored);

  const settings = coreSettingsFor(thresholds.thresholds, kpMax);
  const limits = settings.verdictThresholds!;
  let metrics: DayMetrics | null = null;
  let note: string | null = null;
  if (log) {
    const readings = await loadLogReadings(db, log.id, day);
    const base = prepareBaseSeries(readings.timeMs, readings.fieldNt);
    if (base.timeMs.length >= MIN_BASE_READINGS) {
      const qa = computeBaseQa(base.timeMs, base.fieldNt, settings);
      metrics = {
        sampleCount: qa.sampleCount, samplingIntervalS: qa.samplingIntervalS, rangeNt: qa.rangeNt.rangeNt, longestGapS: qa.gaps.longestS, gapCount: qa.gaps.count,
        maxChangeNt: qa.change.maxChangeNt, changeWindowS: qa.change.windowS, maxChordDeviationNt: qa.chord.maxDeviationNt, noiseRmsNt: qa.noise.rmsNt, spikeCount: qa.spikes.count,
      };
    } else note = `The day's base record has ${base.timeMs.length} readings: too few to judge.`;
  } else note = pairing.method === "loop" ? "Looping day (no continuous base record): only Kp is judged." : "No base log for this day: only Kp is judged.";

  // The range is that of the survey day's record (the core's own daily ranges split at UTC midnight).
  const values = metrics
    ? { dailyRangeNt: metrics.rangeNt, changeNt: metrics.maxChangeNt, chordDeviationNt: metrics.maxChordDeviationNt, noiseRmsNt: metrics.noiseRmsNt, longestGapS: metrics.longestGapS, spikeCount: metrics.spikeCount, kp: kpMax ?? undefined }
    : { kp: kpMax ?? undefined };
  const verdict = judgeDay(
    { dailyRangeNt: NaN, changeNt: NaN, chordDeviationNt: NaN, noiseRmsNt: NaN, longestGapS: NaN, spikeCount: NaN, ...values },
    limits,
  );
  const level: VerdictLevel | null = metrics || kpMax !== null ? verdict.level : null;
  const worst = worstOf(values, limits.disturbed ?? {});
  const now = nowIso();
  const row = {
    survey_id: surveyId, day, fingerprint, base_log_id: log?.id ?? null, level, reasons: JSON.stringify(verdict.reasons),
    metrics: JSON.stringify({ metrics, worst, note, revision: thresholds.revision }), kp_max: kpMax, computed_at: now,
  };
  await db.transaction(async (trx) => {
    // Another request may have judged the same inputs meanwhile: then its row and history step stand.
    const current = (await trx("day_assessments").where({ survey_id: surveyId, day }).first("fingerprint", "level")) as { fingerprint: string; level: VerdictLevel | null } | undefined;
    if (current && current.fingerprint === fingerprint) return;
    await trx("day_assessments").insert(row).onConflict(["survey_id", "day"]).merge();
    if (!current || current.level !== level) {
      await trx("day_review_events").insert({
        survey_id: surveyId, day, kind: "assessed", from_state: null, to_state: null, actor_user_id: null, comment: "",
        details: JSON.stringify({ level, previousLevel: current?.level ?? null, reasons: verdict.reasons.map((r) => r.text), baseLogId: log?.id ?? null, thresholdsRevision: thresholds.revision, kpMax }),
        created_at: now,
      });
    }
  });
  return fromRow({ ...row, day } as Row);
}
