/**
 * Header names → column roles. Names are compared case-insensitively after dropping bracketed
 * units (`Field (nT)`, `Lat[deg]`), unit and qualifier words or suffixes (`height_m`, `time UTC`)
 * and punctuation; synonyms per role below.
 */
import { LogFormatError } from "./log-format-error";

export type ColumnRole = "time" | "date" | "field" | "lat" | "lon" | "height" | "line" | "station";

/** 0-based column index per role; `time` alone holds a full timestamp, `date` + `time` split it. */
export type ColumnIndices = Partial<Record<ColumnRole, number>>;

/** An explicit mapping: role → header name (as written, case-insensitive) or 0-based index. */
export type ExplicitColumnMapping = Partial<Record<ColumnRole, string | number>>;

export interface ColumnMappingResult {
  indices: ColumnIndices;
  /** Header name per mapped role, as written in the file. */
  names: Partial<Record<ColumnRole, string>>;
  warnings: string[];
}

/** Joined keys (lowercase, no separators) that name each role. A full timestamp also matches TIMESTAMP_KEYS. */
const ROLE_KEYS: Record<ColumnRole, readonly string[]> = {
  time: ["time", "timestamp", "datetime", "utc", "utctime", "timeutc"],
  date: ["date", "day"],
  field: ["field", "totalfield", "tmi", "nt", "mag", "f", "magfield", "magneticfield", "totalmagneticfield", "totalintensity", "tf"],
  lat: ["lat", "latitude"],
  lon: ["lon", "long", "longitude", "lng"],
  height: ["elev", "elevation", "height", "alt", "altitude", "ellipsoidheight", "heightellipsoid"],
  line: ["line", "lineid", "lineno", "linenumber", "linename"],
  station: ["station", "stationid", "stn", "stationno", "stationnumber", "stationname"],
};
const TIMESTAMP_KEYS = new Set(["timestamp", "datetime", "utc", "utctime", "timeutc"]);

/** Words that only carry a unit or a qualifier; dropped unless nothing else is left. */
const UNIT_WORDS = new Set([
  "nt", "nanotesla", "nanoteslas", "gamma", "gammas", "m", "metre", "metres", "meter", "meters", "masl", "amsl",
  "deg", "degree", "degrees", "dd", "decdeg", "wgs84", "utc", "gps", "local", "iso", "iso8601", "ms",
]);
const UNIT_SUFFIXES = ["nt", "m", "deg", "degrees"];

/** `Field (nT)` → `field`; `height_m` → `height`; `Total Field` → `totalfield`; `nT` → `nt`. */
export function headerKey(name: string): string {
  const bare = name
    .replace(/^\uFEFF/, "")
    .toLowerCase()
    .replace(/\([^)]*\)|\[[^\]]*\]|\{[^}]*\}/g, " ");
  const tokens = bare.split(/[^a-z0-9]+/).filter((t) => t.length > 0);
  const kept = tokens.filter((t) => !UNIT_WORDS.has(t));
  return (kept.length > 0 ? kept : tokens).join("");
}

function roleOfKey(key: string): ColumnRole | null {
  for (const role of Object.keys(ROLE_KEYS) as ColumnRole[]) {
    if (ROLE_KEYS[role].includes(key)) return role;
  }
  for (const suffix of UNIT_SUFFIXES) {
    if (key.length > suffix.length && key.endsWith(suffix)) {
      const stem = key.slice(0, -suffix.length);
      for (const role of Object.keys(ROLE_KEYS) as ColumnRole[]) {
        if (ROLE_KEYS[role].includes(stem)) return role;
      }
    }
  }
  return null;
}

/** Guess roles from header names; first match wins, later candidates give a warning. */
export function guessColumnMapping(headers: readonly string[]): ColumnMappingResult {
  const indices: ColumnIndices = {};
  const names: Partial<Record<ColumnRole, string>> = {};
  const warnings: string[] = [];
  let fullTimestampIndex = -1;
  headers.forEach((header, i) => {
    const key = headerKey(header);
    const role = roleOfKey(key);
    if (!role) return;
    if (role === "time" && TIMESTAMP_KEYS.has(key) && fullTimestampIndex < 0) fullTimestampIndex = i;
    if (indices[role] === undefined) {
      indices[role] = i;
      names[role] = header;
    } else {
      warnings.push(`column "${header}" also looks like ${role}; using "${names[role]}"`);
    }
    if (/\bgps\b/i.test(header) && (role === "time" || role === "date")) {
      warnings.push(`column "${header}" names GPS time: set the log's time basis to gps if its clock is GPS`);
    }
  });
  // A column named timestamp/datetime/utc is a full timestamp and beats a date + time pair.
  if (fullTimestampIndex >= 0 && indices.time !== fullTimestampIndex) {
    indices.time = fullTimestampIndex;
    names.time = headers[fullTimestampIndex];
  }
  if (fullTimestampIndex >= 0 && indices.date !== undefined) {
    delete indices.date;
    delete names.date;
  }
  return { indices, names, warnings };
}

function findHeader(headers: readonly string[], wanted: string | number, role: ColumnRole): number {
  if (typeof wanted === "number") {
    if (!Number.isInteger(wanted) || wanted < 0 || wanted >= headers.length) {
      throw new LogFormatError(`column index ${wanted} for ${role} is outside 0–${headers.length - 1}`);
    }
    return wanted;
  }
  const exact = headers.findIndex((h) => h.trim().toLowerCase() === wanted.trim().toLowerCase());
  if (exact >= 0) return exact;
  const key = headerKey(wanted);
  const loose = headers.findIndex((h) => headerKey(h) === key);
  if (loose >= 0) return loose;
  throw new LogFormatError(`no column "${wanted}" for ${role}; columns are: ${headers.join(", ")}`);
}

/** Guess, apply the explicit mapping on top, and check that a time and a total-field column exist. */
export function resolveColumnMapping(headers: readonly string[], explicit: ExplicitColumnMapping = {}): ColumnMappingResult {
  const result = guessColumnMapping(headers);
  for (const role of Object.keys(explicit) as ColumnRole[]) {
    const wanted = explicit[role];
    if (wanted === undefined) continue;
    const i = findHeader(headers, wanted, role);
    result.indices[role] = i;
    result.names[role] = headers[i];
    if (role === "time" && explicit.date === undefined) {
      // an explicit time column stands alone unless a date column is named too
      if (TIMESTAMP_KEYS.has(headerKey(headers[i]))) {
        delete result.indices.date;
        delete result.names.date;
      }
    }
  }
  const listed = headers.map((h) => `"${h}"`).join(", ");
  if (result.indices.field === undefined) {
    throw new LogFormatError(
      `no total-field column: expected a header such as field, total field, tmi, nt, mag or f (units like "(nT)" are fine); found ${listed}`,
    );
  }
  if (result.indices.time === undefined) {
    throw new LogFormatError(`no time column: expected time, timestamp, datetime or utc (or date + time); found ${listed}`);
  }
  if ((result.indices.lat === undefined) !== (result.indices.lon === undefined)) {
    result.warnings.push("only one of latitude/longitude found: positions are not read");
    delete result.indices.lat;
    delete result.indices.lon;
    delete result.names.lat;
    delete result.names.lon;
  }
  return result;
}
