"use server";

import { requestPasswordReset } from "@/src/server/auth/password-reset";
import { ValidationError } from "@/src/server/errors";
import type { ActionState } from "@/src/ui/action-state";
import { actionErrorState, formFields } from "@/app/_lib/action-errors";

const RESET_REQUESTED_MESSAGE =
  "If an account uses that e-mail, we have sent it a link to choose a new password. The link works for 1 hour.";

export async function requestPasswordResetAction(_prev: ActionState, formData: FormData): Promise<ActionState> {
  try {
    await requestPasswordReset(formFields(formData, ["email"] as const));
  } catch (err) {
    // A malformed address gets its field message; every other outcome reads the same.
    if (err instanceof ValidationError) return actionErrorState(err);
    console.error("[forgot-password] reset request failed", err);
  }
  return { status: "success", message: RESET_REQUESTED_MESSAGE };
}
