"use server";
/** Processing settings form: the service checks the role (processor or lead) and records each change. */
import { revalidatePath } from "next/cache";
import { requireActor } from "@/src/server/auth/session";
import { updateProcessingSettings } from "@/src/server/processing/service";
import type { ActionState } from "@/src/ui/action-state";
import { actionErrorState, formFields } from "@/app/_lib/action-errors";

const KEYS = [
  "datumKind", "datumValueNt", "interpolation", "maxBaseGapS", "referenceModel", "applyInstrumentOffset", "instrumentOffsetNt",
  "defaultTimeBasis", "mainBaseSite", "loopStation",
] as const;

export async function updateProcessingSettingsAction(surveyId: string, _prev: ActionState, formData: FormData): Promise<ActionState> {
  const path = `/surveys/${surveyId}/settings`;
  const actor = await requireActor(path);
  let changed = 0;
  try {
    const { changes } = await updateProcessingSettings(actor, surveyId, formFields(formData, KEYS));
    changed = changes.length;
  } catch (err) {
    return actionErrorState(err);
  }
  revalidatePath(`/surveys/${surveyId}`, "layout");
  return { status: "success", message: changed > 0 ? `Saved ${changed} ${changed === 1 ? "change" : "changes"}. New runs use them; earlier runs keep their own parameters.` : "Nothing changed." };
}
