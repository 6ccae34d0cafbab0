"use client";
/** Kp values typed in ("start,kp" per line) or uploaded as a CSV file. */
import { useActionState } from "react";
import { fieldErrorsOf, formErrorOf, IDLE, successOf } from "@/src/ui/action-state";
import { TextAreaField, TextField } from "@/src/ui/field";
import { FormError, FormSuccess } from "@/src/ui/form-message";
import { SubmitButton } from "@/src/ui/submit-button";
import { submitWithoutReset } from "@/src/ui/submit-without-reset";
import { saveKpAction } from "../actions";

export function KpForm({ surveyId }: { surveyId: string }) {
  const [state, action] = useActionState(saveKpAction.bind(null, surveyId), IDLE);
  const errors = fieldErrorsOf(state);
  return (
    <form action={action} onSubmit={submitWithoutReset(action)} className="space-y-3" noValidate>
      <TextAreaField
        id="kp-text"
        name="text"
        label="Kp values"
        rows={5}
        placeholder={"start,kp\n2026-05-06T09:00Z,5+\n2026-05-06T12:00Z,6.33"}
        hint="One 3-hour interval per line: its start in UTC (00, 03, … 21 h) and Kp 0–9 (decimal or 5-, 5o, 5+). A value for an interval already held replaces it."
        errors={errors.text}
      />
      <TextField id="kp-file" name="file" type="file" accept=".csv,.txt,text/csv,text/plain" label="…or a CSV file of the same two columns" optional errors={errors.file} />
      <FormError message={formErrorOf(state)} />
      <FormSuccess message={successOf(state)} />
      <SubmitButton variant="secondary" pendingLabel="saving">Save Kp values</SubmitButton>
    </form>
  );
}
