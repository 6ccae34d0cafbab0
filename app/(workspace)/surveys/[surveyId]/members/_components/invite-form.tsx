"use client";

import { useActionState, useState } from "react";
import { IDLE, fieldErrorsOf, formErrorOf, successOf, type ActionState } from "@/src/ui/action-state";
import { SelectField, TextField } from "@/src/ui/field";
import { FormError, FormSuccess } from "@/src/ui/form-message";
import { SubmitButton } from "@/src/ui/submit-button";
import { submitWithoutReset } from "@/src/ui/submit-without-reset";
import { ROLE_OPTIONS } from "./role-options";

export function InviteForm({ action }: { action: (prev: ActionState, formData: FormData) => Promise<ActionState> }) {
  const [email, setEmail] = useState("");
  const [role, setRole] = useState("crew");
  const [state, formAction] = useActionState(async (prev: ActionState, formData: FormData) => {
    const next = await action(prev, formData);
    if (next.status === "success") setEmail("");
    return next;
  }, IDLE);
  const errors = fieldErrorsOf(state);
  const emailLooksWrong = email.length > 3 && !/^[^\s@]+@[^\s@]+\.[^\s@]+$/.test(email.trim());
  return (
    <form action={formAction} onSubmit={submitWithoutReset(formAction)} className="space-y-4" noValidate>
      <FormError message={formErrorOf(state)} />
      <FormSuccess message={successOf(state)} />
      <div className="grid gap-4 sm:grid-cols-[minmax(0,2fr)_minmax(0,1fr)_auto] sm:items-start">
        <TextField
          id="invite-email"
          name="email"
          label="E-mail"
          type="email"
          autoComplete="off"
          required
          value={email}
          onChange={(e) => setEmail(e.target.value)}
          errors={emailLooksWrong ? ["Enter a valid e-mail address."] : errors.email}
        />
        <SelectField id="invite-role" name="role" label="Role" value={role} onChange={(e) => setRole(e.target.value)} options={ROLE_OPTIONS} errors={errors.role} />
        <div className="sm:pt-6">
          <SubmitButton className="w-full sm:w-auto">Send invitation</SubmitButton>
        </div>
      </div>
    </form>
  );
}
