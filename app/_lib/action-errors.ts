import "server-only";
/**
 * Turns what a service threw into the form's action state. Next's own control-flow errors
 * (redirect, notFound) pass through; unknown errors are logged here and shown as a plain
 * sentence, never as a stack or SQL.
 */
import { unstable_rethrow } from "next/navigation";
import { AppError, ValidationError } from "@/src/server/errors";
import type { ActionState } from "@/src/ui/action-state";

export function actionErrorState(err: unknown): ActionState {
  unstable_rethrow(err);
  if (err instanceof ValidationError) {
    const fieldErrors = err.fieldErrors ?? {};
    const hasFieldErrors = Object.values(fieldErrors).some((messages) => messages?.length);
    return { status: "error", fieldErrors, formError: err.formError ?? (hasFieldErrors ? undefined : err.message) };
  }
  if (err instanceof AppError) return { status: "error", fieldErrors: {}, formError: err.message };
  console.error("[action] unexpected error", err);
  return { status: "error", fieldErrors: {}, formError: "Something went wrong on our side. Nothing was saved; please try again." };
}

/** Form values as plain strings (missing → ""), handed to services that zod-parse them. */
export function formFields<K extends string>(formData: FormData, keys: readonly K[]): Record<K, string> {
  const out = {} as Record<K, string>;
  for (const key of keys) {
    const value = formData.get(key);
    out[key] = typeof value === "string" ? value : "";
  }
  return out;
}
