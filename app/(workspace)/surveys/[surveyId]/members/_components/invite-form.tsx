"use client";

import { useActionState, useState } from "react";
import { EmailSchema } from "@/src/server/auth/schema";
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
    if (next.status === "success") {
      setEmail("");
      setEmailTouched(false);
    }
    return next;
  }, IDLE);
  const errors = fieldErrorsOf(state);
  const [emailTouched, setEmailTouched] = useState(false);
  const emailIssue = emailTouched && email.length > 0 ? EmailSchema.safeParse(email).error?.issues[0]?.message : undefined;
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
          onBlur={() => setEmailTouched(true)}
          errors={emailIssue ? [emailIssue] : errors.email}
        />
        <SelectField id="invite-role" name="role" label="Role" value={role} onChange={(e) => setRole(e.target.value)} options={ROLE_OPTIONS} errors={errors.role} />
        <div className="sm:pt-6">
          <SubmitButton className="w-full sm:w-auto">Send invitation</SubmitButton>
        </div>
      </div>
    </form>
  );
}
