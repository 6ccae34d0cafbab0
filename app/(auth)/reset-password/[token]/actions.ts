"use server";

import { redirect } from "next/navigation";
import { resetPassword } from "@/src/server/auth/password-reset";
import type { ActionState } from "@/src/ui/action-state";
import { actionErrorState, formFields } from "@/app/_lib/action-errors";

export async function resetPasswordAction(token: string, _prev: ActionState, formData: FormData): Promise<ActionState> {
  try {
    await resetPassword(token, formFields(formData, ["password", "confirm"] as const));
  } catch (err) {
    return actionErrorState(err);
  }
  redirect("/sign-in?note=reset");
}
