"use server";
import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { actionErrorState, formFields } from "@/app/_lib/action-errors";
import { createApiToken, revokeApiToken } from "@/src/server/api-tokens/service";
import { requireActor, signOutEverywhere } from "@/src/server/auth/session";
import type { ActionState } from "@/src/ui/action-state";

export type CreateTokenState = ActionState | { status: "created"; token: string; name: string };

export async function createApiTokenAction(_prev: CreateTokenState, formData: FormData): Promise<CreateTokenState> {
  const actor = await requireActor("/profile");
  try {
    const { token, apiToken } = await createApiToken(actor, formFields(formData, ["name"] as const));
    revalidatePath("/profile");
    return { status: "created", token, name: apiToken.name };
  } catch (err) {
    return actionErrorState(err);
  }
}

export async function revokeApiTokenAction(formData: FormData): Promise<void> {
  const actor = await requireActor("/profile");
  const id = formData.get("tokenId");
  await revokeApiToken(actor, typeof id === "string" ? id : "");
  revalidatePath("/profile");
}

/** Ends all the user's sessions (every browser and device), then back to sign-in. API tokens are revoked separately. */
export async function signOutEverywhereAction(): Promise<void> {
  await requireActor("/profile");
  await signOutEverywhere();
  redirect("/sign-in?note=signed-out");
}
