/**
 * A day's verdict from thresholds the caller passes: storm if any storm limit is broken, else
 * disturbed if any disturbed limit is broken, else quiet. Every broken limit is a reason.
 */
export type VerdictLevel = "quiet" | "disturbed" | "storm";

/** Limits; a value above its limit breaks it. Leave a limit out to ignore that metric. */
export interface VerdictLimits {
  /** Largest daily range, nT. */
  dailyRangeNt?: number;
  /** Largest change inside the change window, nT. */
  changeNt?: number;
  /** Largest chord deviation, nT. */
  chordDeviationNt?: number;
  /** Fourth-difference RMS, nT. */
  noiseRmsNt?: number;
  /** Longest gap, s. */
  longestGapS?: number;
  /** Number of spikes. */
  spikeCount?: number;
  /** Largest planetary Kp the caller holds for the day (space-weather service). */
  kp?: number;
}

export interface VerdictThresholds {
  disturbed?: VerdictLimits;
  storm?: VerdictLimits;
}

/**
 * Fieldtide's defaults. Sources: chord 3.0 nT over 60 s (Geological Survey of Canada, as recorded
 * in the Canadian Aeromagnetic Data Base); Kp > 5 stops surveying at mid-latitudes (Hejda et al.,
 * Earth Planets Space 58, 2006; NOAA G1 = Kp 5); quiet mid-latitude days range ~20–50 nT
 * (UBC-GIF, Geophysics for Practicing Geoscientists), so 100 nT marks a disturbed day (practice);
 * a 100 nT change within a minute is storm behaviour (practice); gap 120 s = the default
 * correction gap limit; noise RMS 0.5 nT on d4/16 and 10 spikes (practice).
 */
export const DEFAULT_VERDICT_THRESHOLDS: Required<VerdictThresholds> = {
  disturbed: { chordDeviationNt: 3.0, dailyRangeNt: 100, changeNt: 20, noiseRmsNt: 0.5, longestGapS: 120, spikeCount: 10, kp: 4 },
  storm: { dailyRangeNt: 300, changeNt: 100, kp: 5 },
};

export interface VerdictMetrics {
  dailyRangeNt: number;
  changeNt: number;
  chordDeviationNt: number;
  noiseRmsNt: number;
  longestGapS: number;
  spikeCount: number;
  kp?: number;
}

export interface VerdictReason {
  level: Exclude<VerdictLevel, "quiet">;
  metric: keyof VerdictLimits;
  value: number;
  limit: number;
  text: string;
}

export interface Verdict {
  level: VerdictLevel;
  reasons: VerdictReason[];
  thresholds: VerdictThresholds;
}

const LABELS: Record<keyof VerdictLimits, [string, string]> = {
  dailyRangeNt: ["daily range", "nT"],
  changeNt: ["largest change in window", "nT"],
  chordDeviationNt: ["chord deviation", "nT"],
  noiseRmsNt: ["fourth-difference RMS", "nT"],
  longestGapS: ["longest gap", "s"],
  spikeCount: ["spikes", ""],
  kp: ["Kp", ""],
};

export function judgeDay(metrics: VerdictMetrics, thresholds: VerdictThresholds = DEFAULT_VERDICT_THRESHOLDS): Verdict {
  const reasons: VerdictReason[] = [];
  for (const level of ["storm", "disturbed"] as const) {
    const limits = thresholds[level];
    if (!limits) continue;
    for (const metric of Object.keys(limits) as (keyof VerdictLimits)[]) {
      const limit = limits[metric];
      const value = metrics[metric];
      if (limit === undefined || value === undefined || !Number.isFinite(value)) continue;
      if (value > limit) {
        const [label, unit] = LABELS[metric];
        const u = unit ? ` ${unit}` : "";
        reasons.push({ level, metric, value, limit, text: `${label} ${+value.toFixed(3)}${u} > ${limit}${u} (${level})` });
      }
    }
  }
  const level: VerdictLevel = reasons.some((r) => r.level === "storm") ? "storm" : reasons.length > 0 ? "disturbed" : "quiet";
  return { level, reasons, thresholds };
}
