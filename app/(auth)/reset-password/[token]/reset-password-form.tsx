"use client";

import Link from "next/link";
import { useActionState } from "react";
import { IDLE, fieldErrorsOf, formErrorOf } from "@/src/ui/action-state";
import { FormError } from "@/src/ui/form-message";
import { NewPasswordFields } from "@/src/ui/new-password-fields";
import { SubmitButton } from "@/src/ui/submit-button";
import { resetPasswordAction } from "./actions";

export function ResetPasswordForm({ token }: { token: string }) {
  const [state, formAction] = useActionState(resetPasswordAction.bind(null, token), IDLE);
  const formError = formErrorOf(state);
  const errors = fieldErrorsOf(state);
  return (
    <form action={formAction} className="space-y-4" noValidate>
      <FormError message={formError} />
      {formError ? (
        <p className="text-sm">
          <Link href="/forgot-password" className="text-tide-700 underline underline-offset-2">
            Ask for a new reset link
          </Link>
        </p>
      ) : null}
      <NewPasswordFields errors={errors} />
      <SubmitButton className="w-full">Set new password</SubmitButton>
    </form>
  );
}
