"use client";

import Link from "next/link";
import { useActionState, useState } from "react";
import { IDLE, fieldErrorsOf, formErrorOf, successOf } from "@/src/ui/action-state";
import { TextField } from "@/src/ui/field";
import { FormError, FormSuccess } from "@/src/ui/form-message";
import { SubmitButton } from "@/src/ui/submit-button";
import { requestPasswordResetAction } from "./actions";

export function ForgotPasswordForm() {
  const [state, formAction] = useActionState(requestPasswordResetAction, IDLE);
  const [email, setEmail] = useState("");
  const done = successOf(state);
  if (done) {
    return (
      <div className="space-y-4">
        <FormSuccess message={done} />
        <BackToSignIn />
      </div>
    );
  }
  return (
    <form action={formAction} className="space-y-4" noValidate>
      <FormError message={formErrorOf(state)} />
      <TextField
        id="email"
        name="email"
        label="E-mail"
        type="email"
        autoComplete="email"
        required
        value={email}
        onChange={(e) => setEmail(e.target.value)}
        errors={fieldErrorsOf(state).email}
      />
      <SubmitButton className="w-full">Send reset link</SubmitButton>
      <BackToSignIn />
    </form>
  );
}

function BackToSignIn() {
  return (
    <p className="text-center text-sm">
      <Link href="/sign-in" className="text-tide-700 underline underline-offset-2">
        Back to sign in
      </Link>
    </p>
  );
}
