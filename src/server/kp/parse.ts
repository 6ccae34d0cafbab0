/**
 * Kp values as a team enters or uploads them: one 3-hour interval per row, "start,kp" where start
 * is an ISO 8601 UTC time on a 3-hour boundary (00, 03, … 21 h; "2026-05-06T09:00Z" or
 * "2026-05-06 09:00") and kp is 0–9, as a decimal (5.33) or in thirds notation (5-, 5o, 5+).
 * A header row is allowed. Pure (no `server-only`): the Kp form can check as you type.
 */
export const KP_INTERVAL_MS = 3 * 3_600_000;

export interface KpEntry {
  intervalStartMs: number;
  kp: number;
}

export interface KpParseResult {
  entries: KpEntry[];
  errors: string[];
}

const THIRDS = /^([0-9])\s*([-+o])$/i;

/** "5-" → 4.667, "5o" → 5, "5+" → 5.333; decimals as they are; NaN when neither. */
export function parseKpValue(text: string): number {
  const t = text.trim();
  const m = THIRDS.exec(t);
  if (m) {
    const base = Number(m[1]);
    const sign = m[2].toLowerCase();
    return sign === "o" ? base : sign === "+" ? base + 1 / 3 : base - 1 / 3;
  }
  return /^\d+(\.\d+)?$/.test(t) ? Number(t) : NaN;
}

function parseStart(text: string): number {
  let t = text.trim().replace(" ", "T");
  if (/^\d{4}-\d{2}-\d{2}T\d{2}(:\d{2}){0,2}$/.test(t)) t += "Z"; // no zone written: UTC
  if (/^\d{4}-\d{2}-\d{2}T\d{2}Z$/.test(t)) t = t.replace("Z", ":00Z");
  if (!/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:?\d{2})$/i.test(t)) return NaN;
  return Date.parse(t);
}

export function parseKpText(text: string, maxRows = 10_000): KpParseResult {
  const entries: KpEntry[] = [];
  const errors: string[] = [];
  // Two cells per line: split on a comma, semicolon or tab when the line has one, else on spaces
  // (so "2026-05-06 09:00,6" keeps its date and time together).
  const rows = text
    .split(/\r?\n/)
    .map((l) => l.trim())
    .filter((l) => l !== "" && !l.startsWith("#"))
    .map((l) => (/[,;\t]/.test(l) ? l.split(/[,;\t]/) : l.split(/\s+/).length === 3 ? [l.split(/\s+/).slice(0, 2).join(" "), l.split(/\s+/)[2]] : l.split(/\s+/)));
  if (rows.length > maxRows) return { entries: [], errors: [`At most ${maxRows} rows at a time.`] };
  const seen = new Set<number>();
  rows.forEach((cells, i) => {
    const row = i + 1;
    const [a = "", b = ""] = cells.map((c) => c.trim()).filter((c) => c !== "");
    if (i === 0 && Number.isNaN(parseStart(a)) && Number.isNaN(parseKpValue(b))) return; // header
    const startMs = parseStart(a);
    const kp = parseKpValue(b);
    if (Number.isNaN(startMs)) return void errors.push(`Row ${row}: “${a}” is not an ISO 8601 UTC time (e.g. 2026-05-06T09:00Z).`);
    if (startMs % KP_INTERVAL_MS !== 0) return void errors.push(`Row ${row}: ${a} is not the start of a 3-hour Kp interval (00, 03, … 21 UTC).`);
    if (Number.isNaN(kp) || kp < 0 || kp > 9) return void errors.push(`Row ${row}: Kp “${b}” must be 0–9 (e.g. 4.33 or 4+).`);
    if (seen.has(startMs)) return void errors.push(`Row ${row}: ${a} is given twice.`);
    seen.add(startMs);
    entries.push({ intervalStartMs: startMs, kp: Math.round(kp * 1000) / 1000 });
  });
  if (rows.length === 0 || (entries.length === 0 && errors.length === 0)) errors.push("No Kp values: write one “start,kp” pair per line.");
  return { entries, errors };
}
