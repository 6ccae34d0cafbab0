"use client";
/** The survey's QA thresholds, each with its unit and source. */
import { useActionState } from "react";
import { QA_THRESHOLD_INFO, QA_THRESHOLD_KEYS, type QaThresholds } from "@/src/server/qa-assessment/thresholds";
import { fieldErrorsOf, formErrorOf, IDLE, successOf } from "@/src/ui/action-state";
import { TextField } from "@/src/ui/field";
import { FormError, FormSuccess } from "@/src/ui/form-message";
import { SubmitButton } from "@/src/ui/submit-button";
import { submitWithoutReset } from "@/src/ui/submit-without-reset";
import { updateQaThresholdsAction } from "../actions";

export function ThresholdsForm({ surveyId, thresholds, readOnly }: { surveyId: string; thresholds: QaThresholds; readOnly: boolean }) {
  const [state, action] = useActionState(updateQaThresholdsAction.bind(null, surveyId), IDLE);
  const errors = fieldErrorsOf(state);
  return (
    <form action={action} onSubmit={submitWithoutReset(action)} className="space-y-3" noValidate>
      <div className="grid gap-3 sm:grid-cols-2">
        {QA_THRESHOLD_KEYS.map((k) => {
          const info = QA_THRESHOLD_INFO[k];
          return (
            <TextField
              key={k}
              id={`qa-${k}`}
              name={k}
              label={`${info.label}${info.unit ? ` (${info.unit})` : ""}`}
              inputMode="decimal"
              defaultValue={String(thresholds[k])}
              readOnly={readOnly}
              hint={`Source: ${info.source}`}
              errors={errors[k]}
            />
          );
        })}
      </div>
      <FormError message={formErrorOf(state)} />
      <FormSuccess message={successOf(state)} />
      {readOnly ? null : <SubmitButton pendingLabel="saving">Save thresholds</SubmitButton>}
    </form>
  );
}
