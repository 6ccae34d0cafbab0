/**
 * `npm run -s cli -- qa --base base.csv [--window-s 60] [--chord-nt 3] [options]`
 *
 * QA metrics of a base record as JSON on stdout (times as UTC ms plus ISO strings); rejected rows
 * and time issues of the log go to stderr.
 */
import { z } from "zod";
import { prepareBaseSeries } from "../../core/correction";
import { computeBaseQa, type BaseQaResult } from "../../core/qa";
import { CliError } from "../cli-error";
import { readLogFile, reportLogProblems } from "../log-file";
import { numberOption, parseStringOptions } from "../option-args";

const USAGE =
  "usage: qa --base base.csv [--window-s 60] [--chord-nt 3] [--change-nt 20] [--noise-nt 1] [--gap-min-s 0] " +
  "[--kp N] [--timezone Area/City] [--date yyyy-mm-dd] [--date-order dmy|mdy] [--time-basis utc|gps] [--clock-offset-s X]";

const num = numberOption;

const positive = (v: number) => v > 0;
const OptionsSchema = z.object({
  base: z.string({ error: "--base is required" }).min(1, "--base is required"),
  "window-s": num("--window-s", positive, "a positive number of seconds"),
  "chord-nt": num("--chord-nt", positive, "a positive number of nT"),
  "change-nt": num("--change-nt", positive, "a positive number of nT"),
  "noise-nt": num("--noise-nt", positive, "a positive number of nT"),
  "gap-min-s": num("--gap-min-s", (v) => v >= 0, "zero or more seconds"),
  kp: num("--kp", (v) => v >= 0 && v <= 9, "a Kp value 0–9"),
  timezone: z.string().min(1).default("UTC"),
  date: z.string().regex(/^\d{4}-\d{2}-\d{2}$/, "--date must be yyyy-mm-dd").optional(),
  "date-order": z.enum(["dmy", "mdy"], { error: "--date-order must be dmy or mdy" }).optional(),
  "time-basis": z.enum(["utc", "gps"], { error: "--time-basis must be utc or gps" }).default("utc"),
  "clock-offset-s": num("--clock-offset-s"),
});

function readOptions(argv: string[]) {
  const values = parseStringOptions(argv, Object.keys(OptionsSchema.shape), USAGE);
  const parsed = OptionsSchema.safeParse(values);
  if (!parsed.success) throw new CliError(`${parsed.error.issues[0].message}; ${USAGE}`);
  return parsed.data;
}

const iso = (ms: number) => (Number.isFinite(ms) ? new Date(ms).toISOString() : null);

/** Add ISO strings beside the ms fields that a reader looks at first. */
function withIsoTimes(qa: BaseQaResult) {
  return {
    ...qa,
    startUtc: iso(qa.startMs),
    endUtc: iso(qa.endMs),
    windows: qa.windows.map((w) => ({ ...w, startUtc: iso(w.startMs), endUtc: iso(w.endMs) })),
    spikes: { ...qa.spikes, spikes: qa.spikes.spikes.map((s) => ({ ...s, timeUtc: iso(s.timeMs) })) },
  };
}

export async function run(argv: string[]): Promise<void> {
  const o = readOptions(argv);
  const log = await readLogFile(o.base, {
    timeZone: o.timezone,
    timeBasis: o["time-basis"],
    clockOffsetS: o["clock-offset-s"],
    defaultDate: o.date,
    dateOrder: o["date-order"],
  });
  reportLogProblems("base", o.base, log);
  const series = prepareBaseSeries(log.readings.timeMs, log.readings.fieldNt);
  if (series.timeMs.length < 2) throw new CliError(`${o.base}: QA needs at least two readable base readings, found ${series.timeMs.length}`);
  let qa: BaseQaResult;
  try {
    qa = computeBaseQa(series.timeMs, series.fieldNt, {
      windowS: o["window-s"],
      chordThresholdNt: o["chord-nt"],
      changeThresholdNt: o["change-nt"],
      noiseThresholdNt: o["noise-nt"],
      gapMinS: o["gap-min-s"],
      kp: o.kp,
    });
  } catch (err) {
    if (err instanceof RangeError) throw new CliError(err.message);
    throw err;
  }
  const report = {
    file: o.base,
    log: {
      rows: log.rowCount,
      accepted: log.acceptedCount,
      rejected: log.rejectedCount,
      timeIssues: log.issueCount,
      duplicateTimesAveraged: series.duplicateSamplesMerged,
      inputWasUnsorted: series.wasUnsorted,
    },
    qa: withIsoTimes(qa),
  };
  process.stdout.write(JSON.stringify(report, null, 2) + "\n");
}
