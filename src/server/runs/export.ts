import "server-only";
/**
 * Downloads of a finished run: corrected readings as CSV and as GeoJSON (RFC 7946). The CSV rows
 * are written by the very function the CLI `correct` command uses (same columns, same rounding),
 * after header comment lines that say what the numbers are. Needs the "export" permission.
 */
import { CORRECTED_CSV_COLUMNS, flagNames, writeCorrectedCsv, type CorrectionResult } from "@/src/core/correction";
import { createFixedFormatter } from "@/src/core/csv";
import type { LogReadings } from "@/src/core/logs";
import { gpsMinusUtcSecondsAtUtc, createIsoUtcFormatter } from "@/src/core/time";
import type { Actor } from "../auth/actor";
import { getDb } from "../db/client";
import { getRunResult, type RunRecord, type RunResult } from "./service";

export const CAUTION_TEXT =
  "Residuals locate anomalies relative to the survey datum; they are no clearance for digging. Before any excavation, have buried services and ordnance cleared by licensed specialists and follow local codes.";

const COLUMN_NOTES: Record<(typeof CORRECTED_CSV_COLUMNS)[number], string> = {
  time: "reading time, ISO 8601 UTC",
  lat: "latitude, degrees WGS84",
  lon: "longitude, degrees WGS84",
  height_m: "height above the WGS84 ellipsoid, m",
  line: "survey line",
  raw_nT: "rover total field as read, nT",
  base_nT: "base field interpolated to the reading time, nT",
  diurnal_nT: "base minus datum, nT",
  corrected_nT: "raw minus instrument offset minus diurnal, nT",
  reference_nT: "main field of the reference model at the reading, nT",
  residual_nT: "corrected minus reference, nT",
  flags: "why a value is missing or suspect, joined with |",
};

interface InputLogDetails {
  id: number;
  time_basis: string;
  clock_offset_s: number;
}

function describeDatum(run: RunRecord): string {
  const p = run.parameters;
  const datumNt = run.summary?.datumNt as number | null | undefined;
  if (p.datum === "reference") return `reference field at the base (${run.modelName ?? "model"}), varies with time`;
  const value = typeof datumNt === "number" ? `${datumNt.toFixed(3)} nT` : "";
  if (typeof p.datum === "number") return `fixed value ${value}`;
  return `${p.datum} of the base record = ${value}`;
}

function describeMethod(run: RunRecord): string {
  const p = run.parameters;
  if (p.pairing.method === "loop") return `looping: linear between rover reoccupations of station ${p.pairing.loopStation}`;
  return `${p.method} interpolation of the base, gaps longer than ${p.maxGapS} s not bridged${p.pairing.fallbackBaseLogId ? ", second base fills gaps of the first" : ""}`;
}

/** Header comment lines (each starting with "# "). */
export async function exportHeaderLines(survey: { code: string; name: string }, result: RunResult): Promise<string[]> {
  const { run, columns } = result;
  const p = run.parameters;
  const logs = (await getDb()("field_logs").whereIn("id", run.inputs.map((i) => i.logId)).select("id", "time_basis", "clock_offset_s")) as InputLogDetails[];
  const at = columns.count > 0 ? columns.timeMs[0] : Date.parse(`${run.day}T12:00:00Z`);
  const gpsLeap = gpsMinusUtcSecondsAtUtc(at);
  const perLog = run.inputs.map((i) => {
    const l = logs.find((x) => x.id === i.logId);
    const basis = l?.time_basis ?? "unknown";
    const clock = l && l.clock_offset_s !== 0 ? `, clock offset ${l.clock_offset_s} s` : "";
    return `${i.role} ${basis}${basis === "gps" ? ` (GPS − UTC = ${gpsLeap} s removed)` : ""}${clock}`;
  });
  return [
    "Fieldtide corrected readings",
    `survey: ${survey.code} ${survey.name}`,
    `day: ${run.day} (local date, ${p.timeZone}); all times below are UTC`,
    `run: ${run.number} by ${run.createdBy ?? "unknown"} at ${run.createdAt}`,
    `datum: ${describeDatum(run)}`,
    `method: ${describeMethod(run)}`,
    `model: ${run.modelName ? `${run.modelName} version ${run.modelVersion}` : "none (no reference, no residual)"}`,
    `GPS offset: GPS − UTC = ${gpsLeap} s on this day (IERS Bulletin C); time bases: ${perLog.join("; ")}`,
    `instrument offset: ${p.instrumentOffsetNt} nT subtracted from raw readings`,
    ...run.inputs.map((i) => `input: ${i.role} log ${i.logId} "${i.originalName}" sha256 ${i.sha256}`),
    `readings: ${columns.count}`,
    `caution: ${CAUTION_TEXT}`,
    ...CORRECTED_CSV_COLUMNS.map((c) => `column ${c}: ${COLUMN_NOTES[c]}`),
  ].map((l) => `# ${l.replace(/[\r\n]+/g, " ")}`);
}

/** The run's rows in the CLI's LogReadings / CorrectionResult shape. */
function asCliInputs(result: RunResult): { rover: LogReadings; corrected: CorrectionResult } {
  const { columns: c, dictionaries: d } = result;
  const lines = d.hasLine ? Array.from(c.lineCode, (k) => d.lines[k]) : null;
  const stations = d.hasStation ? Array.from(c.stationCode, (k) => d.stations[k]) : null;
  const rover: LogReadings = {
    count: c.count,
    timeMs: c.timeMs,
    fieldNt: c.rawNt,
    latDeg: d.hasPosition ? c.latDeg : null,
    lonDeg: d.hasPosition ? c.lonDeg : null,
    heightM: d.hasHeight ? c.heightM : null,
    line: lines,
    station: stations,
    sourceLine: Uint32Array.from(c.sourceLine),
  };
  const corrected = {
    count: c.count, baseNt: c.baseNt, diurnalNt: c.diurnalNt, correctedNt: c.correctedNt, referenceNt: c.referenceNt,
    residualNt: c.residualNt, flags: c.flags, summary: result.run.summary as unknown as CorrectionResult["summary"],
  };
  return { rover, corrected };
}

/** Who downloaded which run, and in which format (audit trail). */
async function recordExport(actor: Actor, surveyId: string, run: RunRecord, format: "csv" | "geojson"): Promise<void> {
  await getDb()("audit_events").insert({
    id: crypto.randomUUID(), survey_id: surveyId, actor_user_id: actor.userId, action: "run.export",
    details: JSON.stringify({ day: run.day, number: run.number, runId: run.id, format }), created_at: new Date().toISOString(),
  });
}

async function surveyOf(surveyId: string): Promise<{ code: string; name: string }> {
  return getDb()("surveys").where({ id: surveyId }).first("code", "name");
}

export function exportFileName(code: string, day: string, run: number, ext: string): string {
  return `${code}_${day}_run${run}_corrected.${ext}`.replace(/[^A-Za-z0-9._-]/g, "_");
}

/** CSV text of a run: comment lines, then exactly the CLI's header and rows. */
export async function exportRunCsv(actor: Actor, surveyId: string, day: unknown, number: unknown): Promise<{ fileName: string; chunks: Uint8Array[] }> {
  const result = await getRunResult(actor, surveyId, day, number, "export");
  const survey = await surveyOf(surveyId);
  const chunks: Uint8Array[] = [Buffer.from((await exportHeaderLines(survey, result)).join("\n") + "\n", "utf8")];
  await recordExport(actor, surveyId, result.run, "csv");
  const { rover, corrected } = asCliInputs(result);
  // the row writer reuses its buffers: each piece is copied into memory
  await writeCorrectedCsv({ writeBytes: (bytes) => void chunks.push(Buffer.from(bytes)) }, rover, corrected);
  return { fileName: exportFileName(survey.code, result.run.day, result.run.number, "csv"), chunks };
}

const NT_DECIMALS = 3;
const DEG_DECIMALS = 7;
const HEIGHT_DECIMALS = 3;

/**
 * GeoJSON FeatureCollection (RFC 7946): one Point per reading with a position, coordinates
 * [longitude, latitude, height] (height only when the log has it), values as properties (numbers
 * rounded as in the CSV; null where the CSV cell is empty). Run facts sit in a foreign member
 * "fieldtide" (RFC 7946 §6.1).
 */
export async function exportRunGeoJson(actor: Actor, surveyId: string, day: unknown, number: unknown): Promise<{ fileName: string; chunks: string[]; skipped: number }> {
  const result = await getRunResult(actor, surveyId, day, number, "export");
  const survey = await surveyOf(surveyId);
  const { run, columns: c, dictionaries: d } = result;
  await recordExport(actor, surveyId, run, "geojson");
  const nt = createFixedFormatter(NT_DECIMALS);
  const deg = createFixedFormatter(DEG_DECIMALS);
  const hgt = createFixedFormatter(HEIGHT_DECIMALS);
  const num = (f: (x: number) => string, x: number) => (x === x ? f(x) : "null");
  const iso = createIsoUtcFormatter();
  const flagJson = new Map<number, string>();
  const flagsOf = (bits: number) => {
    let s = flagJson.get(bits);
    if (s === undefined) flagJson.set(bits, (s = JSON.stringify(flagNames(bits))));
    return s;
  };
  const header = {
    survey: `${survey.code} ${survey.name}`,
    day: run.day,
    timeZone: run.parameters.timeZone,
    run: run.number,
    datum: describeDatum(run),
    method: describeMethod(run),
    model: run.modelName ? { name: run.modelName, version: run.modelVersion } : null,
    instrumentOffsetNt: run.parameters.instrumentOffsetNt,
    inputs: run.inputs.map((i) => ({ role: i.role, logId: i.logId, originalName: i.originalName, sha256: i.sha256 })),
    caution: CAUTION_TEXT,
  };
  const chunks: string[] = [`{"type":"FeatureCollection","fieldtide":${JSON.stringify(header)},"features":[`];
  let first = true;
  let skipped = 0;
  let buf = "";
  const lineJson = d.lines.map((l) => JSON.stringify(l));
  const stationJson = d.stations.map((s) => JSON.stringify(s));
  for (let i = 0; i < c.count; i++) {
    const la = c.latDeg[i], lo = c.lonDeg[i];
    if (!d.hasPosition || la !== la || lo !== lo) {
      skipped++;
      continue;
    }
    const h = c.heightM[i];
    const coords = d.hasHeight && h === h ? `[${deg(lo)},${deg(la)},${hgt(h)}]` : `[${deg(lo)},${deg(la)}]`;
    buf +=
      (first ? "" : ",") +
      `{"type":"Feature","geometry":{"type":"Point","coordinates":${coords}},"properties":{"time":"${iso(c.timeMs[i])}",` +
      `"line":${d.hasLine ? lineJson[c.lineCode[i]] : "null"},"station":${d.hasStation ? stationJson[c.stationCode[i]] : "null"},` +
      `"raw_nT":${num(nt, c.rawNt[i])},"base_nT":${num(nt, c.baseNt[i])},"diurnal_nT":${num(nt, c.diurnalNt[i])},` +
      `"corrected_nT":${num(nt, c.correctedNt[i])},"reference_nT":${num(nt, c.referenceNt[i])},"residual_nT":${num(nt, c.residualNt[i])},` +
      `"flags":${flagsOf(c.flags[i])}}}`;
    first = false;
    if (buf.length > 1 << 20) {
      chunks.push(buf);
      buf = "";
    }
  }
  chunks.push(buf + "]}");
  return { fileName: exportFileName(survey.code, run.day, run.number, "geojson"), chunks, skipped };
}
