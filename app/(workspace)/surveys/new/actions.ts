"use server";

import { redirect } from "next/navigation";
import { revalidatePath } from "next/cache";
import { requireActor } from "@/src/server/auth/session";
import { createSurvey } from "@/src/server/surveys/service";
import type { ActionState } from "@/src/ui/action-state";
import { actionErrorState, formFields } from "@/app/_lib/action-errors";

const SURVEY_FIELDS = ["name", "code", "client", "areaDescription", "timeZone", "notes"] as const;

export async function createSurveyAction(_prev: ActionState, formData: FormData): Promise<ActionState> {
  const actor = await requireActor("/surveys/new");
  let surveyId: string;
  try {
    surveyId = (await createSurvey(actor, formFields(formData, SURVEY_FIELDS))).id;
  } catch (err) {
    return actionErrorState(err);
  }
  revalidatePath("/surveys");
  redirect(`/surveys/${surveyId}`);
}
