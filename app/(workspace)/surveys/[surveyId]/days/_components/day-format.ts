/** Formatting for the day pages (pure; client and server): local 24 h times, nT with units. */

const timeFormatters = new Map<string, Intl.DateTimeFormat>();

/** "14:05" (or "14:05:30" with seconds) in the survey's zone. */
export function localTime(ms: number, timeZone: string, seconds = false): string {
  const key = `${timeZone}:${seconds}`;
  let f = timeFormatters.get(key);
  if (!f) {
    f = new Intl.DateTimeFormat("en-GB", { timeZone, hour: "2-digit", minute: "2-digit", ...(seconds ? { second: "2-digit" } : {}), hourCycle: "h23" });
    timeFormatters.set(key, f);
  }
  return Number.isFinite(ms) ? f.format(new Date(ms)) : "—";
}

export function utcTime(ms: number): string {
  return Number.isFinite(ms) ? new Date(ms).toISOString().slice(11, 19) + " UTC" : "—";
}

const ntFormatters = new Map<number, Intl.NumberFormat>();

/** "54 812.4" style (thin grouping from en-GB is a comma; we use a narrow space for nT values). */
export function formatNt(v: number | null | undefined, digits = 1): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return "—";
  let f = ntFormatters.get(digits);
  if (!f) {
    f = new Intl.NumberFormat("en-GB", { minimumFractionDigits: digits, maximumFractionDigits: digits });
    ntFormatters.set(digits, f);
  }
  return f.format(v).replace(/,/g, "\u202f");
}

export function formatCount(n: number): string {
  return new Intl.NumberFormat("en-GB").format(n);
}

export const RUN_STATUS_LABEL: Record<string, string> = { queued: "Queued", running: "Running", done: "Done", failed: "Failed" };

const HOUR_STEPS = [1, 2, 3, 4, 6];

/**
 * Axis ticks at whole local hours (every 1–6 h so that about `target` fit), for zones with any
 * UTC offset (half- and quarter-hour zones included): candidates every 15 min of UTC, kept where
 * the local minute is 00.
 */
export function localHourTicks(startMs: number, endMs: number, timeZone: string, target = 8): number[] {
  if (!(endMs > startMs)) return [];
  const quarter = 900_000;
  const spanH = (endMs - startMs) / 3_600_000;
  const step = HOUR_STEPS.find((s) => spanH / s <= target) ?? 12;
  const parts = new Intl.DateTimeFormat("en-GB", { timeZone, hour: "2-digit", minute: "2-digit", hourCycle: "h23" });
  const out: number[] = [];
  for (let t = Math.ceil(startMs / quarter) * quarter; t <= endMs; t += quarter) {
    const [h, m] = parts.format(new Date(t)).split(":").map(Number);
    if (m === 0 && h % step === 0) out.push(t);
  }
  return out;
}

/** Decimals for axis labels over a value range (1 below 10 nT, else 0). */
export function axisDigits(range: number): number {
  return range < 10 ? 1 : 0;
}
