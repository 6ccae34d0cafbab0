import "server-only";
/**
 * Readings of stored logs as columns (the shape the core works on), read through the engine
 * adapter's bulk path (arrays, no row objects: 200 000 readings in ~100 ms on SQLite). Logs
 * never change after import, so decoded columns are kept in a small LRU cache keyed by log id
 * and day.
 */
import type { Knex } from "knex";
import type { LogReadings } from "@/src/core/logs";
import { selectReadingRows, type ReadingRow } from "../db/engine";

export const MS_PER_DAY = 86_400_000;

/** Days since 1970-01-01 of a yyyy-mm-dd label (the log_readings.local_day encoding). */
export function localDayNumber(day: string): number {
  return Math.floor(Date.parse(`${day}T00:00:00Z`) / MS_PER_DAY);
}

type Cached = { key: string; readings: LogReadings };
const CACHE_SIZE = 8;
const globalForCache = globalThis as unknown as { __fieldtideReadingsCache?: Cached[] };
const cache = (globalForCache.__fieldtideReadingsCache ??= []);

/**
 * All readings of a log in file order, or only those of one survey-local day. Missing values are
 * NaN (numbers) and "" (text); position/height/line/station columns are null when no reading of
 * the log has them, as the parser reports for a log without those columns.
 */
export async function loadLogReadings(db: Knex, logId: number, day?: string): Promise<LogReadings> {
  const key = `${logId}:${day ?? "*"}`;
  const hit = cache.findIndex((c) => c.key === key);
  if (hit >= 0) {
    const [entry] = cache.splice(hit, 1);
    cache.push(entry);
    return entry.readings;
  }
  const rows = await selectReadingRows(db, logId, day ? localDayNumber(day) : undefined);
  const readings = columnsFromRows(rows);
  cache.push({ key, readings });
  if (cache.length > CACHE_SIZE) cache.shift();
  return readings;
}

function columnsFromRows(rows: ReadingRow[]): LogReadings {
  const n = rows.length;
  const timeMs = new Float64Array(n);
  const fieldNt = new Float64Array(n);
  const latDeg = new Float64Array(n);
  const lonDeg = new Float64Array(n);
  const heightM = new Float64Array(n);
  const line: string[] = new Array(n);
  const station: string[] = new Array(n);
  const sourceLine = new Uint32Array(n);
  let hasPos = false, hasHeight = false, hasLine = false, hasStation = false;
  for (let i = 0; i < n; i++) {
    const r = rows[i];
    timeMs[i] = r[0];
    fieldNt[i] = r[1];
    if (r[2] !== null && r[3] !== null) {
      latDeg[i] = r[2];
      lonDeg[i] = r[3];
      hasPos = true;
    } else {
      latDeg[i] = NaN;
      lonDeg[i] = NaN;
    }
    if (r[4] !== null) {
      heightM[i] = r[4];
      hasHeight = true;
    } else heightM[i] = NaN;
    line[i] = r[5] ?? "";
    if (r[5] !== null) hasLine = true;
    station[i] = r[6] ?? "";
    if (r[6] !== null) hasStation = true;
    sourceLine[i] = r[7];
  }
  return {
    count: n,
    timeMs,
    fieldNt,
    latDeg: hasPos ? latDeg : null,
    lonDeg: hasPos ? lonDeg : null,
    heightM: hasHeight ? heightM : null,
    line: hasLine ? line : null,
    station: hasStation ? station : null,
    sourceLine,
  };
}

/** Readings of several logs one after the other (in the order given), as one column set. */
export function concatReadings(parts: LogReadings[]): LogReadings & { logIndex: Uint16Array } {
  const n = parts.reduce((s, p) => s + p.count, 0);
  const any = (f: (p: LogReadings) => unknown) => parts.some((p) => f(p) !== null);
  const f64 = () => new Float64Array(n);
  const out = {
    count: n,
    timeMs: f64(),
    fieldNt: f64(),
    latDeg: any((p) => p.latDeg) ? f64() : null,
    lonDeg: any((p) => p.lonDeg) ? f64() : null,
    heightM: any((p) => p.heightM) ? f64() : null,
    line: any((p) => p.line) ? ([] as string[]) : null,
    station: any((p) => p.station) ? ([] as string[]) : null,
    sourceLine: new Uint32Array(n),
    logIndex: new Uint16Array(n),
  };
  let at = 0;
  parts.forEach((p, k) => {
    out.timeMs.set(p.timeMs, at);
    out.fieldNt.set(p.fieldNt, at);
    for (const name of ["latDeg", "lonDeg", "heightM"] as const) {
      const target = out[name];
      if (!target) continue;
      const src = p[name];
      if (src) target.set(src, at);
      else target.fill(NaN, at, at + p.count);
    }
    for (const name of ["line", "station"] as const) {
      const target = out[name];
      if (!target) continue;
      const src = p[name];
      for (let i = 0; i < p.count; i++) target.push(src ? src[i] : "");
    }
    out.sourceLine.set(p.sourceLine, at);
    out.logIndex.fill(k, at, at + p.count);
    at += p.count;
  });
  return out;
}
