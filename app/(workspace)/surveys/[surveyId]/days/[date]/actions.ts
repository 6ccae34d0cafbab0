"use server";
/** The day page's datum form: changes only the survey's datum settings (history recorded by the service). */
import { revalidatePath } from "next/cache";
import { requireActor } from "@/src/server/auth/session";
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
