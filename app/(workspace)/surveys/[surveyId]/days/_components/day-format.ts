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
