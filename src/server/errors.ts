/**
 * One error vocabulary for the server layer. Mapped to HTTP in src/server/http/respond.ts.
 * Messages are written for the person using the app; they never carry SQL or stack details.
 */
export type FieldErrors = Record<string, string[]>;

export class AppError extends Error {
  readonly code: string;
  readonly status: number;
  constructor(code: string, status: number, message: string) {
    super(message);
    this.name = new.target.name;
    this.code = code;
    this.status = status;
  }
}

/** 404. Also used when the survey exists but the caller is not on it: they learn nothing of it. */
export class NotFoundError extends AppError {
  constructor(message = "Not found.") {
    super("not_found", 404, message);
  }
}

/** 403: a member of the survey whose role does not allow the action. */
export class ForbiddenError extends AppError {
  constructor(message = "Your role does not allow this.") {
    super("forbidden", 403, message);
  }
}

/** 401: no valid session, or wrong credentials on the JSON sign-in route. */
export class UnauthenticatedError extends AppError {
  constructor(message = "Please sign in.") {
    super("unauthenticated", 401, message);
  }
}

/** 400: bad input. fieldErrors is keyed by input field name; formError is for the form as a whole. */
export class ValidationError extends AppError {
  readonly fieldErrors: FieldErrors;
  readonly formError?: string;
  constructor(fieldErrors: FieldErrors, formError?: string) {
    super("validation_failed", 400, formError ?? "Some fields need attention.");
    this.fieldErrors = fieldErrors;
    this.formError = formError;
  }
}

/** 409: the request clashes with the current state (e.g. removing the last lead). */
export class ConflictError extends AppError {
  constructor(message: string) {
    super("conflict", 409, message);
  }
}

export type InvalidTokenReason = "unknown" | "expired" | "used" | "revoked";

/** 400 (unknown) or 410 (expired, used, revoked): invitation or password-reset link that cannot be used. */
export class InvalidTokenError extends AppError {
  readonly reason: InvalidTokenReason;
  constructor(reason: InvalidTokenReason, message: string) {
    super(`token_${reason}`, reason === "unknown" ? 400 : 410, message);
    this.reason = reason;
  }
}

/** 503: the mail server did not accept the message; nothing that depended on it was kept. */
export class MailDeliveryError extends AppError {
  constructor(message = "The e-mail could not be sent. Nothing was saved; please try again later.") {
    super("mail_failed", 503, message);
  }
}

/** Field errors from a zod error, keyed by the top-level field name. */
export function fieldErrorsFromZod(issues: ReadonlyArray<{ path: ReadonlyArray<PropertyKey>; message: string }>): FieldErrors {
  const out: FieldErrors = {};
  for (const issue of issues) {
    const key = issue.path.length > 0 ? String(issue.path[0]) : "_form";
    (out[key] ??= []).push(issue.message);
  }
  return out;
}

/** Parses `input` with a zod schema; throws ValidationError with field errors on failure. */
export function parseInput<T>(
  schema: { safeParse(input: unknown): { success: true; data: T } | { success: false; error: { issues: ReadonlyArray<{ path: ReadonlyArray<PropertyKey>; message: string }> } } },
  input: unknown,
): T {
  const result = schema.safeParse(input);
  if (result.success) return result.data;
  const fieldErrors = fieldErrorsFromZod(result.error.issues);
  const formError = fieldErrors._form?.[0];
  delete fieldErrors._form;
  throw new ValidationError(fieldErrors, formError);
}
