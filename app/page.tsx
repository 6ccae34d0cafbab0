import { redirect } from "next/navigation";
import { getActor } from "@/src/server/auth/session";

/** "/" sends a signed-in user to their surveys and everyone else to sign in. */
export default async function HomePage() {
  redirect((await getActor()) ? "/surveys" : "/sign-in");
}
