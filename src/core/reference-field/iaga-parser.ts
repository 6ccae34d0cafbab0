/**
 * Parser of the IAGA coefficient table layout used for IGRF releases (e.g. igrf14coeffs.txt,
 * doi:10.5281/zenodo.14012302):
 *   # comment lines
 *   c/s deg ord IGRF IGRF … DGRF … IGRF SV          (model type of each column; optional here)
 *   g/h n m 1900.0 1905.0 … 2025.0 2025-30         (header: epochs, then an optional SV column)
 *   g  1  0 -31543 -31464 …                         (one row per Gauss coefficient)
 * Main-field columns are nT, the SV column nT/year. Every error names its 1-based line.
 */
import { CoefficientTableError } from "./errors";
import {
  coefficientCount,
  coefficientIndex,
  highestNonZeroDegree,
  type CoefficientEpoch,
  type CoefficientSet,
  type FieldModel,
} from "./model";

const NUMBER_PATTERN = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
const SV_COLUMN_PATTERN = /^(\d{4}(?:\.\d*)?)-(\d{2}|\d{4})$/;
const MODEL_TYPES = new Set(["IGRF", "DGRF", "SV", "PGRF"]);
const GENERATION_PATTERN = /(\d+)(?:st|nd|rd|th)\s+Generation\s+International\s+Geomagnetic\s+Reference\s+Field/i;
/** Degree limit accepted from a table; far above any published model, guards against garbage. */
const MAX_TABLE_DEGREE = 30;

function parseNumber(token: string, what: string, lineNumber: number): number {
  if (!NUMBER_PATTERN.test(token)) {
    throw new CoefficientTableError(`${what} "${token}" is not a number`, lineNumber);
  }
  const value = Number(token);
  // "1e999" matches the pattern but overflows a double to ±Infinity.
  if (!Number.isFinite(value)) throw new CoefficientTableError(`${what} "${token}" is not a finite number`, lineNumber);
  return value;
}

interface Header {
  lineNumber: number;
  epochYears: number[];
  svSpan: { fromYear: number; toYear: number } | null;
  columnCount: number;
}

function parseHeader(tokens: string[], lineNumber: number): Header {
  if (tokens[1] !== "n" || tokens[2] !== "m" || tokens.length < 4) {
    throw new CoefficientTableError(`header must read "g/h n m <epoch> …", found "${tokens.join(" ")}"`, lineNumber);
  }
  const columns = tokens.slice(3);
  const last = columns[columns.length - 1];
  const svMatch = SV_COLUMN_PATTERN.exec(last);
  let svSpan: Header["svSpan"] = null;
  if (svMatch) {
    const fromYear = Number(svMatch[1]);
    const toText = svMatch[2];
    const toYear = toText.length === 4 ? Number(toText) : Math.floor(fromYear / 100) * 100 + Number(toText);
    if (!(toYear > fromYear)) {
      throw new CoefficientTableError(`secular-variation column "${last}" does not name a forward span`, lineNumber);
    }
    svSpan = { fromYear, toYear };
    columns.pop();
  }
  if (columns.length === 0) throw new CoefficientTableError("header names no epoch columns", lineNumber);
  const epochYears = columns.map((c) => parseNumber(c, "epoch", lineNumber));
  for (let i = 1; i < epochYears.length; i++) {
    if (!(epochYears[i] > epochYears[i - 1])) {
      throw new CoefficientTableError(`epochs must increase (${epochYears[i - 1]} then ${epochYears[i]})`, lineNumber);
    }
  }
  const lastEpoch = epochYears[epochYears.length - 1];
  if (svSpan && svSpan.fromYear !== lastEpoch) {
    throw new CoefficientTableError(
      `secular variation starts at ${svSpan.fromYear}, not at the last epoch ${lastEpoch}`,
      lineNumber,
    );
  }
  return { lineNumber, epochYears, svSpan, columnCount: tokens.length };
}

interface Row {
  lineNumber: number;
  kind: "g" | "h";
  n: number;
  m: number;
  values: number[];
}

function parseRow(tokens: string[], header: Header, lineNumber: number): Row {
  if (tokens.length !== header.columnCount) {
    throw new CoefficientTableError(
      `expected ${header.columnCount} columns as in the header on line ${header.lineNumber}, found ${tokens.length}`,
      lineNumber,
    );
  }
  const kind = tokens[0];
  if (kind !== "g" && kind !== "h") {
    throw new CoefficientTableError(`first column must be g or h, found "${kind}"`, lineNumber);
  }
  const n = parseNumber(tokens[1], "degree n", lineNumber);
  const m = parseNumber(tokens[2], "order m", lineNumber);
  if (!Number.isInteger(n) || n < 1 || n > MAX_TABLE_DEGREE) {
    throw new CoefficientTableError(`degree n = ${tokens[1]} must be an integer from 1 to ${MAX_TABLE_DEGREE}`, lineNumber);
  }
  if (!Number.isInteger(m) || m < 0 || m > n) {
    throw new CoefficientTableError(`order m = ${tokens[2]} must be an integer from 0 to n = ${n}`, lineNumber);
  }
  if (kind === "h" && m === 0) throw new CoefficientTableError("h coefficients start at order m = 1", lineNumber);
  const values = tokens.slice(3).map((t, i) => parseNumber(t, `value in column ${i + 4}`, lineNumber));
  return { lineNumber, kind, n, m, values };
}

function detectGeneration(comments: string[]): string | null {
  for (const c of comments) {
    const match = GENERATION_PATTERN.exec(c);
    if (match) return match[1];
  }
  return null;
}

/**
 * Parse an IAGA coefficient table into a FieldModel (degree convention "full").
 * Name defaults to "IGRF-<generation>" when the comments state the generation, else "IGRF".
 * Throws CoefficientTableError (with lineNumber) on any malformed line or incomplete table.
 */
export function parseIagaCoefficients(text: string, opts: { name?: string; version?: string } = {}): FieldModel {
  const lines = text.split(/\r?\n/);
  const comments: string[] = [];
  let typeLine: { tokens: string[]; lineNumber: number } | null = null;
  let header: Header | null = null;
  const rows: Row[] = [];

  for (let index = 0; index < lines.length; index++) {
    const lineNumber = index + 1;
    const trimmed = lines[index].trim();
    if (trimmed === "") continue;
    if (trimmed.startsWith("#")) {
      comments.push(trimmed);
      continue;
    }
    const tokens = trimmed.split(/\s+/);
    if (!header) {
      if (tokens[0] === "g/h") {
        header = parseHeader(tokens, lineNumber);
        continue;
      }
      if (tokens[0] === "c/s" && !typeLine) {
        typeLine = { tokens, lineNumber };
        continue;
      }
      throw new CoefficientTableError(
        `expected the header line "g/h n m <epoch> …" before coefficient rows, found "${trimmed.slice(0, 40)}"`,
        lineNumber,
      );
    }
    rows.push(parseRow(tokens, header, lineNumber));
  }

  if (!header) {
    // Name the file's last line: split() leaves an empty string after a final line break.
    const lastLine = lines.length > 1 && lines[lines.length - 1] === "" ? lines.length - 1 : lines.length;
    throw new CoefficientTableError('no header line "g/h n m <epoch> …" found', Math.max(lastLine, 1));
  }
  if (typeLine) {
    if (typeLine.tokens.length !== header.columnCount) {
      throw new CoefficientTableError(
        `model-type line has ${typeLine.tokens.length} columns, header on line ${header.lineNumber} has ${header.columnCount}`,
        typeLine.lineNumber,
      );
    }
    const unknown = typeLine.tokens.slice(3).find((t) => !MODEL_TYPES.has(t));
    if (unknown) throw new CoefficientTableError(`unknown model type "${unknown}"`, typeLine.lineNumber);
  }
  if (rows.length === 0) throw new CoefficientTableError("table has a header but no coefficient rows", header.lineNumber);

  const arrayDegree = rows.reduce((max, r) => Math.max(max, r.n), 0);
  const size = coefficientCount(arrayDegree);
  const epochCount = header.epochYears.length;
  const columnCount = epochCount + (header.svSpan ? 1 : 0);
  const gColumns = Array.from({ length: columnCount }, () => new Float64Array(size));
  const hColumns = Array.from({ length: columnCount }, () => new Float64Array(size));
  const seen = new Map<string, number>();
  for (const row of rows) {
    const key = `${row.kind} ${row.n} ${row.m}`;
    const earlier = seen.get(key);
    if (earlier !== undefined) {
      throw new CoefficientTableError(`coefficient ${key} already given on line ${earlier}`, row.lineNumber);
    }
    seen.set(key, row.lineNumber);
    const k = coefficientIndex(row.n, row.m);
    const target = row.kind === "g" ? gColumns : hColumns;
    row.values.forEach((v, c) => {
      target[c][k] = v;
    });
  }
  const lastRowLine = rows[rows.length - 1].lineNumber;
  for (let n = 1; n <= arrayDegree; n++) {
    for (let m = 0; m <= n; m++) {
      for (const kind of m === 0 ? ["g"] : ["g", "h"]) {
        if (!seen.has(`${kind} ${n} ${m}`)) {
          throw new CoefficientTableError(
            `table ends without coefficient ${kind} ${n} ${m} (degree ${arrayDegree} is present)`,
            lastRowLine,
          );
        }
      }
    }
  }

  const epochs: CoefficientEpoch[] = header.epochYears.map((year, c) => ({
    year,
    g: gColumns[c],
    h: hColumns[c],
    maxDegree: highestNonZeroDegree(gColumns[c], hColumns[c], arrayDegree),
  }));
  const secularVariation: CoefficientSet | null = header.svSpan
    ? {
        g: gColumns[epochCount],
        h: hColumns[epochCount],
        maxDegree: highestNonZeroDegree(gColumns[epochCount], hColumns[epochCount], arrayDegree),
      }
    : null;
  const generation = detectGeneration(comments);
  return {
    name: opts.name ?? (generation ? `IGRF-${generation}` : "IGRF"),
    version: opts.version ?? generation ?? `${header.epochYears[0]}-${header.svSpan?.toYear ?? header.epochYears[epochCount - 1]}`,
    validFromYear: header.epochYears[0],
    validToYear: header.svSpan ? header.svSpan.toYear : header.epochYears[epochCount - 1],
    arrayDegree,
    epochs,
    secularVariation,
    degreeConvention: "full",
  };
}
