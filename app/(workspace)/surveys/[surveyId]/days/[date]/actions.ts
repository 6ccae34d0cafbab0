"use server";
/** The day page's forms: the survey datum (history recorded by the service) and the day's choice of logs. */
import { revalidatePath } from "next/cache";
import { requireActor } from "@/src/server/auth/session";
import { saveDayPairing } from "@/src/server/days/service";
import { getProcessingSettings, updateProcessingSettings } from "@/src/server/processing/service";
import type { ActionState } from "@/src/ui/action-state";
import { actionErrorState, formFields } from "@/app/_lib/action-errors";

export async function updateDatumAction(surveyId: string, day: string, _prev: ActionState, formData: FormData): Promise<ActionState> {
  const path = `/surveys/${surveyId}/days/${day}`;
  const actor = await requireActor(path);
  const input = formFields(formData, ["datumKind", "datumValueNt"] as const);
  let changed = 0;
  try {
    const current = await getProcessingSettings(actor, surveyId);
    const { changes } = await updateProcessingSettings(actor, surveyId, { ...current.settings, datumKind: input.datumKind, datumValueNt: input.datumValueNt });
    changed = changes.length;
  } catch (err) {
    return actionErrorState(err);
  }
  revalidatePath(path);
  return { status: "success", message: changed > 0 ? "Datum saved for the survey. Run the correction again to apply it." : "The datum was already set so; nothing changed." };
}

/** The day's choice of logs: method default | base | loop, base and second base log ids. */
export async function savePairingAction(surveyId: string, day: string, _prev: ActionState, formData: FormData): Promise<ActionState> {
  const path = `/surveys/${surveyId}/days/${day}`;
  const actor = await requireActor(path);
  const input = formFields(formData, ["method", "baseLogId", "fallbackBaseLogId"] as const);
  try {
    await saveDayPairing(actor, surveyId, day, {
      method: input.method,
      baseLogId: input.baseLogId || null,
      fallbackBaseLogId: input.fallbackBaseLogId || null,
      roverLogIds: formData.getAll("roverLogIds").filter((v): v is string => typeof v === "string"),
    });
  } catch (err) {
    return actionErrorState(err);
  }
  revalidatePath(path);
  return { status: "success", message: "Saved. The next run uses these logs." };
}
