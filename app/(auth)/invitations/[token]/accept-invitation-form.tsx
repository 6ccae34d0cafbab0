"use client";

import { useActionState, useState } from "react";
import { IDLE, fieldErrorsOf, formErrorOf } from "@/src/ui/action-state";
import { TextField } from "@/src/ui/field";
import { FormError } from "@/src/ui/form-message";
import { NewPasswordFields } from "@/src/ui/new-password-fields";
import { SubmitButton } from "@/src/ui/submit-button";
import { acceptInvitationAction } from "./actions";

export function AcceptInvitationForm({ token, existingUser }: { token: string; existingUser: boolean }) {
  const [state, formAction] = useActionState(acceptInvitationAction.bind(null, token), IDLE);
  const [name, setName] = useState("");
  const errors = fieldErrorsOf(state);
  return (
    <form action={formAction} className="space-y-4" noValidate>
      <input type="hidden" name="account" value={existingUser ? "existing" : "new"} />
      <FormError message={formErrorOf(state)} />
      {existingUser ? (
        <TextField
          id="password"
          name="password"
          label="Password"
          type="password"
          autoComplete="current-password"
          required
          hint="You already have a Fieldtide account: confirm with its password."
          errors={errors.password}
        />
      ) : (
        <>
          <TextField
            id="name"
            name="name"
            label="Your name"
            autoComplete="name"
            required
            maxLength={120}
            value={name}
            onChange={(e) => setName(e.target.value)}
            errors={errors.name}
          />
          <NewPasswordFields errors={errors} />
        </>
      )}
      <SubmitButton className="w-full">Join survey</SubmitButton>
    </form>
  );
}
