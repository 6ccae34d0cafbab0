"use client";

import Link from "next/link";
import { useActionState, useState } from "react";
import { IDLE, fieldErrorsOf, formErrorOf } from "@/src/ui/action-state";
import { TextField } from "@/src/ui/field";
import { FormError } from "@/src/ui/form-message";
import { SubmitButton } from "@/src/ui/submit-button";
import { signInAction } from "./actions";

export function SignInForm({ next }: { next: string }) {
  const [state, formAction] = useActionState(signInAction, IDLE);
  const [email, setEmail] = useState("");
  const errors = fieldErrorsOf(state);
  return (
    <form action={formAction} className="space-y-4" noValidate>
      <input type="hidden" name="next" value={next} />
      <FormError message={formErrorOf(state)} />
      <TextField
        id="email"
        name="email"
        label="E-mail"
        type="email"
        autoComplete="username"
        required
        value={email}
        onChange={(e) => setEmail(e.target.value)}
        errors={errors.email}
      />
      <TextField id="password" name="password" label="Password" type="password" autoComplete="current-password" required errors={errors.password} />
      <SubmitButton className="w-full" pendingLabel="signing in">
        Sign in
      </SubmitButton>
      <p className="text-center text-sm">
        <Link href="/forgot-password" className="text-tide-700 underline underline-offset-2 hover:text-tide-800">
          Forgot your password?
        </Link>
      </p>
    </form>
  );
}
