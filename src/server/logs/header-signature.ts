/**
 * The header row of a log, read from its first bytes, and its normalised signature (how import
 * profiles are matched to new files). Pure, no `server-only`: the upload page uses the same
 * functions for its preview, so the browser and the server agree on what a header is.
 */
import Papa from "papaparse";
import { detectDelimiter, type Delimiter } from "@/src/core/logs";

export interface HeaderPreview {
  delimiter: Delimiter;
  header: string[];
  /** Up to `maxRows` data rows after the header, split the same way. */
  rows: string[][];
  /** 1-based file line of the header. */
  headerLine: number;
}

function splitLine(line: string, delimiter: Delimiter): string[] {
  if (delimiter === "whitespace") return line.trim().split(/\s+/);
  const parsed = Papa.parse<string[]>(line, { delimiter, header: false });
  return (parsed.data[0] ?? []).map((c) => c.trim());
}

/**
 * Header (first line that is neither blank nor a `#` comment) and the first data rows of a
 * text head. Returns null when the text holds no header line. A BOM and CR line ends are fine.
 */
export function previewHead(text: string, opts: { delimiter?: Delimiter; maxRows?: number } = {}): HeaderPreview | null {
  const maxRows = opts.maxRows ?? 10;
  const lines = text.replace(/^\uFEFF/, "").split("\n");
  // the last piece may be cut mid-line unless the text ended with a newline
  if (lines.length > 1) lines.pop();
  let headerAt = -1;
  for (let i = 0; i < lines.length; i++) {
    const l = lines[i].replace(/\r$/, "").trim();
    if (l.length > 0 && !l.startsWith("#")) {
      headerAt = i;
      break;
    }
  }
  if (headerAt < 0) return null;
  const headerText = lines[headerAt].replace(/\r$/, "");
  const delimiter = opts.delimiter ?? detectDelimiter(headerText.trim());
  const header = splitLine(headerText, delimiter);
  const rows: string[][] = [];
  for (let i = headerAt + 1; i < lines.length && rows.length < maxRows; i++) {
    const l = lines[i].replace(/\r$/, "");
    if (l.trim().length === 0 || l.trim().startsWith("#")) continue;
    rows.push(splitLine(l, delimiter));
  }
  return { delimiter, header, rows, headerLine: headerAt + 1 };
}

/** Normalised header row: cells lower-cased, blanks collapsed, joined by `|`. */
export function headerSignature(header: readonly string[]): string {
  return header.map((c) => c.replace(/^\uFEFF/, "").trim().toLowerCase().replace(/\s+/g, " ")).join("|");
}
