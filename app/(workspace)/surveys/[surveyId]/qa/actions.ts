"use server";
/** QA page forms: the survey's thresholds (processor, lead) and Kp values (reviewer, processor, lead); services check roles. */
import { revalidatePath } from "next/cache";
import { actionErrorState, formFields } from "@/app/_lib/action-errors";
import { requireActor } from "@/src/server/auth/session";
import { saveKpValues } from "@/src/server/kp/service";
import { QA_THRESHOLD_KEYS } from "@/src/server/qa-assessment/thresholds";
import { updateQaThresholds } from "@/src/server/qa-assessment/thresholds-service";
import type { ActionState } from "@/src/ui/action-state";

/** Kp CSV files are small (8 rows a day); refuse anything past 1 MB before reading it. */
const MAX_KP_FILE_BYTES = 1_000_000;

export async function updateQaThresholdsAction(surveyId: string, _prev: ActionState, formData: FormData): Promise<ActionState> {
  const actor = await requireActor(`/surveys/${surveyId}/qa`);
  let changed = 0;
  try {
    changed = (await updateQaThresholds(actor, surveyId, formFields(formData, QA_THRESHOLD_KEYS))).changed.length;
  } catch (err) {
    return actionErrorState(err);
  }
  revalidatePath(`/surveys/${surveyId}`, "layout");
  return { status: "success", message: changed > 0 ? `Saved ${changed} ${changed === 1 ? "change" : "changes"}. Days are judged again when next opened or listed.` : "Nothing changed." };
}

export async function saveKpAction(surveyId: string, _prev: ActionState, formData: FormData): Promise<ActionState> {
  const actor = await requireActor(`/surveys/${surveyId}/qa`);
  const file = formData.get("file");
  let text = formFields(formData, ["text"] as const).text;
  let source: "entered" | "csv" = "entered";
  if (file instanceof File && file.size > 0) {
    if (file.size > MAX_KP_FILE_BYTES) return { status: "error", fieldErrors: { file: ["A Kp file is at most 1 MB."] } };
    text = await file.text();
    source = "csv";
  }
  let saved = 0, replaced = 0;
  try {
    ({ saved, replaced } = await saveKpValues(actor, surveyId, { text, source }));
  } catch (err) {
    return actionErrorState(err);
  }
  revalidatePath(`/surveys/${surveyId}`, "layout");
  return { status: "success", message: `Saved ${saved} Kp ${saved === 1 ? "value" : "values"}${replaced ? ` (${replaced} replaced)` : ""}.` };
}
