/**
 * Delimited magnetometer logs → columnar readings, with every rejected row reported.
 *
 * Pure and incremental: the caller pushes text chunks (a Node stream, a browser File, a string)
 * and nothing here holds the whole text. Complete lines are split with papaparse (comma, tab,
 * semicolon, pipe, quoted fields); whitespace-delimited logs are split on runs of blanks here,
 * since papaparse does not treat a run of spaces as one delimiter.
 *
 * Per row, in this order, the first failure rejects it (line = 1-based file line):
 * unreadable or impossible time → non-numeric / missing field → field outside the plausible range
 * → non-numeric or out-of-range lat/lon → non-numeric height. Kept rows whose time is earlier than,
 * or equal to, the previous kept row's are reported as issues (time_backwards, duplicate_time).
 * Blank lines and lines starting with `#` are skipped.
 */
import Papa from "papaparse";
import { createTimestampReader, TimestampError, type TimeReadOptions, type TimestampReader } from "../time";
import { resolveColumnMapping, type ColumnMappingResult, type ExplicitColumnMapping } from "./column-mapping";
import { detectDelimiter, type Delimiter } from "./delimiter";
import { LogFormatError } from "./log-format-error";
import { ReadingColumnsBuilder, type LogReadings } from "./reading-columns";

/** Plausible total field at the Earth's surface, nT (IGRF surface range is roughly 22 000–67 000; practice adds margin). */
export const DEFAULT_FIELD_RANGE_NT = { minNt: 10_000, maxNt: 120_000 } as const;
const DEFAULT_MAX_REPORTED_ROWS = 10_000;
const MAX_VALUE_CHARS = 80;

export type RejectReason =
  | "impossible_timestamp"
  | "missing_time"
  | "non_numeric_field"
  | "missing_field"
  | "field_out_of_range"
  | "non_numeric_position"
  | "latitude_out_of_range"
  | "longitude_out_of_range"
  | "non_numeric_height";

export type IssueReason = "time_backwards" | "duplicate_time";

export interface RowProblem<R extends string = RejectReason | IssueReason> {
  /** 1-based line of the file. */
  line: number;
  /** Header name of the column at fault. */
  column: string;
  value: string;
  reason: R;
  message: string;
}

export interface LogParseOptions extends TimeReadOptions {
  /** Role → header name or 0-based index; overrides the guess. */
  mapping?: ExplicitColumnMapping;
  /** Plausible total-field range; default 10 000–120 000 nT. */
  fieldRangeNt?: { minNt: number; maxNt: number };
  /** Force a delimiter instead of detecting it from the header line. */
  delimiter?: Delimiter;
  /** Keep at most this many rejected rows and issues in detail (counts stay exact); default 10 000. */
  maxReportedRows?: number;
}

export interface LogParseSummary {
  header: string[];
  delimiter: Delimiter;
  mapping: ColumnMappingResult;
  /** Data rows seen (not blank, not comments). */
  rowCount: number;
  acceptedCount: number;
  rejectedCount: number;
  issueCount: number;
  rejected: RowProblem<RejectReason>[];
  issues: RowProblem<IssueReason>[];
  warnings: string[];
}

export interface LogParseResult extends LogParseSummary {
  readings: LogReadings;
}

export interface LogStreamParser {
  /** Feed the next piece of text (any split, even mid-line). Throws LogFormatError on a bad header. */
  push(chunk: string): void;
  /** Finish; `readings` is null when batches went to `onBatch`. Throws LogFormatError on an empty log. */
  end(): LogParseSummary & { readings: LogReadings | null };
}

export interface LogStreamSinks {
  /** Receives the accepted readings of each pushed chunk instead of accumulating them. */
  onBatch?: (batch: LogReadings) => void;
}

function clip(value: string): string {
  return value.length > MAX_VALUE_CHARS ? value.slice(0, MAX_VALUE_CHARS) + "…" : value;
}

function isBlank(s: string | undefined): boolean {
  return s === undefined || s.trim().length === 0;
}

/** Number from a cell; NaN when not a finite number. `decimalComma` also accepts `48310,5`. */
function readNumber(s: string, decimalComma: boolean): number {
  const v = +s;
  if (v === v && s.length > 0) {
    if (v === 0 && s.trim().length === 0) return NaN;
    return Number.isFinite(v) ? v : NaN;
  }
  if (decimalComma && s.indexOf(",") >= 0) {
    const w = +s.replace(",", ".");
    return Number.isFinite(w) ? w : NaN;
  }
  return NaN;
}

const LOOKS_LIKE_DATA = /^[\s\d.,:+\-/TZ]+$/;

export function createLogStreamParser(options: LogParseOptions = {}, sinks: LogStreamSinks = {}): LogStreamParser {
  const range = options.fieldRangeNt ?? DEFAULT_FIELD_RANGE_NT;
  if (!(range.minNt < range.maxNt)) throw new RangeError("plausible field range needs minNt < maxNt");
  const maxReported = options.maxReportedRows ?? DEFAULT_MAX_REPORTED_ROWS;
  const reader: TimestampReader = createTimestampReader(options);

  let pending = "";
  let started = false;
  let lineNo = 0;
  let header: string[] | null = null;
  let delimiter: Delimiter = ",";
  let mapping: ColumnMappingResult | null = null;
  let builder: ReadingColumnsBuilder | null = null;
  let accumulated: ReadingColumnsBuilder | null = null;
  let decimalComma = false;
  let rowCount = 0;
  let rejectedCount = 0;
  let issueCount = 0;
  const rejected: RowProblem<RejectReason>[] = [];
  const issues: RowProblem<IssueReason>[] = [];
  const warnings: string[] = [];
  let prevTimeMs = NaN;

  // column indices (−1 absent) and names, set with the header
  let iTime = -1, iDate = -1, iField = -1, iLat = -1, iLon = -1, iHeight = -1, iLine = -1, iStation = -1;
  let nameOf: (i: number) => string = () => "";

  function reject(line: number, col: number, value: string, reason: RejectReason, message: string): void {
    rejectedCount++;
    if (rejected.length < maxReported) rejected.push({ line, column: nameOf(col), value: clip(value), reason, message });
  }

  function issue(line: number, col: number, value: string, reason: IssueReason, message: string): void {
    issueCount++;
    if (issues.length < maxReported) issues.push({ line, column: nameOf(col), value: clip(value), reason, message });
  }

  function setHeader(cells: string[], line: number): void {
    header = cells.map((c) => c.replace(/^\uFEFF/, "").trim());
    if (header.every((c) => c.length === 0 || LOOKS_LIKE_DATA.test(c))) {
      throw new LogFormatError(`line ${line} looks like data, not a header: the first line must name the columns (time, field, …)`);
    }
    mapping = resolveColumnMapping(header, options.mapping);
    warnings.push(...mapping.warnings);
    const ix = mapping.indices;
    iTime = ix.time ?? -1;
    iDate = ix.date ?? -1;
    iField = ix.field ?? -1;
    iLat = ix.lat ?? -1;
    iLon = ix.lon ?? -1;
    iHeight = ix.height ?? -1;
    iLine = ix.line ?? -1;
    iStation = ix.station ?? -1;
    const names = header;
    nameOf = (i) => names[i] ?? `column ${i + 1}`;
    decimalComma = delimiter !== ",";
    builder = newBuilder();
    if (iLat < 0) warnings.push("no latitude/longitude columns: the reference field cannot be computed for these readings");
  }

  function newBuilder(): ReadingColumnsBuilder {
    return new ReadingColumnsBuilder({ position: iLat >= 0, height: iHeight >= 0, line: iLine >= 0, station: iStation >= 0 });
  }

  function processRow(cells: string[], line: number): void {
    const n = cells.length;
    if (n === 1 && isBlank(cells[0])) return;
    const first = cells[0];
    if (first.length > 0 && first.charCodeAt(0) === 35 /* # */) return;
    const last = cells[n - 1];
    if (last.length > 0 && last.charCodeAt(last.length - 1) === 13) cells[n - 1] = last.slice(0, -1);
    if (header === null) {
      setHeader(cells, line);
      return;
    }
    if (cells.every(isBlank)) return;
    rowCount++;

    // time
    let timeMs: number;
    const timeText = cells[iTime];
    if (isBlank(timeText) || (iDate >= 0 && isBlank(cells[iDate]))) {
      reject(line, isBlank(timeText) ? iTime : iDate, timeText ?? "", "missing_time", "no time");
      return;
    }
    try {
      if (iDate >= 0) {
        try {
          timeMs = reader.parseDateAndTime(cells[iDate], timeText);
        } catch (e) {
          timeMs = reader.parse(timeText); // a time column that already holds the date
          void e;
        }
      } else {
        timeMs = reader.parse(timeText);
      }
    } catch (e) {
      if (!(e instanceof TimestampError)) throw e;
      const shown = iDate >= 0 ? `${cells[iDate]} ${timeText}` : timeText;
      reject(line, iTime, shown, "impossible_timestamp", e.message);
      return;
    }

    // field
    const fieldText = cells[iField];
    if (isBlank(fieldText)) {
      reject(line, iField, fieldText ?? "", "missing_field", "no total-field value");
      return;
    }
    const fieldNt = readNumber(fieldText, decimalComma);
    if (fieldNt !== fieldNt) {
      reject(line, iField, fieldText, "non_numeric_field", `total field "${clip(fieldText)}" is not a number`);
      return;
    }
    if (fieldNt < range.minNt || fieldNt > range.maxNt) {
      reject(line, iField, fieldText, "field_out_of_range", `total field ${fieldNt} nT is outside the plausible ${range.minNt}–${range.maxNt} nT`);
      return;
    }

    // position
    let latDeg = NaN, lonDeg = NaN, heightM = NaN;
    if (iLat >= 0) {
      const latText = cells[iLat], lonText = cells[iLon];
      const latEmpty = isBlank(latText), lonEmpty = isBlank(lonText);
      if (!latEmpty || !lonEmpty) {
        latDeg = latEmpty ? NaN : readNumber(latText, decimalComma);
        lonDeg = lonEmpty ? NaN : readNumber(lonText, decimalComma);
        if (latDeg !== latDeg) {
          reject(line, iLat, latText ?? "", "non_numeric_position", `latitude "${clip(latText ?? "")}" is not a number`);
          return;
        }
        if (lonDeg !== lonDeg) {
          reject(line, iLon, lonText ?? "", "non_numeric_position", `longitude "${clip(lonText ?? "")}" is not a number`);
          return;
        }
        if (latDeg < -90 || latDeg > 90) {
          reject(line, iLat, latText, "latitude_out_of_range", `latitude ${latDeg}° is outside −90…90°`);
          return;
        }
        if (lonDeg < -180 || lonDeg > 180) {
          reject(line, iLon, lonText, "longitude_out_of_range", `longitude ${lonDeg}° is outside −180…180°`);
          return;
        }
      }
    }
    if (iHeight >= 0) {
      const hText = cells[iHeight];
      if (!isBlank(hText)) {
        heightM = readNumber(hText, decimalComma);
        if (heightM !== heightM) {
          reject(line, iHeight, hText, "non_numeric_height", `height "${clip(hText)}" is not a number`);
          return;
        }
      }
    }

    if (timeMs < prevTimeMs) {
      issue(line, iTime, timeText, "time_backwards", `time goes backwards by ${((prevTimeMs - timeMs) / 1000).toFixed(3)} s`);
    } else if (timeMs === prevTimeMs) {
      issue(line, iTime, timeText, "duplicate_time", "same time as the previous reading");
    }
    prevTimeMs = timeMs;
    const lineText = iLine >= 0 ? (cells[iLine] ?? "").trim() : "";
    const stationText = iStation >= 0 ? (cells[iStation] ?? "").trim() : "";
    builder!.push(timeMs, fieldNt, latDeg, lonDeg, heightM, lineText, stationText, line);
  }

  /** Split complete lines (no trailing newline) and process each row. */
  function processBlock(block: string): void {
    if (block.length === 0) {
      lineNo++; // one empty line
      return;
    }
    if (delimiter === "whitespace") {
      let at = 0;
      while (at <= block.length) {
        let nl = block.indexOf("\n", at);
        if (nl < 0) nl = block.length;
        lineNo++;
        const text = block.slice(at, nl).trim();
        if (text.length > 0) processRow(text.split(/\s+/), lineNo);
        at = nl + 1;
      }
      return;
    }
    const hasQuotes = block.indexOf('"') >= 0;
    const rows = Papa.parse<string[]>(block, { delimiter, newline: "\n", header: false, skipEmptyLines: false }).data;
    for (let r = 0; r < rows.length; r++) {
      const cells = rows[r];
      lineNo++;
      const line = lineNo;
      if (hasQuotes) {
        for (const c of cells) for (let k = c.indexOf("\n"); k >= 0; k = c.indexOf("\n", k + 1)) lineNo++;
      }
      processRow(cells, line);
    }
  }

  function startIfNeeded(): boolean {
    if (started) return true;
    const nl = pending.indexOf("\n");
    if (nl < 0) return false;
    if (pending.charCodeAt(0) === 0xfeff) pending = pending.slice(1);
    // detect on the first line that is neither blank nor a comment
    let at = 0;
    for (;;) {
      const e = pending.indexOf("\n", at);
      if (e < 0) return false;
      const line = pending.slice(at, e).trim();
      if (line.length > 0 && !line.startsWith("#")) {
        delimiter = options.delimiter ?? detectDelimiter(line);
        break;
      }
      at = e + 1;
    }
    started = true;
    return true;
  }

  function cutCompleteLines(final: boolean): void {
    if (!startIfNeeded()) {
      if (!final) return;
      if (pending.charCodeAt(0) === 0xfeff) pending = pending.slice(1);
      const line = pending.trim();
      if (line.length === 0) return;
      delimiter = options.delimiter ?? detectDelimiter(line);
      started = true;
    }
    const cut = final ? pending.length : pending.lastIndexOf("\n");
    if (cut < 0) return;
    const block = pending.slice(0, cut);
    if (!final && delimiter !== "whitespace" && block.indexOf('"') >= 0) {
      let quotes = 0;
      for (let k = block.indexOf('"'); k >= 0; k = block.indexOf('"', k + 1)) quotes++;
      if (quotes % 2 === 1) return; // a quoted field runs on: wait for more text
    }
    pending = final ? "" : pending.slice(cut + 1);
    if (block.length === 0 && final) return;
    processBlock(block);
    if (sinks.onBatch && builder && builder.count > 0) {
      sinks.onBatch(builder.build());
      builder = newBuilder();
    }
  }

  return {
    push(chunk: string): void {
      pending += chunk;
      cutCompleteLines(false);
    },
    end() {
      cutCompleteLines(true);
      if (header === null) throw new LogFormatError("the log is empty: expected a header row and readings");
      accumulated = builder;
      const summary: LogParseSummary = {
        header,
        delimiter,
        mapping: mapping!,
        rowCount,
        acceptedCount: rowCount - rejectedCount,
        rejectedCount,
        issueCount,
        rejected,
        issues,
        warnings,
      };
      if (rowCount === 0) warnings.push("the log has a header but no readings");
      return { ...summary, readings: sinks.onBatch ? null : accumulated!.build() };
    },
  };
}

/** Whole text at once (tests, small uploads): same rules as the stream parser. */
export function parseLogText(text: string, options: LogParseOptions = {}): LogParseResult {
  const parser = createLogStreamParser(options);
  parser.push(text);
  const result = parser.end();
  return { ...result, readings: result.readings! };
}
