/**
 * `npm run -s cli -- correct --base base.csv --rover rover.csv --out out.csv [options]`
 *
 * Diurnal correction of a rover log against a base log (or, with --loop-station, against the
 * rover's own reoccupations of a base point), then subtraction of the main field (IGRF-14 by
 * default). One output row per readable rover row, in input order, columns
 *   time,lat,lon,height_m,line,raw_nT,base_nT,diurnal_nT,corrected_nT,reference_nT,residual_nT,flags
 * written by src/core/correction/corrected-csv.ts (the server's run export uses the same rows),
 * corrected and written a batch at a time.
 *
 * Times: --timezone applies to naive times of both logs; --base-timezone / --rover-timezone override
 * it per log; a GPS-basis log is read as GPS time (no zone) and turned to UTC with the leap-second
 * table. Clock offsets: corrected time = logged time + offset.
 *
 * Rejected rover rows (unreadable time, field, position) are listed on stderr with their file line
 * and left out of the output; the run succeeds unless no rover reading could be corrected, and then
 * nothing is written. Residuals locate anomalies; they are no clearance certificate for digging.
 */
import path from "node:path";
import { z } from "zod";
import {
  CorrectedCsvStream,
  createCorrector,
  createReferenceEvaluator,
  duplicateTimeMarks,
  emptyColumns,
  loopBaseFromStation,
  prepareBaseSeries,
  sliceRoverReadings,
  type BasePosition,
  type Corrector,
  type DatumChoice,
  type ReferenceFieldEvaluator,
} from "../../core/correction";
import type { LogReadings } from "../../core/logs";
import type { FieldModel } from "../../core/reference-field";
import { extent, median } from "../../core/series";
import { loadReferenceModel, ReferenceModelFileError } from "../../lib/reference-model";
import { CliError } from "../cli-error";
import { AtomicFileWriter } from "../atomic-file-writer";
import { readLogFile, reportLogProblems } from "../log-file";
import { numberOption, parseStringOptions } from "../option-args";

const USAGE =
  "usage: correct (--base base.csv | --loop-station ID) --rover rover.csv --out out.csv [--datum N|median|mean|reference] " +
  "[--method linear|spline|nearest] [--max-gap-s 120] [--reference igrf|wmm|none] [--timezone Area/City] " +
  "[--base-timezone Area/City] [--rover-timezone Area/City] [--date yyyy-mm-dd (for times of day alone)] [--date-order dmy|mdy] " +
  "[--base-time-basis utc|gps] [--rover-time-basis utc|gps] [--base-clock-offset-s X] [--rover-clock-offset-s X] " +
  "[--instrument-offset-nt X] [--igrf-file PATH] [--base-lat D --base-lon D --base-height-m M] [--min-field-nt N] [--max-field-nt N]";

const finite = (flag: string) => numberOption(flag);
/** Readings corrected and written per batch (a few MB of corrected columns). */
const BATCH_READINGS = 65_536;

const basis = (flag: string) => z.enum(["utc", "gps"], { error: `${flag} must be utc or gps` }).default("utc");

const OptionsSchema = z
  .object({
    base: z.string().min(1).optional(),
    "loop-station": z.string().min(1).optional(),
    rover: z.string({ error: "--rover is required" }).min(1, "--rover is required"),
    out: z.string({ error: "--out is required" }).min(1, "--out is required"),
    datum: z
      .string()
      .default("median")
      .transform((s, ctx): DatumChoice => {
        if (s === "median" || s === "mean" || s === "reference") return s;
        const v = Number(s);
        if (s.trim() === "" || !Number.isFinite(v)) {
          ctx.addIssue({ code: "custom", message: `--datum must be a number of nT, median, mean or reference, got "${s}"` });
          return z.NEVER;
        }
        return v;
      }),
    method: z.enum(["linear", "spline", "nearest"], { error: "--method must be linear, spline or nearest" }).default("linear"),
    "max-gap-s": finite("--max-gap-s"),
    reference: z.enum(["igrf", "wmm", "none"], { error: "--reference must be igrf, wmm or none" }).default("igrf"),
    timezone: z.string().min(1).default("UTC"),
    "base-timezone": z.string().min(1).optional(),
    "rover-timezone": z.string().min(1).optional(),
    date: z.string().regex(/^\d{4}-\d{2}-\d{2}$/, "--date must be yyyy-mm-dd").optional(),
    "date-order": z.enum(["dmy", "mdy"], { error: "--date-order must be dmy or mdy" }).optional(),
    "base-time-basis": basis("--base-time-basis"),
    "rover-time-basis": basis("--rover-time-basis"),
    "base-clock-offset-s": finite("--base-clock-offset-s"),
    "rover-clock-offset-s": finite("--rover-clock-offset-s"),
    "instrument-offset-nt": finite("--instrument-offset-nt"),
    "igrf-file": z.string().min(1).optional(),
    "base-lat": finite("--base-lat"),
    "base-lon": finite("--base-lon"),
    "base-height-m": finite("--base-height-m"),
    "min-field-nt": finite("--min-field-nt"),
    "max-field-nt": finite("--max-field-nt"),
  })
  .superRefine((o, ctx) => {
    if (!o.base === !o["loop-station"]) ctx.addIssue({ code: "custom", message: "give exactly one of --base or --loop-station" });
    if (o["max-gap-s"] !== undefined && !(o["max-gap-s"] > 0)) ctx.addIssue({ code: "custom", message: "--max-gap-s must be positive" });
    if (o["base-lat"] !== undefined && Math.abs(o["base-lat"]) > 90) ctx.addIssue({ code: "custom", message: "--base-lat must be within −90…90" });
    if (o["base-lon"] !== undefined && Math.abs(o["base-lon"]) > 180) ctx.addIssue({ code: "custom", message: "--base-lon must be within −180…180" });
    if ((o["base-lat"] === undefined) !== (o["base-lon"] === undefined)) ctx.addIssue({ code: "custom", message: "give --base-lat and --base-lon together" });
    if (o.datum === "reference" && o.reference === "none") ctx.addIssue({ code: "custom", message: "--datum reference needs --reference igrf or wmm" });
  });
export type CorrectOptions = z.infer<typeof OptionsSchema>;

const STRING_OPTIONS = [
  "base", "loop-station", "rover", "out", "datum", "method", "max-gap-s", "reference", "timezone", "base-timezone",
  "rover-timezone", "date", "date-order", "base-time-basis",
  "rover-time-basis", "base-clock-offset-s", "rover-clock-offset-s", "instrument-offset-nt", "igrf-file", "base-lat",
  "base-lon", "base-height-m", "min-field-nt", "max-field-nt",
] as const;

export function readCorrectOptions(argv: string[]): CorrectOptions {
  const values = parseStringOptions(argv, STRING_OPTIONS, USAGE);
  const parsed = OptionsSchema.safeParse(values);
  if (!parsed.success) throw new CliError(`${parsed.error.issues[0].message}; ${USAGE}`);
  return parsed.data;
}

function fieldRange(o: CorrectOptions) {
  if (o["min-field-nt"] === undefined && o["max-field-nt"] === undefined) return undefined;
  const range = { minNt: o["min-field-nt"] ?? 10_000, maxNt: o["max-field-nt"] ?? 120_000 };
  if (!(range.minNt < range.maxNt)) throw new CliError("--min-field-nt must be below --max-field-nt");
  return range;
}

function basePositionFrom(o: CorrectOptions, base: LogReadings | null): BasePosition | null {
  if (o["base-lat"] !== undefined && o["base-lon"] !== undefined) {
    return { latDeg: o["base-lat"], lonDeg: o["base-lon"], heightM: o["base-height-m"] ?? 0 };
  }
  if (base && base.latDeg && base.lonDeg) {
    const latDeg = median(base.latDeg);
    const lonDeg = median(base.lonDeg);
    if (Number.isFinite(latDeg) && Number.isFinite(lonDeg)) {
      const h = base.heightM ? median(base.heightM) : NaN;
      return { latDeg, lonDeg, heightM: o["base-height-m"] ?? (Number.isFinite(h) ? h : 0) };
    }
  }
  return null;
}

/** Zone of one log: its own flag, else UTC for a GPS-basis log (GPS time has no zone), else --timezone. */
function zoneFor(own: string | undefined, shared: string, basis: "utc" | "gps"): string {
  return own ?? (basis === "gps" ? "UTC" : shared);
}

function timeSpan(times: ArrayLike<number>): string {
  const { min, max } = extent(times);
  return Number.isFinite(min) ? `${new Date(min).toISOString()} – ${new Date(max).toISOString()}` : "no times";
}

export async function run(argv: string[]): Promise<void> {
  const o = readCorrectOptions(argv);
  const range = fieldRange(o);
  const roverLog = await readLogFile(o.rover, {
    timeZone: zoneFor(o["rover-timezone"], o.timezone, o["rover-time-basis"]), timeBasis: o["rover-time-basis"], clockOffsetS: o["rover-clock-offset-s"], fieldRangeNt: range,
    defaultDate: o.date,
    dateOrder: o["date-order"],
  });
  reportLogProblems("rover", o.rover, roverLog);
  const rover = roverLog.readings;
  if (!rover.latDeg && o.reference !== "none") {
    process.stderr.write(`rover ${path.basename(o.rover)}: warning: no latitude/longitude columns, so no reference field or residual (flag no_position)\n`);
  }
  if (rover.count === 0) throw new CliError(`${path.basename(o.rover)}: no readable rover readings (${roverLog.rejectedCount} rejected rows)`);

  let baseLog: LogReadings | null = null;
  let baseSeries;
  let occupations: Uint32Array | null = null;
  if (o.base) {
    const log = await readLogFile(o.base, {
      timeZone: zoneFor(o["base-timezone"], o.timezone, o["base-time-basis"]), timeBasis: o["base-time-basis"], clockOffsetS: o["base-clock-offset-s"], fieldRangeNt: range,
      defaultDate: o.date,
      dateOrder: o["date-order"],
    });
    reportLogProblems("base", o.base, log);
    baseLog = log.readings;
    if (baseLog.count === 0) throw new CliError(`${path.basename(o.base)}: no readable base readings (${log.rejectedCount} rejected rows)`);
    baseSeries = prepareBaseSeries(baseLog.timeMs, baseLog.fieldNt);
    if (baseSeries.duplicateSamplesMerged > 0) {
      process.stderr.write(`base: ${baseSeries.duplicateSamplesMerged} readings shared a time with another and were averaged\n`);
    }
  } else {
    if (!rover.station) throw new CliError(`${path.basename(o.rover)}: --loop-station needs a station column in the rover log`);
    const loop = loopBaseFromStation(rover.timeMs, rover.fieldNt, rover.station, o["loop-station"]!);
    if (loop.base.timeMs.length < 2) {
      throw new CliError(`--loop-station ${o["loop-station"]}: needs at least two occupations in the rover log, found ${loop.base.timeMs.length}`);
    }
    baseSeries = loop.base;
    occupations = loop.occupationIndices;
  }

  const basePos = basePositionFrom(o, baseLog);
  if (o.datum === "reference" && !basePos) {
    throw new CliError("--datum reference needs the base position: give --base-lat and --base-lon (and --base-height-m), or a base log with lat/lon columns");
  }
  let reference: ReferenceFieldEvaluator | null = null;
  if (o.reference !== "none") {
    let model: FieldModel;
    try {
      model = loadReferenceModel(o.reference, { igrfFile: o["igrf-file"] });
    } catch (err) {
      if (err instanceof ReferenceModelFileError || err instanceof Error) throw new CliError(err.message.split("\n")[0]);
      throw err;
    }
    reference = createReferenceEvaluator(model, rover, { baseTimeMs: baseSeries.timeMs, basePosition: basePos });
  }

  let corrector: Corrector;
  try {
    corrector = createCorrector(baseSeries, reference, {
      datum: o.datum,
      method: o.method,
      maxGapS: o["max-gap-s"] ?? (o["loop-station"] ? Infinity : undefined),
      instrumentOffsetNt: o["instrument-offset-nt"],
      basePosition: basePos,
      baseOccupations: occupations,
    });
  } catch (err) {
    if (err instanceof RangeError) throw new CliError(err.message);
    throw err;
  }

  // Corrected and written a batch at a time: no corrected columns for the whole log in memory.
  // The file appears at --out only when every row is written and something could be corrected.
  const writer = new AtomicFileWriter(o.out);
  try {
    const csv = new CorrectedCsvStream({ writeBytes: (bytes) => writer.writeBytesAsync(bytes) });
    const marks = duplicateTimeMarks(rover.timeMs, rover.count);
    const columns = emptyColumns(Math.min(BATCH_READINGS, rover.count)); // one set, reused by every batch
    for (let start = 0; start < rover.count; start += BATCH_READINGS) {
      const end = Math.min(rover.count, start + BATCH_READINGS);
      await csv.write(rover, corrector.correctBatch(sliceRoverReadings(rover, start, end), marks.subarray(start, end), columns), start);
    }
    await csv.finish();
  } catch (err) {
    writer.abort();
    if (err instanceof RangeError) throw new CliError(err.message);
    if (err instanceof Error && "code" in err) throw new CliError(`cannot write ${o.out}: ${err.message}`); // a system error of the file
    throw err;
  }
  const s = corrector.summary();
  if (s.correctedCount === 0) {
    writer.abort();
    throw new CliError(
      `no rover reading could be corrected: base covers ${timeSpan(baseSeries.timeMs)}, rover ${timeSpan(rover.timeMs)} ` +
        "(check --timezone, time bases and clock offsets); nothing written",
    );
  }
  writer.commit();
  for (const w of s.warnings) process.stderr.write(`warning: ${w}\n`);
  const flagged = Object.entries(s.flagCounts).filter(([, n]) => n > 0).map(([k, n]) => `${k} ${n}`).join(", ");
  process.stderr.write(
    `corrected ${s.correctedCount} of ${s.count} rover readings (${roverLog.rejectedCount} rows rejected); ` +
      `datum ${s.datumNt === null ? "reference field at base" : `${s.datumNt.toFixed(3)} nT`}, ${s.method}` +
      `${s.referenceModel ? `, reference ${s.referenceModel}` : ""}${flagged ? `; flags: ${flagged}` : ""}\n` +
      "residuals locate anomalies; they are no clearance for digging (defer to licensed specialists)\n",
  );
}
