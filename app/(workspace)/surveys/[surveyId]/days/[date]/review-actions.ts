"use server";
/** The day page's review forms: a processor submits the day, a reviewer decides it (the service checks roles). */
import { revalidatePath } from "next/cache";
import { actionErrorState, formFields } from "@/app/_lib/action-errors";
import { requireActor } from "@/src/server/auth/session";
import { decideDay, submitDayForReview } from "@/src/server/review/service";
import type { MailOutcome } from "@/src/server/notifications/review-mail";
import type { ActionState } from "@/src/ui/action-state";

function mailNote(mail: MailOutcome): string {
  const sent = mail.sentTo.length === 0 ? "No one was mailed (no recipient wants this mail)." : `Mailed ${mail.sentTo.join(", ")}.`;
  return mail.failedTo.length > 0 ? `${sent} Not delivered to ${mail.failedTo.join(", ")}: the mail server refused.` : sent;
}

export async function submitDayAction(surveyId: string, day: string, _prev: ActionState, formData: FormData): Promise<ActionState> {
  const path = `/surveys/${surveyId}/days/${day}`;
  const actor = await requireActor(path);
  let note = "";
  try {
    const { mail } = await submitDayForReview(actor, surveyId, day, formFields(formData, ["comment"] as const));
    note = mailNote(mail);
  } catch (err) {
    return actionErrorState(err);
  }
  revalidatePath(path);
  return { status: "success", message: `Submitted for review. ${note}` };
}

export async function decideDayAction(surveyId: string, day: string, _prev: ActionState, formData: FormData): Promise<ActionState> {
  const path = `/surveys/${surveyId}/days/${day}`;
  const actor = await requireActor(path);
  let note = "";
  const input = formFields(formData, ["decision", "scope", "lines", "comment"] as const);
  try {
    const { mail } = await decideDay(actor, surveyId, day, { ...input, scope: input.scope || undefined });
    note = mailNote(mail);
  } catch (err) {
    return actionErrorState(err);
  }
  revalidatePath(path);
  return { status: "success", message: `${input.decision === "accept" ? "Accepted." : "Sent back for re-survey."} ${note}` };
}
