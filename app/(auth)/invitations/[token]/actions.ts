"use server";

import { redirect } from "next/navigation";
import { startSessionFor } from "@/src/server/auth/session";
import { acceptInvitation } from "@/src/server/invitations/service";
import type { ActionState } from "@/src/ui/action-state";
import { actionErrorState, formFields } from "@/app/_lib/action-errors";

/** New users send name + password + confirm; existing users send the password of their account. */
export async function acceptInvitationAction(token: string, _prev: ActionState, formData: FormData): Promise<ActionState> {
  const fields = formFields(formData, ["name", "password", "confirm"] as const);
  const isNewUser = formData.get("account") === "new";
  if (isNewUser && fields.password !== fields.confirm) {
    return { status: "error", fieldErrors: { confirm: ["The passwords do not match."] } };
  }
  let surveyId: string;
  try {
    const accepted = await acceptInvitation(token, isNewUser ? fields : { password: fields.password });
    await startSessionFor(accepted.userId);
    surveyId = accepted.surveyId;
  } catch (err) {
    return actionErrorState(err);
  }
  redirect(`/surveys/${encodeURIComponent(surveyId)}`);
}
