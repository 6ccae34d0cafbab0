/**
 * Upload options of one log file (form fields or multipart fields of the API), zod-parsed.
 * No `server-only`: the upload page reuses the labels and limits.
 */
import "@/src/lib/zod-jitless";
import { z } from "zod";

export const LOG_KINDS = ["base", "rover"] as const;
export type LogKind = (typeof LOG_KINDS)[number];
export const SENSOR_TYPES = ["proton-precession", "overhauser", "other"] as const;
export type SensorType = (typeof SENSOR_TYPES)[number];
export const TIME_BASES = ["utc", "gps", "local"] as const;
export type TimeBasisChoice = (typeof TIME_BASES)[number];
export const MAPPABLE_ROLES = ["time", "date", "field", "lat", "lon", "height", "line", "station"] as const;
export type MappableRole = (typeof MAPPABLE_ROLES)[number];

export const SENSOR_LABELS: Record<SensorType, string> = {
  "proton-precession": "Proton-precession",
  overhauser: "Overhauser",
  other: "Other",
};
export const TIME_BASIS_LABELS: Record<TimeBasisChoice, string> = {
  utc: "UTC",
  gps: "GPS time",
  local: "Local time of the survey",
};

const blankToUndefined = (v: unknown) => (typeof v === "string" && v.trim() === "" ? undefined : v);
const optionalNumber = (min: number, max: number, what: string) =>
  z.preprocess(
    blankToUndefined,
    z.coerce.number({ message: `${what} must be a number.` }).min(min, `${what} must be at least ${min}.`).max(max, `${what} must be at most ${max}.`).optional(),
  );
const flag = z.preprocess((v) => v === true || v === "true" || v === "1" || v === "on" || v === "yes", z.boolean());

const MappingSchema = z.preprocess(
  (v) => {
    if (typeof v !== "string") return v;
    if (v.trim() === "") return undefined;
    try {
      return JSON.parse(v);
    } catch {
      return "__invalid__";
    }
  },
  z
    .partialRecord(z.enum(MAPPABLE_ROLES, { message: "Unknown column role." }), z.string().trim().min(1).max(200), {
      message: 'Column mapping must be a JSON object such as {"time":"Time","field":"Field (nT)"}.',
    })
    .optional(),
);

export const LogUploadOptionsSchema = z
  .object({
    kind: z.enum(LOG_KINDS, { message: "Choose base or rover." }),
    instrument: z.preprocess(blankToUndefined, z.string().trim().max(80, "At most 80 characters.").default("")),
    sensorType: z.preprocess(blankToUndefined, z.enum(SENSOR_TYPES, { message: "Choose proton-precession, overhauser or other." }).default("other")),
    operator: z.preprocess(blankToUndefined, z.string().trim().max(120, "At most 120 characters.").default("")),
    baseSiteName: z.preprocess(blankToUndefined, z.string().trim().max(120, "At most 120 characters.").optional()),
    baseLatitudeDeg: optionalNumber(-90, 90, "Latitude"),
    baseLongitudeDeg: optionalNumber(-180, 180, "Longitude"),
    baseHeightM: optionalNumber(-500, 9000, "Height"),
    timeBasis: z.preprocess(blankToUndefined, z.enum(TIME_BASES, { message: "Choose utc, gps or local." }).default("utc")),
    clockOffsetS: z.preprocess(
      blankToUndefined,
      z.coerce.number({ message: "Clock offset must be a number of seconds." }).min(-86_400, "At most one day.").max(86_400, "At most one day.").default(0),
    ),
    mapping: MappingSchema,
    delimiter: z.preprocess(blankToUndefined, z.enum(["comma", "tab", "semicolon", "pipe", "whitespace"]).optional()),
    acceptGoodRows: flag.default(false),
    saveProfileAs: z.preprocess(blankToUndefined, z.string().trim().max(80, "At most 80 characters.").optional()),
  })
  .superRefine((v, ctx) => {
    if (v.kind === "base" && !v.baseSiteName) {
      ctx.addIssue({ code: "custom", path: ["baseSiteName"], message: "Name the base station site." });
    }
    if ((v.baseLatitudeDeg === undefined) !== (v.baseLongitudeDeg === undefined)) {
      ctx.addIssue({ code: "custom", path: [v.baseLatitudeDeg === undefined ? "baseLatitudeDeg" : "baseLongitudeDeg"], message: "Give both latitude and longitude, or neither." });
    }
  });

export type LogUploadOptions = z.infer<typeof LogUploadOptionsSchema>;

export const DELIMITER_BY_NAME = { comma: ",", tab: "\t", semicolon: ";", pipe: "|", whitespace: "whitespace" } as const;
