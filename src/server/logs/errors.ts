import { AppError } from "../errors";

export type RefusalReason =
  | "empty"
  | "binary"
  | "unreadable"
  | "header_only"
  | "no_good_rows"
  | "bad_rows"
  | "duplicate"
  | "archived";

/** One problem row as the upload page and the CSV show it. */
export interface ProblemRow {
  kind: "rejected" | "issue";
  line: number;
  column: string;
  value: string;
  reason: string;
  message: string;
}

export interface RefusalDetails {
  reason: RefusalReason;
  fileName: string;
  rowCount?: number;
  rejectedCount?: number;
  issueCount?: number;
  /** Problem rows in file order (at most the first 10 000 of each kind). */
  problems?: ProblemRow[];
  existingLog?: { id: number; originalName: string; url: string };
}

/**
 * A log file that was not imported, with the reason and, for bad rows, each problem. Nothing of
 * it was kept. Status 422 (409 for a duplicate). The route sends `details` with the error.
 */
export class LogImportRefusedError extends AppError {
  readonly details: RefusalDetails;
  constructor(message: string, details: RefusalDetails) {
    super(details.reason === "duplicate" ? "duplicate_log" : "log_refused", details.reason === "duplicate" ? 409 : 422, message);
    this.details = details;
  }
}
