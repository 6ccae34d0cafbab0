"use client";
/** Datum of the survey, changed from the day page (processor and lead). */
import { useActionState, useState } from "react";
import { DATUM_KINDS, DATUM_LABELS, type DatumKind } from "@/src/server/processing/schema";
import { fieldErrorsOf, formErrorOf, IDLE, successOf } from "@/src/ui/action-state";
import { SelectField, TextField } from "@/src/ui/field";
import { FormError, FormSuccess } from "@/src/ui/form-message";
import { SubmitButton } from "@/src/ui/submit-button";
import { updateDatumAction } from "../actions";

export function DatumForm({ surveyId, day, datumKind, datumValueNt }: { surveyId: string; day: string; datumKind: DatumKind; datumValueNt: number | null }) {
  const [state, action] = useActionState(updateDatumAction.bind(null, surveyId, day), IDLE);
  const [kind, setKind] = useState<DatumKind>(datumKind);
  const errors = fieldErrorsOf(state);
  return (
    <form action={action} className="space-y-3" noValidate>
      <SelectField
        id="datumKind"
        name="datumKind"
        label="Datum"
        value={kind}
        onChange={(e) => setKind(e.target.value as DatumKind)}
        options={DATUM_KINDS.map((k) => ({ value: k, label: DATUM_LABELS[k] }))}
        errors={errors.datumKind}
      />
      {kind === "value" ? (
        <TextField
          id="datumValueNt"
          name="datumValueNt"
          label="Datum value (nT)"
          inputMode="decimal"
          defaultValue={datumValueNt ?? ""}
          hint="A round value near the base's typical reading, kept for the whole survey so days tie together."
          errors={errors.datumValueNt}
        />
      ) : (
        <input type="hidden" name="datumValueNt" value={datumValueNt ?? ""} />
      )}
      <FormError message={formErrorOf(state)} />
      <FormSuccess message={successOf(state)} />
      <SubmitButton variant="secondary" pendingLabel="saving">Save datum</SubmitButton>
    </form>
  );
}
