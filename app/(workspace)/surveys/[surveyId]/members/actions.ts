"use server";
/** Member management of one survey. Each action checks the session; the services check the role. */
import { revalidatePath } from "next/cache";
import { requireActor } from "@/src/server/auth/session";
import { inviteToSurvey, revokeInvitation } from "@/src/server/invitations/service";
import { changeMemberRole, removeMember } from "@/src/server/surveys/service";
import type { ActionState } from "@/src/ui/action-state";
import { actionErrorState, formFields } from "@/app/_lib/action-errors";

const membersPath = (surveyId: string) => `/surveys/${surveyId}/members`;

export async function inviteAction(surveyId: string, _prev: ActionState, formData: FormData): Promise<ActionState> {
  const actor = await requireActor(membersPath(surveyId));
  const input = formFields(formData, ["email", "role"] as const);
  try {
    await inviteToSurvey(actor, surveyId, input);
  } catch (err) {
    return actionErrorState(err);
  }
  revalidatePath(membersPath(surveyId));
  return { status: "success", message: `Invitation sent to ${input.email.trim()}. The link in it works once, for 72 hours.` };
}

/** One action for the member rows: intent "role" (change role) or "remove". */
export async function memberAction(surveyId: string, _prev: ActionState, formData: FormData): Promise<ActionState> {
  const actor = await requireActor(membersPath(surveyId));
  const { userId, role, intent, memberName } = formFields(formData, ["userId", "role", "intent", "memberName"] as const);
  try {
    if (intent === "remove") await removeMember(actor, surveyId, userId);
    else await changeMemberRole(actor, surveyId, userId, role);
  } catch (err) {
    return actionErrorState(err);
  }
  revalidatePath(`/surveys/${surveyId}`, "layout");
  return {
    status: "success",
    message: intent === "remove" ? `${memberName || "The member"} was removed from this survey.` : `Saved: ${memberName || "the member"} has the new role.`,
  };
}

export async function revokeInvitationAction(surveyId: string, _prev: ActionState, formData: FormData): Promise<ActionState> {
  const actor = await requireActor(membersPath(surveyId));
  const { invitationId, email } = formFields(formData, ["invitationId", "email"] as const);
  try {
    await revokeInvitation(actor, surveyId, invitationId);
  } catch (err) {
    return actionErrorState(err);
  }
  revalidatePath(membersPath(surveyId));
  return { status: "success", message: `Invitation for ${email || "that address"} revoked; its link no longer works.` };
}
