import type { Metadata } from "next";
import Link from "next/link";
import { unstable_rethrow } from "next/navigation";
import { getPasswordReset } from "@/src/server/auth/password-reset";
import { InvalidTokenError } from "@/src/server/errors";
import { Refusal } from "@/src/ui/refusal";
import { ResetPasswordForm } from "./reset-password-form";

export const metadata: Metadata = { title: "Choose a new password" };

async function readReset(token: string) {
  try {
    return { ok: true as const, reset: await getPasswordReset(token) };
  } catch (err) {
    unstable_rethrow(err);
    if (err instanceof InvalidTokenError) return { ok: false as const, message: err.message };
    throw err;
  }
}

export default async function ResetPasswordPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const result = await readReset(token);
  if (!result.ok) {
    return (
      <Refusal title="This reset link cannot be used" message={result.message}>
        <Link href="/forgot-password" className="text-tide-700 underline underline-offset-2">
          Ask for a new reset link
        </Link>
      </Refusal>
    );
  }
  return (
    <>
      <h1 className="mb-1 text-xl font-semibold text-ink-900">Choose a new password</h1>
      <p className="mb-5 text-sm text-ink-600">
        For <span className="break-all font-medium text-ink-800">{result.reset.email}</span>. After the change you sign in again; every
        other session of the account ends.
      </p>
      <ResetPasswordForm token={token} />
    </>
  );
}
