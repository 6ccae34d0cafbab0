/**
 * Delimited magnetometer logs → columnar readings, with every rejected row reported.
 *
 * Pure and incremental: the caller pushes chunks, UTF-8 bytes (a Node stream, a browser File) or
 * text, split anywhere; nothing here holds the whole log, only the unfinished last line.
 * Complete lines are cut into cells in one pass over the bytes when a block holds no quote
 * character (the usual instrument log: numbers and times are read from the bytes, no string per
 * cell); a block with quotes goes through papaparse (RFC 4180 quoting, quoted line breaks), and
 * a test holds both paths to the same result. Whitespace-delimited logs are split on runs of
 * blanks here, since papaparse does not treat a run of spaces as one delimiter.
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
import { parseDecimalBytes, readDecimalPrefix } from "./decimal-span";
import { ReadingColumnsBuilder, ROW_FIELD, ROW_HEIGHT, ROW_LAT, ROW_LON, ROW_TIME, type LogReadings } from "./reading-columns";

/** Plausible total field at the Earth's surface, nT (IGRF surface range is roughly 22 000–67 000; practice adds margin). */
export const DEFAULT_FIELD_RANGE_NT = { minNt: 10_000, maxNt: 120_000 } as const;
const DEFAULT_MAX_REPORTED_ROWS = 10_000;
/** Most readings a size hint may reserve room for (beyond it the columns grow by doubling). */
const MAX_HINTED_ROWS = 1 << 22;
/** Room reserved over the lines estimated from the size hint. */
const HINT_MARGIN = 1.02;
/** Lines read before the bytes per line are taken as the file's. */
const HINT_MIN_LINES = 256;
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
  /**
   * Size of the whole log in bytes when known (a file): the reading columns are sized once, from
   * it and the bytes per line of the first block read, instead of grown by doubling. A hint only:
   * any value, too small or too large, gives the same result.
   */
  sizeHintBytes?: number;
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
  /**
   * Feed the next piece of the log, as text or UTF-8 bytes (any split, even mid-line or mid-character).
   * Throws LogFormatError on a bad header.
   */
  push(chunk: string | Uint8Array): void;
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

/** Number from a cell's text; NaN when not a finite number. `decimalComma` also accepts `48310,5`. */
function readNumber(s: string, decimalComma: boolean): number {
  const t = s.trim();
  if (t.length === 0) return NaN;
  const v = +t;
  if (v === v) return Number.isFinite(v) ? v : NaN;
  if (decimalComma && t.indexOf(",") >= 0) {
    const w = +t.replace(",", ".");
    return Number.isFinite(w) ? w : NaN;
  }
  return NaN;
}

/** The "no previous text cell" marker of the line/station string cache (no non-blank cell equals it). */
const NO_BYTES = new Uint8Array(0);
const LOOKS_LIKE_DATA = /^[\s\d.,:+\-/TZ]+$/;
const INITIAL_CELLS = 64;
const KIND_NUMBER = 1;
const KIND_TIME = 2;
const ROW_PREV_TIME = 5;
// Module-level copies for the hot loop: an imported binding may be read through a getter per use
// (CommonJS interop of the TypeScript loader), a local constant is not.
const readDecimal = readDecimalPrefix;
const SLOT_TIME = ROW_TIME, SLOT_FIELD = ROW_FIELD, SLOT_LAT = ROW_LAT, SLOT_LON = ROW_LON, SLOT_HEIGHT = ROW_HEIGHT;
const LF = 10;
const CR = 13;
const QUOTE = 34;
const HASH = 35;
const UTF8_DECODER = new TextDecoder("utf-8");
const UTF8_ENCODER = new TextEncoder();

function isPadding(c: number): boolean {
  return c === 32 || c === 9 || c === CR;
}

/** Append b to a (a new array). */
function concatBytes(a: Uint8Array, b: Uint8Array): Uint8Array {
  if (a.length === 0) return b;
  const out = new Uint8Array(a.length + b.length);
  out.set(a, 0);
  out.set(b, a.length);
  return out;
}

export function createLogStreamParser(options: LogParseOptions = {}, sinks: LogStreamSinks = {}): LogStreamParser {
  const range = options.fieldRangeNt ?? DEFAULT_FIELD_RANGE_NT;
  if (!(range.minNt < range.maxNt)) throw new RangeError("plausible field range needs minNt < maxNt");
  const minNt = range.minNt, maxNt = range.maxNt;
  const maxReported = options.maxReportedRows ?? DEFAULT_MAX_REPORTED_ROWS;
  const reader: TimestampReader = createTimestampReader(options);

  let pending: Uint8Array = new Uint8Array(0);
  let atStreamStart = true;
  let started = false;
  let lineNo = 0;
  let header: string[] | null = null;
  let delimiter: Delimiter = ",";
  let mapping: ColumnMappingResult | null = null;
  let builder: ReadingColumnsBuilder | null = null;
  let decimalComma = false;
  let rowCount = 0;
  let rejectedCount = 0;
  let issueCount = 0;
  const rejected: RowProblem<RejectReason>[] = [];
  const issues: RowProblem<IssueReason>[] = [];
  const warnings: string[] = [];
  // Per-row numbers live in typed slots: a double kept in a closure variable or passed to a call
  // that is not inlined is boxed, one heap allocation per row.
  // row[ROW_*]: the reading being built; row[ROW_PREV_TIME]: time of the previous kept row
  const row = new Float64Array(6);
  row[ROW_PREV_TIME] = NaN;
  // size hint: bytes pushed so far, and whether room was reserved already
  const sizeHintBytes = options.sizeHintBytes;
  let bytesPushed = 0;
  let sized = !(sizeHintBytes !== undefined && sizeHintBytes > 0 && Number.isFinite(sizeHintBytes)) || sinks.onBatch !== undefined;
  let lastLine = "";
  let lastLineBytes = NO_BYTES;
  let lastStation = "";
  let lastStationBytes = NO_BYTES;

  // The current row: cell i is src[cellStart[i], cellEnd[i]) (UTF-8 bytes), padding trimmed.
  let cellStart = new Int32Array(INITIAL_CELLS);
  let cellEnd = new Int32Array(INITIAL_CELLS);
  // cellValue[i]: the number of cell i when a numeric column's cell was read during the cut, else NaN
  let cellValue = new Float64Array(INITIAL_CELLS);
  // per column: KIND_NUMBER for the field, lat, lon and height columns (set with the header)
  let cellKinds = new Uint8Array(0);
  // length of the last time cell cut by scanning: the guess for the next row's
  let timeChars = 0;
  let cellCount = 0;

  // column indices (−1 absent), set with the header
  let iTime = -1, iDate = -1, iField = -1, iLat = -1, iLon = -1, iHeight = -1, iLine = -1, iStation = -1;
  let nameOf: (i: number) => string = () => "";

  function pushCell(src: Uint8Array, from: number, to: number): void {
    if (from < to && isPadding(src[from])) while (from < to && isPadding(src[from])) from++;
    if (to > from && isPadding(src[to - 1])) while (to > from && isPadding(src[to - 1])) to--;
    if (cellCount === cellStart.length) growCells();
    cellStart[cellCount] = from;
    cellEnd[cellCount] = to;
    cellValue[cellCount] = NaN;
    cellCount++;
  }

  function growCells(): void {
    const a = new Int32Array(cellStart.length * 2), b = new Int32Array(cellStart.length * 2);
    const v = new Float64Array(cellStart.length * 2);
    a.set(cellStart);
    b.set(cellEnd);
    v.set(cellValue);
    cellStart = a;
    cellEnd = b;
    cellValue = v;
  }

  const blank = (i: number) => i >= cellCount || cellStart[i] === cellEnd[i];
  const textOf = (src: Uint8Array, i: number) => (i < cellCount ? UTF8_DECODER.decode(src.subarray(cellStart[i], cellEnd[i])) : "");

  function numberOf(src: Uint8Array, i: number): number {
    const read = cellValue[i];
    if (read === read) return read;
    const v = parseDecimalBytes(src, cellStart[i], cellEnd[i], decimalComma);
    return v === v ? v : readNumber(textOf(src, i), decimalComma);
  }

  /** True when cell i holds exactly `bytes`. */
  function cellEquals(src: Uint8Array, i: number, bytes: Uint8Array): boolean {
    const from = cellStart[i];
    if (cellEnd[i] - from !== bytes.length) return false;
    for (let k = bytes.length - 1; k >= 0; k--) if (src[from + k] !== bytes[k]) return false;
    return true;
  }

  function reject(line: number, col: number, value: string, reason: RejectReason, message: string): void {
    rejectedCount++;
    if (rejected.length < maxReported) rejected.push({ line, column: nameOf(col), value: clip(value), reason, message });
  }

  function issue(line: number, col: number, value: string, reason: IssueReason, message: string): void {
    issueCount++;
    if (issues.length < maxReported) issues.push({ line, column: nameOf(col), value: clip(value), reason, message });
  }

  function setHeader(cells: string[], line: number): void {
    header = cells;
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
    const numeric = [iField, iLat, iLon, iHeight];
    cellKinds = new Uint8Array(Math.max(header.length, ...numeric) + 1);
    for (const i of numeric) if (i >= 0) cellKinds[i] = KIND_NUMBER;
    if (iDate < 0 && iTime >= 0 && cellKinds[iTime] === 0) cellKinds[iTime] = KIND_TIME;
    builder = newBuilder();
  }

  function newBuilder(): ReadingColumnsBuilder {
    return new ReadingColumnsBuilder({ position: iLat >= 0, height: iHeight >= 0, line: iLine >= 0, station: iStation >= 0 });
  }

  /** The row held in cellStart/cellEnd over src. */
  function processRow(src: Uint8Array, line: number): void {
    const count = cellCount, starts = cellStart, ends = cellEnd;
    if (count === 0) return;
    if (starts[0] === ends[0]) {
      let i = 1;
      while (i < count && starts[i] === ends[i]) i++;
      if (i === count) return; // blank line
    } else if (src[starts[0]] === HASH) {
      return; // comment
    }
    if (header === null) {
      const cells: string[] = [];
      for (let i = 0; i < cellCount; i++) cells.push(textOf(src, i));
      setHeader(cells, line);
      return;
    }
    rowCount++;

    // time
    let timeMs: number;
    if (blank(iTime) || (iDate >= 0 && blank(iDate))) {
      const col = blank(iTime) ? iTime : iDate;
      reject(line, col, textOf(src, col), "missing_time", "no time");
      return;
    }
    const timeFrom = starts[iTime], timeTo = ends[iTime];
    try {
      if (iDate >= 0) {
        const timeText = textOf(src, iTime);
        try {
          timeMs = reader.parseDateAndTime(textOf(src, iDate), timeText);
        } catch {
          timeMs = reader.parse(timeText); // a time column that already holds the date
        }
      } else {
        timeMs = cellValue[iTime];
        if (timeMs !== timeMs) timeMs = reader.parseBytes(src, timeFrom, timeTo); // not read with the cut
      }
    } catch (e) {
      if (!(e instanceof TimestampError)) throw e;
      const shown = iDate >= 0 ? `${textOf(src, iDate)} ${textOf(src, iTime)}` : textOf(src, iTime);
      reject(line, iTime, shown, "impossible_timestamp", e.message);
      return;
    }

    // field
    if (blank(iField)) {
      reject(line, iField, "", "missing_field", "no total-field value");
      return;
    }
    const values = cellValue;
    let fieldNt = values[iField];
    if (fieldNt !== fieldNt) fieldNt = numberOf(src, iField);
    if (fieldNt !== fieldNt) {
      const t = textOf(src, iField);
      reject(line, iField, t, "non_numeric_field", `total field "${clip(t)}" is not a number`);
      return;
    }
    if (fieldNt < minNt || fieldNt > maxNt) {
      reject(line, iField, textOf(src, iField), "field_out_of_range", `total field ${fieldNt} nT is outside the plausible ${range.minNt}–${range.maxNt} nT`);
      return;
    }

    // position
    let latDeg = NaN, lonDeg = NaN, heightM = NaN;
    if (iLat >= 0) {
      const latEmpty = blank(iLat), lonEmpty = blank(iLon);
      if (!latEmpty || !lonEmpty) {
        latDeg = latEmpty ? NaN : values[iLat];
        if (latDeg !== latDeg && !latEmpty) latDeg = numberOf(src, iLat);
        lonDeg = lonEmpty ? NaN : values[iLon];
        if (lonDeg !== lonDeg && !lonEmpty) lonDeg = numberOf(src, iLon);
        if (latDeg !== latDeg) {
          const t = textOf(src, iLat);
          reject(line, iLat, t, "non_numeric_position", `latitude "${clip(t)}" is not a number`);
          return;
        }
        if (lonDeg !== lonDeg) {
          const t = textOf(src, iLon);
          reject(line, iLon, t, "non_numeric_position", `longitude "${clip(t)}" is not a number`);
          return;
        }
        if (latDeg < -90 || latDeg > 90) {
          reject(line, iLat, textOf(src, iLat), "latitude_out_of_range", `latitude ${latDeg}° is outside −90…90°`);
          return;
        }
        if (lonDeg < -180 || lonDeg > 180) {
          reject(line, iLon, textOf(src, iLon), "longitude_out_of_range", `longitude ${lonDeg}° is outside −180…180°`);
          return;
        }
      }
    }
    if (iHeight >= 0 && !blank(iHeight)) {
      heightM = values[iHeight];
      if (heightM !== heightM) heightM = numberOf(src, iHeight);
      if (heightM !== heightM) {
        const t = textOf(src, iHeight);
        reject(line, iHeight, t, "non_numeric_height", `height "${clip(t)}" is not a number`);
        return;
      }
    }

    const prevTimeMs = row[ROW_PREV_TIME];
    if (timeMs < prevTimeMs) {
      issue(line, iTime, textOf(src, iTime), "time_backwards", `time goes backwards by ${((prevTimeMs - timeMs) / 1000).toFixed(3)} s`);
    } else if (timeMs === prevTimeMs) {
      issue(line, iTime, textOf(src, iTime), "duplicate_time", "same time as the previous reading");
    }
    row[ROW_PREV_TIME] = timeMs;
    // text cells: consecutive equal values share one string (a survey line spans thousands of rows)
    let lineName = "";
    if (iLine >= 0) {
      if (blank(iLine)) {
        lastLine = "";
        lastLineBytes = NO_BYTES; // else the value before the blank would still count as current
      } else if (!cellEquals(src, iLine, lastLineBytes)) {
        lastLineBytes = src.slice(starts[iLine], ends[iLine]);
        lastLine = UTF8_DECODER.decode(lastLineBytes);
        lineName = lastLine;
      } else {
        lineName = lastLine;
      }
    }
    let stationName = "";
    if (iStation >= 0) {
      if (blank(iStation)) {
        lastStation = "";
        lastStationBytes = NO_BYTES;
      } else if (!cellEquals(src, iStation, lastStationBytes)) {
        lastStationBytes = src.slice(starts[iStation], ends[iStation]);
        lastStation = UTF8_DECODER.decode(lastStationBytes);
        stationName = lastStation;
      } else {
        stationName = lastStation;
      }
    }
    row[SLOT_TIME] = timeMs;
    row[SLOT_FIELD] = fieldNt;
    row[SLOT_LAT] = latDeg;
    row[SLOT_LON] = lonDeg;
    row[SLOT_HEIGHT] = heightM;
    builder!.pushRow(row, lineName, stationName, line);
  }

  /**
   * Complete lines (no trailing line feed) as UTF-8 bytes. Unquoted delimited text is split here in
   * one pass over the bytes, without a string per cell; from the first line holding a quote on, the
   * block goes through papaparse, whose cells are joined and re-encoded so the same row code reads
   * them. With `mayWait`, a quoted part whose quotes do not pair up is not read: its offset in the
   * block is returned so the caller keeps it for more text; otherwise the result is −1.
   */
  function processBlock(block: Uint8Array, mayWait: boolean): number {
    const n = block.length;
    if (n === 0) {
      lineNo++; // one empty line
      return -1;
    }
    if (delimiter === "whitespace") {
      processWhitespaceBlock(block);
      return -1;
    }
    const quotedFrom = scanDelimited(block, delimiter.charCodeAt(0));
    if (quotedFrom < 0) return -1;
    const quoted = block.subarray(quotedFrom);
    if (mayWait && quotedRunOn(quoted)) return quotedFrom;
    // papaparse accepts blanks or a CR between a closing quote and a line feed, but at the very
    // end of its input it keeps the quote (`"10000"\r` → `10000"\r`): a CRLF file's row ending in
    // a quoted cell, cut here at its LF, would lose its number. Trailing padding is dropped first
    // (pushCell trims it from the last cell anyway).
    let end = quoted.length;
    while (end > 0 && isPadding(quoted[end - 1])) end--;
    processQuotedBlock(UTF8_DECODER.decode(quoted.subarray(0, end)));
    return -1;
  }

  /** Lines split on runs of blanks (tabs, spaces), quotes read as text. */
  function processWhitespaceBlock(block: Uint8Array): void {
    const n = block.length;
    let at = 0;
    while (at <= n) {
      let nl = block.indexOf(LF, at);
      if (nl < 0) nl = n;
      lineNo++;
      cellCount = 0;
      let k = at;
      while (k < nl) {
        while (k < nl && isPadding(block[k])) k++;
        if (k >= nl) break;
        const from = k;
        while (k < nl && !isPadding(block[k])) k++;
        pushCell(block, from, k);
      }
      if (cellCount > 0) processRow(block, lineNo);
      at = nl + 1;
    }
  }

  /**
   * Unquoted text with a one-character delimiter: each line is cut into cells and handed to
   * processRow, in one pass over the bytes. A cell of a numeric column (field, lat, lon, height) is
   * read as a number in the same pass when it is a plain decimal ending at the delimiter, line end
   * or a CRLF (see readDecimalPrefix for the exact-result rule), and the time cell (no separate
   * date column) when it has the reader's fixed layout; any other form (padding, exponent, long
   * mantissa, another time format, garbage) is left for processRow's full reading. Padding is
   * trimmed only where a cell starts or ends with a blank or CR. Stops at the first line holding a
   * quote (every byte is seen either by those readers, which take no quote, or by the cell scan)
   * and returns that line's offset, its row unread; −1 when every line was read.
   */
  function scanDelimited(block: Uint8Array, delimCode: number): number {
    const n = block.length;
    const pointComma = decimalComma;
    const times = reader;
    let starts = cellStart;
    let ends = cellEnd;
    let values = cellValue;
    let at = 0;
    while (at <= n) {
      const kinds = cellKinds; // set by the header line, which this loop may have just read
      const kindCount = kinds.length;
      let count = 0;
      let k = at;
      for (;;) {
        if (count === starts.length) {
          cellCount = count;
          growCells();
          starts = cellStart;
          ends = cellEnd;
          values = cellValue;
        }
        let from = k;
        let c = 0;
        const kind = count < kindCount ? kinds[count] : 0;
        if (kind !== 0) {
          // A number (plain decimal) or a timestamp read in place, the cell's end found on the way:
          // a number ends where its digits do; a timestamp is guessed as long as the last one and
          // taken when it has the fixed layout, which checks every byte (so it holds no delimiter,
          // line end or quote). Either must be followed by the delimiter, the line end or a CRLF.
          let i = kind === KIND_TIME ? k + timeChars : readDecimal(block, k, n, pointComma, values, count);
          c = i < n ? block[i] : LF;
          const end = i;
          if (c === CR && (i + 1 >= n || block[i + 1] === LF)) {
            i++; // CRLF: the CR is padding of the last cell
            c = LF;
          }
          const read =
            (c === delimCode || c === LF) &&
            (kind === KIND_TIME ? timeChars > 0 && end <= n && times.readFixedBytes(block, k, end, values, count) : values[count] === values[count]);
          if (read) {
            starts[count] = from;
            ends[count] = end;
            count++;
            k = i;
            if (k >= n || c === LF) break;
            k++;
            continue;
          }
          values[count] = NaN; // another form: read in full by processRow
        }
        while (k < n) {
          c = block[k];
          if (c === delimCode || c === LF) break;
          if (c === QUOTE) {
            cellCount = 0;
            return at;
          }
          k++;
        }
        let to = k;
        if (from < to && (block[from] === 32 || block[from] === 9 || block[from] === CR)) {
          while (from < to && isPadding(block[from])) from++;
        }
        if (to > from && (block[to - 1] === 32 || block[to - 1] === 9 || block[to - 1] === CR)) {
          while (to > from && isPadding(block[to - 1])) to--;
        }
        if (kind === KIND_TIME) timeChars = to - from;
        starts[count] = from;
        ends[count] = to;
        count++;
        if (k >= n || c === LF) break;
        k++;
      }
      cellCount = count;
      lineNo++;
      processRow(block, lineNo);
      at = k + 1;
    }
    cellCount = 0;
    return -1;
  }

  function processQuotedBlock(text: string): void {
    const rows = Papa.parse<string[]>(text, { delimiter, newline: "\n", header: false, skipEmptyLines: false }).data;
    for (let r = 0; r < rows.length; r++) {
      const cells = rows[r];
      lineNo++;
      const line = lineNo;
      for (const c of cells) for (let k = c.indexOf("\n"); k >= 0; k = c.indexOf("\n", k + 1)) lineNo++;
      const encoded = cells.map((c) => UTF8_ENCODER.encode(c));
      let total = 0;
      for (const e of encoded) total += e.length + 1;
      const joined = new Uint8Array(total);
      cellCount = 0;
      let at = 0;
      for (const e of encoded) {
        joined.set(e, at);
        pushCell(joined, at, at + e.length);
        at += e.length + 1;
      }
      processRow(joined, line);
    }
  }

  /** Detect the delimiter on the first line that is neither blank nor a comment; false until one is complete. */
  function startIfNeeded(final: boolean): boolean {
    if (started) return true;
    let at = 0;
    for (;;) {
      let e = pending.indexOf(LF, at);
      if (e < 0) {
        if (!final) return false;
        e = pending.length;
      }
      const line = UTF8_DECODER.decode(pending.subarray(at, e)).trim();
      if (line.length > 0 && !line.startsWith("#")) {
        delimiter = options.delimiter ?? detectDelimiter(line);
        started = true;
        return true;
      }
      if (e >= pending.length) return false;
      at = e + 1;
    }
  }

  function cutCompleteLines(final: boolean): void {
    if (atStreamStart && (pending.length >= 3 || final)) {
      if (pending[0] === 0xef && pending[1] === 0xbb && pending[2] === 0xbf) pending = pending.subarray(3); // UTF-8 BOM
      atStreamStart = false;
    }
    if (atStreamStart || !startIfNeeded(final)) return;
    const cut = final ? pending.length : pending.lastIndexOf(LF);
    if (cut < 0) return;
    const block = pending.subarray(0, cut);
    const tail = final ? new Uint8Array(0) : pending.subarray(cut + 1);
    if (block.length === 0 && final) {
      pending = tail;
      return;
    }
    const waitFrom = processBlock(block, !final);
    // a copy: never keep the caller's chunk; a quoted field that runs on waits for more text
    pending = waitFrom >= 0 ? pending.slice(waitFrom) : tail.slice();
    if (!sized) reserveFromHint();
    flushBatch();
  }

  /** Room for the readings the size hint promises, at the bytes per line read so far (once). */
  function reserveFromHint(): void {
    const readBytes = bytesPushed - pending.length;
    if (builder === null || lineNo < HINT_MIN_LINES || readBytes <= 0) return; // too few lines to tell
    sized = true;
    const lines = (sizeHintBytes! / readBytes) * lineNo * HINT_MARGIN;
    builder.reserve(Math.min(MAX_HINTED_ROWS, Math.ceil(lines)));
  }

  function flushBatch(): void {
    if (sinks.onBatch && builder && builder.count > 0) {
      sinks.onBatch(builder.build());
      builder = newBuilder();
    }
  }

  /** Number of quote bytes is odd: a quoted field runs past the end. */
  function quotedRunOn(bytes: Uint8Array): boolean {
    let quotes = 0;
    for (let k = bytes.indexOf(QUOTE); k >= 0; k = bytes.indexOf(QUOTE, k + 1)) quotes++;
    return quotes % 2 === 1;
  }

  // A text chunk that ends in the first half of a surrogate pair: that code unit waits for the next
  // chunk, so a character split between two strings is encoded whole, not as two U+FFFD.
  let heldHighSurrogate = "";

  /** UTF-8 of a text chunk, with a held-back high surrogate in front and a trailing one held back. */
  function encodeText(chunk: string): Uint8Array {
    let text = heldHighSurrogate.length > 0 ? heldHighSurrogate + chunk : chunk;
    heldHighSurrogate = "";
    const last = text.length > 0 ? text.charCodeAt(text.length - 1) : 0;
    if (last >= 0xd800 && last <= 0xdbff) {
      heldHighSurrogate = text.slice(-1);
      text = text.slice(0, -1);
    }
    return UTF8_ENCODER.encode(text);
  }

  /** A high surrogate still held when bytes or the end come: alone it is U+FFFD, as in the whole text. */
  function releaseHeldSurrogate(): void {
    if (heldHighSurrogate.length === 0) return;
    const lone = UTF8_ENCODER.encode(heldHighSurrogate);
    heldHighSurrogate = "";
    pushBytes(lone);
  }

  function pushBytes(chunk: Uint8Array): void {
    // a plain Uint8Array view (not a Node Buffer subclass) keeps the byte loops monomorphic
    const bytes = new Uint8Array(chunk.buffer, chunk.byteOffset, chunk.byteLength);
    bytesPushed += bytes.length;
    let rest = bytes;
    if (pending.length > 0 && started && !atStreamStart && delimiter !== "whitespace") {
      // finish the carried-over partial line with the head of this chunk, so the chunk itself is
      // read in place instead of being copied behind the carry
      const firstLf = bytes.indexOf(LF);
      if (firstLf < 0) {
        pending = concatBytes(pending, bytes);
        return;
      }
      const line = concatBytes(pending, bytes.subarray(0, firstLf));
      if (quotedRunOn(line)) {
        pending = concatBytes(pending, bytes);
        cutCompleteLines(false);
        if (pending.buffer === bytes.buffer) pending = pending.slice();
        return;
      }
      pending = new Uint8Array(0);
      processBlock(line, false);
      rest = bytes.subarray(firstLf + 1);
    }
    pending = pending.length === 0 ? rest : concatBytes(pending, rest);
    cutCompleteLines(false);
    if (pending.buffer === bytes.buffer) pending = pending.slice(); // never keep the caller's chunk
    flushBatch();
  }

  return {
    push(chunk: string | Uint8Array): void {
      if (typeof chunk === "string") {
        pushBytes(encodeText(chunk));
        return;
      }
      releaseHeldSurrogate();
      pushBytes(chunk);
    },
    end() {
      releaseHeldSurrogate();
      cutCompleteLines(true);
      if (header === null) throw new LogFormatError("the log is empty: expected a header row and readings");
      if (rowCount === 0) warnings.push("the log has a header but no readings");
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
      return { ...summary, readings: sinks.onBatch ? null : builder!.build() };
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
