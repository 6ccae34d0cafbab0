"use client";
import { useActionState, useState } from "react";
import {
  DATUM_KINDS, DATUM_LABELS, INTERPOLATIONS, INTERPOLATION_LABELS, REFERENCE_MODELS, REFERENCE_MODEL_LABELS, TIME_BASES,
  type DatumKind, type ProcessingSettings,
} from "@/src/server/processing/schema";
import { fieldErrorsOf, formErrorOf, IDLE, successOf } from "@/src/ui/action-state";
import { SelectField, TextField } from "@/src/ui/field";
import { FormError, FormSuccess } from "@/src/ui/form-message";
import { SubmitButton } from "@/src/ui/submit-button";
import { updateProcessingSettingsAction } from "../actions";

const TIME_BASIS_LABELS: Record<(typeof TIME_BASES)[number], string> = { utc: "UTC", gps: "GPS time", local: "Local time of the survey" };

export function SettingsForm({ surveyId, settings, baseSites, readOnly, igrfAvailable }: { surveyId: string; settings: ProcessingSettings; baseSites: string[]; readOnly: boolean; igrfAvailable: boolean }) {
  const [state, action] = useActionState(updateProcessingSettingsAction.bind(null, surveyId), IDLE);
  const [datumKind, setDatumKind] = useState<DatumKind>(settings.datumKind);
  const [gap, setGap] = useState(String(settings.maxBaseGapS));
  const errors = fieldErrorsOf(state);
  const gapError = gap.trim() === "" || !(Number(gap) >= 1 && Number(gap) <= 86_400) ? ["Between 1 and 86 400 s."] : undefined;
  return (
    <form action={action} className="space-y-5" noValidate>
      <fieldset disabled={readOnly} className="grid gap-4 sm:grid-cols-2">
        <SelectField id="datumKind" name="datumKind" label="Datum" value={datumKind} onChange={(e) => setDatumKind(e.target.value as DatumKind)}
          options={DATUM_KINDS.map((k) => ({ value: k, label: DATUM_LABELS[k] }))} errors={errors.datumKind}
          hint="Practice: a fixed round value near the base's typical reading, kept for the whole survey." />
        <TextField id="datumValueNt" name="datumValueNt" label="Datum value (nT)" inputMode="decimal" defaultValue={settings.datumValueNt ?? ""}
          disabled={datumKind !== "value"} optional={datumKind !== "value"} errors={errors.datumValueNt} />
        <SelectField id="interpolation" name="interpolation" label="Interpolation of the base" defaultValue={settings.interpolation}
          options={INTERPOLATIONS.map((k) => ({ value: k, label: INTERPOLATION_LABELS[k] }))} errors={errors.interpolation} />
        <TextField id="maxBaseGapS" name="maxBaseGapS" label="Longest base gap bridged (s)" inputMode="numeric" value={gap} onChange={(e) => setGap(e.target.value)}
          errors={errors.maxBaseGapS ?? gapError} hint="Rover readings inside a longer gap are flagged, not corrected." />
        <SelectField id="referenceModel" name="referenceModel" label="Reference model" defaultValue={settings.referenceModel}
          options={REFERENCE_MODELS.map((k) => ({ value: k, label: REFERENCE_MODEL_LABELS[k] + (k === "igrf" && !igrfAvailable ? " (table not loaded on this server)" : "") }))}
          errors={errors.referenceModel} />
        <SelectField id="defaultTimeBasis" name="defaultTimeBasis" label="Default time basis of new logs" defaultValue={settings.defaultTimeBasis}
          options={TIME_BASES.map((k) => ({ value: k, label: TIME_BASIS_LABELS[k] }))} errors={errors.defaultTimeBasis} />
        <div className="flex items-start gap-2 pt-6">
          <input id="applyInstrumentOffset" name="applyInstrumentOffset" type="checkbox" defaultChecked={settings.applyInstrumentOffset} className="mt-1 accent-tide-700" />
          <label htmlFor="applyInstrumentOffset" className="text-sm text-ink-800">Apply the instrument offset (rover − base, read side by side at setup and pack-up)</label>
        </div>
        <TextField id="instrumentOffsetNt" name="instrumentOffsetNt" label="Instrument offset (nT)" inputMode="decimal" defaultValue={settings.instrumentOffsetNt} errors={errors.instrumentOffsetNt} />
        <SelectField id="mainBaseSite" name="mainBaseSite" label="Main base site" defaultValue={settings.mainBaseSite ?? ""}
          options={[{ value: "", label: "The site with the most base logs" }, ...baseSites.map((b) => ({ value: b, label: b }))]} errors={errors.mainBaseSite} />
        <TextField id="loopStation" name="loopStation" label="Base reoccupation station id" defaultValue={settings.loopStation} errors={errors.loopStation}
          hint="Days with no base log are corrected by looping from rover readings with this station id." />
      </fieldset>
      <FormError message={formErrorOf(state)} />
      <FormSuccess message={successOf(state)} />
      {readOnly ? null : <SubmitButton pendingLabel="saving">Save settings</SubmitButton>}
    </form>
  );
}
