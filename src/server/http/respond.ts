import "server-only";
/** The one place where server errors become HTTP responses. No SQL or stack reaches the client. */
import { AppError, ValidationError } from "../errors";

export function json(data: unknown, init: ResponseInit = {}): Response {
  const headers = new Headers(init.headers);
  headers.set("Content-Type", "application/json; charset=utf-8");
  headers.set("Cache-Control", "no-store");
  return new Response(JSON.stringify(data), { ...init, headers });
}

export function toErrorResponse(err: unknown): Response {
  if (err instanceof AppError) {
    const error: Record<string, unknown> = { code: err.code, message: err.message };
    if (err instanceof ValidationError) {
      error.fieldErrors = err.fieldErrors;
      if (err.formError) error.formError = err.formError;
    }
    return json({ error }, { status: err.status });
  }
  console.error("unexpected error in route handler:", err);
  return json({ error: { code: "internal", message: "Something went wrong on our side. Please try again." } }, { status: 500 });
}

/** Request body as JSON, or ValidationError. */
export async function readJsonBody(request: Request): Promise<unknown> {
  try {
    return await request.json();
  } catch {
    throw new ValidationError({}, "The request body must be JSON.");
  }
}
