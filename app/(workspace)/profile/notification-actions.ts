"use server";
/** The profile page's mail choices: each signed-in user changes only their own. */
import { revalidatePath } from "next/cache";
import { actionErrorState } from "@/app/_lib/action-errors";
import { requireActor } from "@/src/server/auth/session";
import { saveNotificationPreferences } from "@/src/server/notifications/preferences";
import type { ActionState } from "@/src/ui/action-state";

export async function saveNotificationPreferencesAction(_prev: ActionState, formData: FormData): Promise<ActionState> {
  const actor = await requireActor("/profile");
  try {
    await saveNotificationPreferences(actor, { enabled: formData.getAll("enabled").filter((v): v is string => typeof v === "string") });
  } catch (err) {
    return actionErrorState(err);
  }
  revalidatePath("/profile");
  return { status: "success", message: "Mail choices saved." };
}
