export { computeBaseQa, DEFAULT_QA_SETTINGS, type BaseQaResult, type BaseQaSettings } from "./base-qa";
export {
  samplingIntervalS,
  findGaps,
  dailyRanges,
  largestChange,
  chordDeviation,
  fourthDifferenceNoise,
  hampelSpikes,
  D4_DIVISOR,
  D4_FORMULA,
  MAD_TO_SIGMA,
  type GapReport,
  type DailyRange,
  type ChangeReport,
  type ChordReport,
  type NoiseReport,
  type SpikeReport,
  type Spike,
} from "./metrics";
export {
  judgeDay,
  DEFAULT_VERDICT_THRESHOLDS,
  type Verdict,
  type VerdictLevel,
  type VerdictLimits,
  type VerdictMetrics,
  type VerdictReason,
  type VerdictThresholds,
} from "./verdict";
export { mergeWindows, WindowCollector, type QaMetric, type QaWindow } from "./windows";
