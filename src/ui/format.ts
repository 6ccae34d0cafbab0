/**
 * Display formatting shared by pages: 24 h clock, zone always named, tabular numbers via the
 * `num` class at the call site. Pure; safe on client and server.
 */

const pad = (n: number) => String(n).padStart(2, "0");

/** "2026-12-01 14:05" in the given IANA zone (default UTC), 24 h. */
export function formatDateTime(iso: string, timeZone = "UTC"): string {
  const date = new Date(iso);
  if (Number.isNaN(date.getTime())) return iso;
  const parts = new Intl.DateTimeFormat("en-GB", {
    timeZone,
    year: "numeric",
    month: "2-digit",
    day: "2-digit",
    hour: "2-digit",
    minute: "2-digit",
    hourCycle: "h23",
  }).formatToParts(date);
  const get = (type: string) => parts.find((p) => p.type === type)?.value ?? "";
  return `${get("year")}-${get("month")}-${get("day")} ${get("hour")}:${get("minute")}`;
}

/** "2026-12-01" in the given zone. */
export function formatDate(iso: string, timeZone = "UTC"): string {
  return formatDateTime(iso, timeZone).slice(0, 10);
}

/** The zone's current UTC offset as "UTC+10:30" (for a zone label beside local times). */
export function utcOffsetLabel(timeZone: string, at: Date = new Date()): string {
  const local = new Date(at.toLocaleString("en-US", { timeZone, hourCycle: "h23" }));
  const utc = new Date(at.toLocaleString("en-US", { timeZone: "UTC", hourCycle: "h23" }));
  const minutes = Math.round((local.getTime() - utc.getTime()) / 60000);
  if (!Number.isFinite(minutes)) return "";
  if (minutes === 0) return "UTC";
  const sign = minutes > 0 ? "+" : "−";
  const abs = Math.abs(minutes);
  return `UTC${sign}${pad(Math.floor(abs / 60))}:${pad(abs % 60)}`;
}

export function formatCount(n: number): string {
  return new Intl.NumberFormat("en-GB").format(n);
}
