/**
 * Problem rows of a log as CSV (line, kind, column, value, reason, message). Pure, no
 * `server-only`: the upload page builds the same CSV in the browser for a refused file.
 */
import Papa from "papaparse";
import type { ProblemRow } from "./errors";

export const PROBLEM_CSV_COLUMNS = ["line", "kind", "column", "value", "reason", "message"] as const;

export function problemsToCsv(problems: readonly ProblemRow[]): string {
  return Papa.unparse({
    fields: [...PROBLEM_CSV_COLUMNS],
    data: problems.map((p) => [p.line, p.kind, p.column, p.value, p.reason, p.message]),
  }, { newline: "\r\n" }) + "\r\n";
}

/** `survey_2026-05-04.csv` → `survey_2026-05-04.problems.csv`. */
export function problemsCsvName(fileName: string): string {
  return `${fileName.replace(/\.[^.]*$/, "") || "log"}.problems.csv`;
}
