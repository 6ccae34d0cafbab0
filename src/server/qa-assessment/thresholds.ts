/**
 * A survey's QA thresholds: what the automatic assessment of a day judges the base record and the
 * held Kp values against. One zod schema for the form, the service and the assessment (no
 * `server-only`: the QA page reuses labels, units and sources).
 *
 * Sources of the defaults (see ../shared/DOMAIN.md):
 * - chord 3.0 nT over a 60 s chord: Geological Survey of Canada, as recorded per survey in the
 *   Canadian Aeromagnetic Data Base;
 * - Kp above 5 stops surveying at mid-latitudes: Hejda et al., Earth Planets Space 58 (2006);
 *   NOAA's G1 storm level is Kp 5;
 * - quiet mid-latitude days range ~20–50 nT (Geophysics for Practicing Geoscientists, UBC-GIF),
 *   so 100 nT marks a disturbed day — the 100 nT itself is common practice;
 * - storm onsets move the field hundreds of nT in minutes (Milsom, Field Geophysics), so 100 nT
 *   within one minute is storm behaviour — the 100 nT itself is common practice;
 * - everything else is common practice, marked so beside it.
 */
import "@/src/lib/zod-jitless";
import { z } from "zod";
import { D4_FORMULA, DEFAULT_QA_SETTINGS, type BaseQaSettings, type VerdictThresholds } from "@/src/core/qa";

export const QaThresholdsSchema = z.object({
  chordWindowS: z.coerce.number({ message: "A number of seconds." }).min(5, "At least 5 s.").max(3600, "At most 3 600 s."),
  chordDeviationNt: z.coerce.number({ message: "A number of nT." }).positive("More than 0 nT.").max(1000, "At most 1 000 nT."),
  disturbedRangeNt: z.coerce.number({ message: "A number of nT." }).positive("More than 0 nT.").max(100_000, "At most 100 000 nT."),
  stormRangeNt: z.coerce.number({ message: "A number of nT." }).positive("More than 0 nT.").max(100_000, "At most 100 000 nT."),
  disturbedChangeNt: z.coerce.number({ message: "A number of nT." }).positive("More than 0 nT.").max(100_000, "At most 100 000 nT."),
  stormChangeNt: z.coerce.number({ message: "A number of nT." }).positive("More than 0 nT.").max(100_000, "At most 100 000 nT."),
  noiseRmsNt: z.coerce.number({ message: "A number of nT." }).positive("More than 0 nT.").max(1000, "At most 1 000 nT."),
  longestGapS: z.coerce.number({ message: "A number of seconds." }).positive("More than 0 s.").max(86_400, "At most one day (86 400 s)."),
  spikeCount: z.coerce.number({ message: "A whole number." }).int("A whole number.").min(0, "At least 0.").max(1_000_000, "At most 1 000 000."),
  spikeNSigma: z.coerce.number({ message: "A number." }).min(1, "At least 1.").max(20, "At most 20."),
  spikeMinDeviationNt: z.coerce.number({ message: "A number of nT." }).min(0, "At least 0 nT.").max(1000, "At most 1 000 nT."),
  kpLimit: z.coerce.number({ message: "A Kp value 0–9." }).min(0, "Kp is 0 to 9.").max(9, "Kp is 0 to 9."),
}).superRefine((v, ctx) => {
  if (v.stormRangeNt < v.disturbedRangeNt) ctx.addIssue({ code: "custom", path: ["stormRangeNt"], message: "The storm range must not be below the disturbed range." });
  if (v.stormChangeNt < v.disturbedChangeNt) ctx.addIssue({ code: "custom", path: ["stormChangeNt"], message: "The storm change must not be below the disturbed change." });
});

export type QaThresholds = z.infer<typeof QaThresholdsSchema>;
export type QaThresholdKey = keyof QaThresholds;

export const DEFAULT_QA_THRESHOLDS: QaThresholds = {
  chordWindowS: 60,
  chordDeviationNt: 3.0,
  disturbedRangeNt: 100,
  stormRangeNt: 300,
  disturbedChangeNt: 20,
  stormChangeNt: 100,
  noiseRmsNt: 0.5,
  longestGapS: 120,
  spikeCount: 10,
  spikeNSigma: 3,
  spikeMinDeviationNt: 1.0,
  kpLimit: 5,
};

/** Label, unit and source of each threshold, for the QA page and the change history. */
export const QA_THRESHOLD_INFO: Record<QaThresholdKey, { label: string; unit: string; source: string }> = {
  chordWindowS: { label: "Chord window", unit: "s", source: "Geological Survey of Canada, Canadian Aeromagnetic Data Base (60 s)" },
  chordDeviationNt: { label: "Chord deviation (disturbed above)", unit: "nT", source: "Geological Survey of Canada, Canadian Aeromagnetic Data Base (3.0 nT over 60 s)" },
  disturbedRangeNt: { label: "Daily range (disturbed above)", unit: "nT", source: "quiet mid-latitude days ~20–50 nT (UBC-GIF); 100 nT is common practice" },
  stormRangeNt: { label: "Daily range (storm above)", unit: "nT", source: "common practice" },
  disturbedChangeNt: { label: "Change within the chord window (disturbed above)", unit: "nT", source: "common practice" },
  stormChangeNt: { label: "Change within the chord window (storm above)", unit: "nT", source: "storm onsets move hundreds of nT in minutes (Milsom, Field Geophysics); 100 nT is common practice" },
  noiseRmsNt: { label: `Fourth-difference RMS (disturbed above; ${D4_FORMULA})`, unit: "nT", source: "common practice (proton base noise is a few tenths of nT)" },
  longestGapS: { label: "Longest gap in the base record (disturbed above)", unit: "s", source: "common practice (the default gap the correction bridges)" },
  spikeCount: { label: "Spikes (disturbed above)", unit: "", source: "common practice" },
  spikeNSigma: { label: "Spike test: robust σ from the median (Hampel)", unit: "σ", source: "common practice (Hampel identifier, 3σ)" },
  spikeMinDeviationNt: { label: "Spike test: smallest deviation", unit: "nT", source: "common practice" },
  kpLimit: { label: "Kp limit (disturbed at least above)", unit: "", source: "Hejda et al., Earth Planets Space 58 (2006); NOAA G1 = Kp 5" },
};

export const QA_THRESHOLD_KEYS = Object.keys(DEFAULT_QA_THRESHOLDS) as QaThresholdKey[];

/** The core QA's settings and verdict thresholds for these survey thresholds. */
export function coreSettingsFor(t: QaThresholds, kpMax: number | null): BaseQaSettings {
  const verdictThresholds: VerdictThresholds = {
    disturbed: {
      chordDeviationNt: t.chordDeviationNt,
      dailyRangeNt: t.disturbedRangeNt,
      changeNt: t.disturbedChangeNt,
      noiseRmsNt: t.noiseRmsNt,
      longestGapS: t.longestGapS,
      spikeCount: t.spikeCount,
      kp: t.kpLimit,
    },
    storm: { dailyRangeNt: t.stormRangeNt, changeNt: t.stormChangeNt },
  };
  return {
    ...DEFAULT_QA_SETTINGS,
    windowS: t.chordWindowS,
    chordThresholdNt: t.chordDeviationNt,
    changeThresholdNt: t.disturbedChangeNt,
    hampelNSigma: t.spikeNSigma,
    spikeMinDeviationNt: t.spikeMinDeviationNt,
    verdictThresholds,
    kp: kpMax ?? undefined,
  };
}
