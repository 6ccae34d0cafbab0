/**
 * Processing settings of a survey: how its days are corrected. One zod schema, used by the
 * settings form, the service and the runs (no `server-only`: the settings page reuses the
 * labels and limits).
 */
import "@/src/lib/zod-jitless";
import { z } from "zod";

export const DATUM_KINDS = ["value", "median", "mean", "reference"] as const;
export type DatumKind = (typeof DATUM_KINDS)[number];
export const INTERPOLATIONS = ["linear", "spline", "nearest"] as const;
export const REFERENCE_MODELS = ["igrf", "wmm", "none"] as const;
export type ReferenceModelChoice = (typeof REFERENCE_MODELS)[number];
export const TIME_BASES = ["utc", "gps", "local"] as const;

export const DATUM_LABELS: Record<DatumKind, string> = {
  value: "A fixed value (nT)",
  median: "Median of the day's base record",
  mean: "Mean of the day's base record",
  reference: "Reference field at the base (IGRF/WMM)",
};
export const INTERPOLATION_LABELS: Record<(typeof INTERPOLATIONS)[number], string> = {
  linear: "Linear between base readings",
  spline: "Natural cubic spline",
  nearest: "Nearest base reading",
};
export const REFERENCE_MODEL_LABELS: Record<ReferenceModelChoice, string> = {
  igrf: "IGRF-14",
  wmm: "WMM2025",
  none: "None (no residuals)",
};

const blankToUndefined = (v: unknown) => (typeof v === "string" && v.trim() === "" ? undefined : v);
const flag = z.preprocess((v) => v === true || v === "true" || v === "1" || v === "on" || v === "yes", z.boolean());
const optionalText = (max: number) =>
  z.preprocess((v) => (typeof v === "string" && v.trim() === "" ? null : v), z.string().trim().max(max, `At most ${max} characters.`).nullable().default(null));

export const ProcessingSettingsSchema = z
  .object({
    datumKind: z.enum(DATUM_KINDS, { message: "Choose a fixed value, median, mean or reference." }),
    datumValueNt: z.preprocess(
      blankToUndefined,
      z.coerce
        .number({ message: "The datum must be a number of nT." })
        .min(1_000, "A total-field datum is at least 1 000 nT.")
        .max(100_000, "A total-field datum is at most 100 000 nT.")
        .nullable()
        .default(null),
    ),
    interpolation: z.enum(INTERPOLATIONS, { message: "Choose linear, spline or nearest." }),
    maxBaseGapS: z.coerce
      .number({ message: "The longest base gap must be a number of seconds." })
      .min(1, "At least 1 s.")
      .max(86_400, "At most one day (86 400 s)."),
    referenceModel: z.enum(REFERENCE_MODELS, { message: "Choose IGRF-14, WMM2025 or none." }),
    applyInstrumentOffset: flag,
    instrumentOffsetNt: z.preprocess(
      blankToUndefined,
      z.coerce.number({ message: "The instrument offset must be a number of nT." }).min(-1000, "At least −1000 nT.").max(1000, "At most 1000 nT.").default(0),
    ),
    defaultTimeBasis: z.enum(TIME_BASES, { message: "Choose utc, gps or local." }),
    /** base_site_name of the survey's main base; null = the site with the most base logs. */
    mainBaseSite: optionalText(120),
    /** Station id of rover readings that reoccupy the base point (looping method). */
    loopStation: z.preprocess(blankToUndefined, z.string().trim().min(1).max(40, "At most 40 characters.").default("BASE")),
  })
  .superRefine((v, ctx) => {
    if (v.datumKind === "value" && v.datumValueNt === null) {
      ctx.addIssue({ code: "custom", path: ["datumValueNt"], message: "Give the datum value in nT (e.g. a round value near the base's typical reading)." });
    }
    if (v.datumKind === "reference" && v.referenceModel === "none") {
      ctx.addIssue({ code: "custom", path: ["referenceModel"], message: "A reference datum needs a reference model (IGRF-14 or WMM2025)." });
    }
  });

export type ProcessingSettings = z.infer<typeof ProcessingSettingsSchema>;

export const DEFAULT_PROCESSING_SETTINGS: ProcessingSettings = {
  datumKind: "median",
  datumValueNt: null,
  interpolation: "linear",
  maxBaseGapS: 120,
  referenceModel: "igrf",
  applyInstrumentOffset: false,
  instrumentOffsetNt: 0,
  defaultTimeBasis: "utc",
  mainBaseSite: null,
  loopStation: "BASE",
};

export const SETTING_LABELS: Record<keyof ProcessingSettings, string> = {
  datumKind: "Datum",
  datumValueNt: "Datum value",
  interpolation: "Interpolation",
  maxBaseGapS: "Longest base gap bridged",
  referenceModel: "Reference model",
  applyInstrumentOffset: "Apply instrument offset",
  instrumentOffsetNt: "Instrument offset",
  defaultTimeBasis: "Default time basis of new logs",
  mainBaseSite: "Main base site",
  loopStation: "Base reoccupation station id",
};
