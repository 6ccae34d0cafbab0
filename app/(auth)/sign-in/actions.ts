"use server";

import { redirect } from "next/navigation";
import { signInWithPassword } from "@/src/server/auth/session";
import { TooManySignInsError } from "@/src/server/auth/throttle";
import type { ActionState } from "@/src/ui/action-state";
import { actionErrorState, formFields } from "@/app/_lib/action-errors";
import { safeNextPath } from "@/src/lib/safe-next-path";

export async function signInAction(_prev: ActionState, formData: FormData): Promise<ActionState> {
  const input = formFields(formData, ["email", "password"] as const);
  try {
    await signInWithPassword(input);
  } catch (err) {
    if (err instanceof TooManySignInsError) return { status: "error", fieldErrors: { email: [err.message] } };
    return actionErrorState(err);
  }
  redirect(safeNextPath(formData.get("next")));
}
