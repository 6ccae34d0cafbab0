import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { getActor } from "@/src/server/auth/session";
import { FormSuccess } from "@/src/ui/form-message";
import { safeNextPath } from "@/src/lib/safe-next-path";
import { SignInForm } from "./sign-in-form";

export const metadata: Metadata = { title: "Sign in" };

const NOTES: Record<string, string> = {
  reset: "Your password has been changed. Sign in with the new one.",
  "signed-out": "You have signed out.",
};

export default async function SignInPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const params = await searchParams;
  const next = safeNextPath(typeof params.next === "string" ? params.next : undefined);
  if (await getActor()) redirect(next);
  const note = typeof params.note === "string" ? NOTES[params.note] : undefined;
  return (
    <>
      <h1 className="mb-1 text-xl font-semibold text-ink-900">Sign in</h1>
      <p className="mb-5 text-sm text-ink-600">Use the e-mail and password of your Fieldtide account.</p>
      {note ? (
        <div className="mb-4">
          <FormSuccess message={note} />
        </div>
      ) : null}
      <SignInForm next={next} />
    </>
  );
}
