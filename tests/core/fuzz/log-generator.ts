/**
 * Random VALID field logs with known contents, for the log-parser fuzz tests: header names drawn
 * from the synonyms, unit decorations and letter cases a crew's logger or spreadsheet writes;
 * comma, tab, semicolon, pipe or whitespace delimiters; LF or CRLF; optional BOM, comments, blank
 * lines, padded and quoted cells, decimal commas where the delimiter allows them; timestamps in
 * one column (ISO 8601 extended or basic, Z, offset or naive UTC) or split date + time columns.
 * Every reading's values and file line are known by construction.
 */
import fc from "fast-check";

export type LogDelimiter = "," | "\t" | ";" | "|" | "whitespace";
type Role = "time" | "date" | "field" | "lat" | "lon" | "height" | "line" | "station";

/** Names per role; those with a blank cannot head a whitespace-delimited column. */
const NAMES: Record<Role, readonly string[]> = {
  time: ["time", "Timestamp", "timestamp (UTC)", "DateTime", "date_time", "UTC", "utc_time", "Time UTC", "time[iso8601]"],
  date: ["date", "Day", "Date (UTC)", "date[yyyy-mm-dd]"],
  field: ["field", "Field (nT)", "TMI", "nT", "mag", "F", "Total Field", "total_field_nT", "MagField[nT]", "TF", "Total Magnetic Field (nT)", "totalintensity"],
  lat: ["lat", "Latitude", "LAT[deg]", "latitude_deg", "Lat (WGS84)"],
  lon: ["lon", "Long", "Longitude (deg)", "LNG", "longitude_deg", "Lon[deg]"],
  height: ["elev", "Elevation (m)", "height_m", "ALT", "Altitude m", "heightM"],
  line: ["line", "Line ID", "LINE_NO", "linename", "Line Number"],
  station: ["station", "Stn", "Station ID", "STATION_NO", "stationname"],
};
/** Time-of-day column names for split date + time (a name like "timestamp" means a full timestamp). */
const SPLIT_TIME_NAMES = ["time", "Time (UTC)", "time_utc", "TIME[hh:mm:ss]"];

export interface ExpectedReading {
  timeMs: number;
  fieldNt: number;
  latDeg: number;
  lonDeg: number;
  heightM: number;
  line: string;
  station: string;
  /** 1-based file line. */
  sourceLine: number;
}

export interface GeneratedLog {
  text: string;
  delimiter: LogDelimiter;
  header: string[];
  present: { position: boolean; height: boolean; line: boolean; station: boolean };
  readings: ExpectedReading[];
  /** Text of each data row's line (without CR), keyed to the reading it must give. */
  rowLines: Map<string, ExpectedReading>;
  /** time_backwards + duplicate_time issues the parser must report. */
  expectedIssues: number;
}

const pad = (n: number, w: number) => String(n).padStart(w, "0");

function fields(ms: number) {
  const d = new Date(ms);
  return {
    y: pad(d.getUTCFullYear(), 4), mo: pad(d.getUTCMonth() + 1, 2), d: pad(d.getUTCDate(), 2),
    h: pad(d.getUTCHours(), 2), mi: pad(d.getUTCMinutes(), 2), s: pad(d.getUTCSeconds(), 2), ms: pad(d.getUTCMilliseconds(), 3),
  };
}

type SingleStyle = "isoZ" | "spaceNaive" | "offset" | "basic" | "slash";

/** One timestamp cell for `ms` in a style; `blankFree` when the delimiter is whitespace. */
function writeSingle(ms: number, style: SingleStyle, offsetMin: number): string {
  switch (style) {
    case "isoZ":
      return new Date(ms).toISOString();
    case "spaceNaive": {
      const f = fields(ms);
      return `${f.y}-${f.mo}-${f.d} ${f.h}:${f.mi}:${f.s}.${f.ms}`;
    }
    case "offset": {
      const f = fields(ms + offsetMin * 60_000);
      const sign = offsetMin < 0 ? "-" : "+";
      const a = Math.abs(offsetMin);
      return `${f.y}-${f.mo}-${f.d}T${f.h}:${f.mi}:${f.s}.${f.ms}${sign}${pad(Math.floor(a / 60), 2)}:${pad(a % 60, 2)}`;
    }
    case "basic": {
      const f = fields(ms);
      return `${f.y}${f.mo}${f.d}T${f.h}${f.mi}${f.s}.${f.ms}Z`;
    }
    case "slash": {
      const f = fields(ms);
      return `${f.y}/${f.mo}/${f.d} ${f.h}:${f.mi}:${f.s}.${f.ms}`;
    }
  }
}

const rowArb = fc.record({
  timeMs: fc.integer({ min: Date.UTC(2000, 0, 1), max: Date.UTC(2040, 0, 1) }),
  fieldMilliNt: fc.integer({ min: 10_000_000, max: 119_999_999 }),
  fieldDecimals: fc.integer({ min: 0, max: 3 }),
  latMicroDeg: fc.integer({ min: -90_000_000, max: 90_000_000 }),
  lonMicroDeg: fc.integer({ min: -180_000_000, max: 180_000_000 }),
  heightMm: fc.integer({ min: -500_000, max: 9_000_000 }),
  positionBlank: fc.boolean(),
  line: fc.stringMatching(/^[A-Z]?\d{1,4}$/),
  station: fc.stringMatching(/^[A-Za-z0-9][A-Za-z0-9_-]{0,6}$/),
  /** quote each cell (delimited forms only) */
  quote: fc.boolean(),
  padCells: fc.boolean(),
  decimalComma: fc.boolean(),
  blankAfter: fc.constantFrom("", "", "", "blank", "spaces", "comment"),
});

const specArb = fc.record({
  delimiter: fc.constantFrom<LogDelimiter>(",", "\t", ";", "|", "whitespace"),
  split: fc.boolean(),
  singleStyle: fc.constantFrom<SingleStyle>("isoZ", "spaceNaive", "offset", "basic", "slash"),
  dateSep: fc.constantFrom("-", "/"),
  offsetMin: fc.integer({ min: -12 * 60, max: 14 * 60 }),
  optional: fc.record({ position: fc.boolean(), height: fc.boolean(), line: fc.boolean(), station: fc.boolean() }),
  names: fc.record({
    time: fc.nat(), date: fc.nat(), field: fc.nat(), lat: fc.nat(), lon: fc.nat(), height: fc.nat(), line: fc.nat(), station: fc.nat(),
  }),
  nameCase: fc.constantFrom("as-is", "upper", "lower"),
  order: fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { minLength: 8, maxLength: 8 }),
  eol: fc.constantFrom("\n", "\r\n"),
  bom: fc.boolean(),
  comments: fc.array(fc.stringMatching(/^[ A-Za-z0-9:,;=.()-]{0,30}$/), { maxLength: 2 }),
  quoteHeader: fc.boolean(),
  sorted: fc.boolean(),
  trailingEol: fc.boolean(),
  rows: fc.array(rowArb, { minLength: 1, maxLength: 25 }),
});

type LogSpec = typeof specArb extends fc.Arbitrary<infer T> ? T : never;

function pickName(names: readonly string[], n: number, blankFree: boolean): string {
  const usable = blankFree ? names.filter((x) => !/\s/.test(x)) : names;
  return usable[n % usable.length];
}

function casing(name: string, how: string): string {
  return how === "upper" ? name.toUpperCase() : how === "lower" ? name.toLowerCase() : name;
}

/**
 * Valid logs. `crlfQuoted: true` makes only CRLF logs with every cell quoted (a Windows
 * spreadsheet export), for the property aimed at that form; by default CRLF logs get quoted cells
 * as often as LF logs.
 */
export function validLogArb(opts: { crlfQuoted?: boolean } = {}): fc.Arbitrary<GeneratedLog> {
  return specArb.map((drawn) => {
    const spec = opts.crlfQuoted
      ? { ...drawn, eol: "\r\n" as const, delimiter: drawn.delimiter === "whitespace" ? ("," as const) : drawn.delimiter, rows: drawn.rows.map((r) => ({ ...r, quote: true })) }
      : drawn;
    return buildLog(spec);
  });
}

function buildLog(spec: LogSpec): GeneratedLog {
  const ws = spec.delimiter === "whitespace";
  // whitespace logs cannot hold a blank inside a timestamp, nor an empty cell
  const singleStyle: SingleStyle = ws && (spec.singleStyle === "spaceNaive" || spec.singleStyle === "slash") ? "isoZ" : spec.singleStyle;
  const roles: Role[] = spec.split ? ["date", "time", "field"] : ["time", "field"];
  if (spec.optional.position) roles.push("lat", "lon");
  if (spec.optional.height) roles.push("height");
  if (spec.optional.line) roles.push("line");
  if (spec.optional.station) roles.push("station");
  const ordered = roles.map((r, i) => ({ r, k: spec.order[i] })).sort((a, b) => a.k - b.k).map((x) => x.r);

  const header = ordered.map((r) => {
    const list = r === "time" && spec.split ? SPLIT_TIME_NAMES : NAMES[r];
    return casing(pickName(list, spec.names[r], ws), spec.nameCase);
  });
  const sep = ws ? "  " : spec.delimiter;
  const quoteAllowed = !ws;
  const q = (cell: string, quote: boolean) => (quoteAllowed && quote ? `"${cell.replace(/"/g, '""')}"` : cell);

  const lines: string[] = [];
  for (const c of spec.comments) lines.push(`# ${c}`);
  lines.push(header.map((h) => q(h, spec.quoteHeader)).join(sep));

  const times = spec.rows.map((r) => r.timeMs);
  if (spec.sorted) times.sort((a, b) => a - b);
  const readings: ExpectedReading[] = [];
  const rowLines = new Map<string, ExpectedReading>();
  spec.rows.forEach((row, i) => {
    const timeMs = times[i];
    const decimalComma = row.decimalComma && spec.delimiter !== ",";
    const num = (text: string) => (decimalComma ? text.replace(".", ",") : text);
    const fieldText = (row.fieldMilliNt / 1000).toFixed(row.fieldDecimals);
    const blankPos = row.positionBlank && !ws;
    const latText = blankPos ? "" : (row.latMicroDeg / 1e6).toFixed(6);
    const lonText = blankPos ? "" : (row.lonMicroDeg / 1e6).toFixed(6);
    const heightText = (row.heightMm / 1000).toFixed(3);
    const f = fields(timeMs);
    const cells: Record<Role, string> = {
      time: spec.split ? `${f.h}:${f.mi}:${f.s}.${f.ms}` : writeSingle(timeMs, singleStyle, spec.offsetMin),
      date: `${f.y}${spec.dateSep}${f.mo}${spec.dateSep}${f.d}`,
      field: num(fieldText),
      lat: num(latText),
      lon: num(lonText),
      height: num(heightText),
      line: row.line,
      station: row.station,
    };
    const padded = (c: string) => (row.padCells && !ws ? ` ${c} ` : c);
    const text = ordered.map((r) => q(padded(cells[r]), row.quote)).join(sep);
    lines.push(text);
    const expected: ExpectedReading = {
      timeMs,
      // the exact double of the fixed-point text: what any correct number reader returns
      fieldNt: Number(fieldText),
      latDeg: spec.optional.position && !blankPos ? Number(latText) : NaN,
      lonDeg: spec.optional.position && !blankPos ? Number(lonText) : NaN,
      heightM: spec.optional.height ? Number(heightText) : NaN,
      line: spec.optional.line ? row.line : "",
      station: spec.optional.station ? row.station : "",
      sourceLine: lines.length,
    };
    readings.push(expected);
    rowLines.set(text, expected);
    if (row.blankAfter === "blank") lines.push("");
    else if (row.blankAfter === "spaces") lines.push("   ");
    else if (row.blankAfter === "comment") lines.push("# pause");
  });

  let expectedIssues = 0;
  for (let i = 1; i < readings.length; i++) if (readings[i].timeMs <= readings[i - 1].timeMs) expectedIssues++;

  const text = (spec.bom ? "\uFEFF" : "") + lines.join(spec.eol) + (spec.trailingEol ? spec.eol : "");
  return {
    text,
    delimiter: spec.delimiter,
    header,
    present: { position: spec.optional.position, height: spec.optional.height, line: spec.optional.line, station: spec.optional.station },
    readings,
    rowLines,
    expectedIssues,
  };
}
