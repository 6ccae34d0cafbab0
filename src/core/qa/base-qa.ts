/** All QA metrics of one base record, with the windows that break thresholds and a verdict. */
import {
  chordDeviation,
  dailyRanges,
  findGaps,
  fourthDifferenceNoise,
  hampelSpikes,
  largestChange,
  samplingIntervalS,
  type ChangeReport,
  type ChordReport,
  type DailyRange,
  type GapReport,
  type NoiseReport,
  type SpikeReport,
} from "./metrics";
import { judgeDay, DEFAULT_VERDICT_THRESHOLDS, type Verdict, type VerdictThresholds } from "./verdict";
import { mergeWindows, type QaWindow } from "./windows";

export interface BaseQaSettings {
  /** Window for the chord and the largest change, s; default 60. */
  windowS?: number;
  /** Chord deviation limit, nT; default 3.0 (Geological Survey of Canada, 60 s chord). */
  chordThresholdNt?: number;
  /** Change inside a window that is shaded, nT; default 20 (practice). */
  changeThresholdNt?: number;
  /** |d4|/16 that is shaded, nT; default 1.0 (practice: proton base noise is a few tenths). */
  noiseThresholdNt?: number;
  /** Gap = spacing > max(gapFactor × interval, gapMinS); defaults 3 and 0 s. */
  gapFactor?: number;
  gapMinS?: number;
  /** Hampel window half-width (samples) and n_sigma; defaults 3 and 3 (common practice). */
  hampelHalfWidth?: number;
  hampelNSigma?: number;
  /** Smallest deviation that can be a spike, nT; default 1.0 (practice, guards MAD = 0). */
  spikeMinDeviationNt?: number;
  /** Verdict thresholds; default DEFAULT_VERDICT_THRESHOLDS. */
  verdictThresholds?: VerdictThresholds;
  /** Largest Kp the caller holds for the day, if any. */
  kp?: number;
}

export const DEFAULT_QA_SETTINGS = {
  windowS: 60,
  chordThresholdNt: 3.0,
  changeThresholdNt: 20,
  noiseThresholdNt: 1.0,
  gapFactor: 3,
  gapMinS: 0,
  hampelHalfWidth: 3,
  hampelNSigma: 3,
  spikeMinDeviationNt: 1.0,
} as const;

export interface BaseQaResult {
  sampleCount: number;
  startMs: number;
  endMs: number;
  durationS: number;
  samplingIntervalS: number;
  rangeNt: { minNt: number; maxNt: number; rangeNt: number };
  dailyRanges: DailyRange[];
  gaps: GapReport;
  change: ChangeReport;
  chord: ChordReport;
  noise: NoiseReport;
  spikes: SpikeReport;
  /** All threshold-breaking windows, merged per metric, by start time. */
  windows: QaWindow[];
  verdict: Verdict;
  settings: Required<Omit<BaseQaSettings, "kp" | "verdictThresholds">> & { kp: number | null };
}

function positive(name: string, v: number): number {
  if (!(v > 0) || !Number.isFinite(v)) throw new RangeError(`${name} must be a positive number`);
  return v;
}

/**
 * QA of a base record: times (UTC ms) strictly ascending with one field value each (run
 * prepareBaseSeries from the correction module first if the record may be unsorted or repeat times).
 */
export function computeBaseQa(timeMs: ArrayLike<number>, fieldNt: ArrayLike<number>, settings: BaseQaSettings = {}): BaseQaResult {
  const n = timeMs.length;
  if (fieldNt.length !== n) throw new RangeError("base times and fields differ in length");
  if (n < 2) throw new RangeError("QA needs at least two base readings");
  for (let i = 1; i < n; i++) if (!(timeMs[i] > timeMs[i - 1])) throw new RangeError("base times must be strictly ascending");
  const s = { ...DEFAULT_QA_SETTINGS, ...Object.fromEntries(Object.entries(settings).filter(([, v]) => v !== undefined)) };
  positive("windowS", s.windowS);
  positive("gapFactor", s.gapFactor);
  if (!Number.isInteger(s.hampelHalfWidth) || s.hampelHalfWidth < 1) throw new RangeError("hampelHalfWidth must be a whole number ≥ 1");

  const interval = samplingIntervalS(timeMs);
  const gaps = findGaps(timeMs, interval, s.gapFactor, s.gapMinS);
  const days = dailyRanges(timeMs, fieldNt);
  let minNt = Infinity, maxNt = -Infinity;
  for (let i = 0; i < n; i++) {
    if (fieldNt[i] < minNt) minNt = fieldNt[i];
    if (fieldNt[i] > maxNt) maxNt = fieldNt[i];
  }
  const change = largestChange(timeMs, fieldNt, s.windowS, s.changeThresholdNt);
  const chord = chordDeviation(timeMs, fieldNt, s.windowS, s.chordThresholdNt);
  const noise = fourthDifferenceNoise(timeMs, fieldNt, interval, s.noiseThresholdNt);
  const spikes = hampelSpikes(timeMs, fieldNt, s.hampelHalfWidth, s.hampelNSigma, s.spikeMinDeviationNt);
  const windows = mergeWindows([...gaps.windows, ...change.windows, ...chord.windows, ...noise.windows, ...spikes.windows]).sort(
    (a, b) => a.startMs - b.startMs || a.metric.localeCompare(b.metric),
  );
  const verdict = judgeDay(
    {
      dailyRangeNt: Math.max(...days.map((d) => d.rangeNt)),
      changeNt: change.maxChangeNt,
      chordDeviationNt: chord.maxDeviationNt,
      noiseRmsNt: noise.rmsNt,
      longestGapS: gaps.longestS,
      spikeCount: spikes.count,
      kp: settings.kp,
    },
    settings.verdictThresholds ?? DEFAULT_VERDICT_THRESHOLDS,
  );
  return {
    sampleCount: n,
    startMs: timeMs[0],
    endMs: timeMs[n - 1],
    durationS: (timeMs[n - 1] - timeMs[0]) / 1000,
    samplingIntervalS: interval,
    rangeNt: { minNt, maxNt, rangeNt: maxNt - minNt },
    dailyRanges: days,
    gaps,
    change,
    chord,
    noise,
    spikes,
    windows,
    verdict,
    settings: {
      windowS: s.windowS,
      chordThresholdNt: s.chordThresholdNt,
      changeThresholdNt: s.changeThresholdNt,
      noiseThresholdNt: s.noiseThresholdNt,
      gapFactor: s.gapFactor,
      gapMinS: s.gapMinS,
      hampelHalfWidth: s.hampelHalfWidth,
      hampelNSigma: s.hampelNSigma,
      spikeMinDeviationNt: s.spikeMinDeviationNt,
      kp: settings.kp ?? null,
    },
  };
}
