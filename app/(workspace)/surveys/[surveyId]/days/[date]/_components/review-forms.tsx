"use client";
/** Submit (processor, lead) and decide (reviewer) forms of the day's review panel. */
import { useActionState, useState } from "react";
import { fieldErrorsOf, formErrorOf, IDLE, successOf } from "@/src/ui/action-state";
import { FieldErrors, TextAreaField, TextField } from "@/src/ui/field";
import { FormError, FormSuccess } from "@/src/ui/form-message";
import { SubmitButton } from "@/src/ui/submit-button";
import { submitWithoutReset } from "@/src/ui/submit-without-reset";
import { decideDayAction, submitDayAction } from "../review-actions";
import type { ActionState } from "@/src/ui/action-state";
import type { ReviewState } from "@/src/server/review/states";

/**
 * Holds both forms' action state, so the outcome (who was mailed) stays on screen after the page
 * refreshes into the next review state and the form that sent it is no longer offered.
 */
export function ReviewControls({ surveyId, day, state, canSubmit, canDecide, lines }: { surveyId: string; day: string; state: ReviewState; canSubmit: boolean; canDecide: boolean; lines: string[] }) {
  const [submitState, submitAction] = useActionState(submitDayAction.bind(null, surveyId, day), IDLE);
  const [decideState, decideAction] = useActionState(decideDayAction.bind(null, surveyId, day), IDLE);
  const showSubmit = canSubmit && (state === "in_processing" || state === "resurvey_needed");
  const showDecide = canDecide && state === "awaiting_review";
  return (
    <div className="space-y-3">
      {!showSubmit ? <FormSuccess message={successOf(submitState)} /> : null}
      {!showDecide ? <FormSuccess message={successOf(decideState)} /> : null}
      {showSubmit ? <SubmitDayForm state={submitState} action={submitAction} again={state === "resurvey_needed"} /> : null}
      {showDecide ? <DecideDayForm state={decideState} action={decideAction} lines={lines} /> : null}
    </div>
  );
}

type FormProps = { state: ActionState; action: (formData: FormData) => void };

function SubmitDayForm({ state, action, again }: FormProps & { again: boolean }) {
  const errors = fieldErrorsOf(state);
  return (
    <form action={action} onSubmit={submitWithoutReset(action)} className="space-y-3" noValidate>
      <TextAreaField id="submit-comment" name="comment" label="Note for the reviewer" optional rows={2} maxLength={4000} errors={errors.comment} hint="E.g. what was re-walked, or anything odd in the base record." />
      <FormError message={formErrorOf(state)} />
      <SubmitButton pendingLabel="submitting" className="w-full">{again ? "Submit again for review" : "Submit for review"}</SubmitButton>
    </form>
  );
}

function DecideDayForm({ state, action, lines }: FormProps & { lines: string[] }) {
  const [decision, setDecision] = useState<"accept" | "resurvey" | null>(null); // no default: a decision is chosen, never assumed
  const [scope, setScope] = useState<"day" | "lines">("day");
  const errors = fieldErrorsOf(state);
  return (
    <form action={action} onSubmit={submitWithoutReset(action)} className="space-y-3" noValidate>
      <fieldset>
        <legend className="mb-1 text-sm font-medium text-ink-800">Decision</legend>
        <label className="flex items-center gap-2 text-sm"><input type="radio" name="decision" value="accept" checked={decision === "accept"} onChange={() => setDecision("accept")} /> Accept the day</label>
        <label className="flex items-center gap-2 text-sm"><input type="radio" name="decision" value="resurvey" checked={decision === "resurvey"} onChange={() => setDecision("resurvey")} /> Re-survey needed</label>
        <FieldErrors id="decision-error" errors={errors.decision} />
      </fieldset>
      {decision === "resurvey" ? (
        <>
          <fieldset>
            <legend className="mb-1 text-sm font-medium text-ink-800">What must be walked again</legend>
            <label className="flex items-center gap-2 text-sm"><input type="radio" name="scope" value="day" checked={scope === "day"} onChange={() => setScope("day")} /> The whole day</label>
            <label className="flex items-center gap-2 text-sm"><input type="radio" name="scope" value="lines" checked={scope === "lines"} onChange={() => setScope("lines")} /> Listed lines</label>
            <FieldErrors id="scope-error" errors={errors.scope} />
          </fieldset>
          {scope === "lines" ? (
            <TextField
              id="decide-lines"
              name="lines"
              label="Lines to re-walk"
              placeholder={lines.slice(0, 2).join(", ") || "L100, L101"}
              hint={lines.length ? `Lines of the day: ${lines.join(", ")}` : "Separate names with commas or spaces."}
              errors={errors.lines}
            />
          ) : null}
        </>
      ) : null}
      <TextAreaField
        id="decide-comment"
        name="comment"
        label={decision === "resurvey" ? "Comment for the crew" : "Comment"}
        optional={decision === "accept"}
        rows={3}
        maxLength={4000}
        errors={errors.comment}
        hint={decision === "resurvey" ? "Required: say why (the crew and processor get it by mail)." : undefined}
      />
      <FormError message={formErrorOf(state)} />
      <SubmitButton pendingLabel="saving" variant={decision === "resurvey" ? "danger" : "primary"} className="w-full">
        {decision === "accept" ? "Accept day" : decision === "resurvey" ? "Send back for re-survey" : "Save decision"}
      </SubmitButton>
    </form>
  );
}
