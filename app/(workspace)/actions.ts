"use server";

import { redirect } from "next/navigation";
import { signOut } from "@/src/server/auth/session";

export async function signOutAction(): Promise<void> {
  await signOut();
  redirect("/sign-in?note=signed-out");
}
