"use server";

import { revalidatePath } from "next/cache";
import { requireActor } from "@/src/server/auth/session";
import { archiveSurvey, restoreSurvey, updateSurvey } from "@/src/server/surveys/service";
import type { ActionState } from "@/src/ui/action-state";
import { actionErrorState, formFields } from "@/app/_lib/action-errors";

const SURVEY_FIELDS = ["name", "code", "client", "areaDescription", "timeZone", "notes"] as const;

function refreshSurvey(surveyId: string): void {
  revalidatePath("/surveys");
  revalidatePath(`/surveys/${surveyId}`, "layout");
}

export async function updateSurveyAction(surveyId: string, _prev: ActionState, formData: FormData): Promise<ActionState> {
  const actor = await requireActor(`/surveys/${surveyId}/edit`);
  try {
    await updateSurvey(actor, surveyId, formFields(formData, SURVEY_FIELDS));
  } catch (err) {
    return actionErrorState(err);
  }
  refreshSurvey(surveyId);
  return { status: "success", message: "Survey details saved." };
}

export async function setArchivedAction(surveyId: string, _prev: ActionState, formData: FormData): Promise<ActionState> {
  const actor = await requireActor(`/surveys/${surveyId}/edit`);
  const archive = formData.get("intent") === "archive";
  try {
    await (archive ? archiveSurvey(actor, surveyId) : restoreSurvey(actor, surveyId));
  } catch (err) {
    return actionErrorState(err);
  }
  refreshSurvey(surveyId);
  return {
    status: "success",
    message: archive ? "Survey archived. It is read-only and hidden from the survey list until restored." : "Survey restored. It can be edited again.",
  };
}
