"use server";
import { revalidatePath } from "next/cache";
import { actionErrorState, formFields } from "@/app/_lib/action-errors";
import { createApiToken, revokeApiToken } from "@/src/server/api-tokens/service";
import { requireActor } from "@/src/server/auth/session";
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
