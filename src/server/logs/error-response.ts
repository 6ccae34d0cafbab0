import "server-only";
/** Route errors of the log API: a refused log carries its details (problems, existing log); the rest go through toErrorResponse. */
import { json, toErrorResponse } from "../http/respond";
import { LogImportRefusedError } from "./errors";

export function logErrorResponse(err: unknown): Response {
  if (err instanceof LogImportRefusedError) {
    return json({ error: { code: err.code, message: err.message, details: err.details } }, { status: err.status });
  }
  return toErrorResponse(err);
}
