"use client";
/**
 * Survey details form for create and edit. Validates as you type with the same zod schema the
 * server uses (SurveyInputSchema), then the server validates again; server messages (e.g. "This
 * code is taken.") show beside the field until that field is edited.
 */
import { useActionState, useMemo, useState } from "react";
import { SurveyInputSchema } from "@/src/server/surveys/schema";
import { IDLE, fieldErrorsOf, formErrorOf, successOf, type ActionState } from "@/src/ui/action-state";
import { SelectField, TextAreaField, TextField } from "@/src/ui/field";
import { FormError, FormSuccess } from "@/src/ui/form-message";
import { SubmitButton } from "@/src/ui/submit-button";
import { submitWithoutReset } from "@/src/ui/submit-without-reset";

export type SurveyFormValues = {
  name: string;
  code: string;
  client: string;
  areaDescription: string;
  timeZone: string;
  notes: string;
};

type FieldName = keyof SurveyFormValues;
const FIELDS: FieldName[] = ["name", "code", "client", "areaDescription", "timeZone", "notes"];

function clientErrors(values: SurveyFormValues): Partial<Record<FieldName, string[]>> {
  const result = SurveyInputSchema.safeParse(values);
  if (result.success) return {};
  const out: Partial<Record<FieldName, string[]>> = {};
  for (const issue of result.error.issues) {
    const key = String(issue.path[0]) as FieldName;
    (out[key] ??= []).push(issue.message);
  }
  return out;
}

export function SurveyForm({
  action,
  initial,
  timeZones,
  submitLabel,
  disabled = false,
}: {
  action: (prev: ActionState, formData: FormData) => Promise<ActionState>;
  initial: SurveyFormValues;
  timeZones: string[];
  submitLabel: string;
  disabled?: boolean;
}) {
  const [state, formAction] = useActionState(async (prev: ActionState, formData: FormData) => {
    const next = await action(prev, formData);
    setEditedSinceSubmit(new Set());
    return next;
  }, IDLE);
  const [values, setValues] = useState<SurveyFormValues>(initial);
  const [touched, setTouched] = useState<Set<FieldName>>(new Set());
  const [editedSinceSubmit, setEditedSinceSubmit] = useState<Set<FieldName>>(new Set());
  const [submitted, setSubmitted] = useState(false);

  const live = useMemo(() => clientErrors(values), [values]);
  const server = fieldErrorsOf(state);

  const zoneOptions = useMemo(() => {
    const zones = timeZones.includes(values.timeZone) || !values.timeZone ? timeZones : [values.timeZone, ...timeZones];
    return [{ value: "", label: "Choose a time zone…" }, ...zones.map((z) => ({ value: z, label: z.replaceAll("_", " ") }))];
  }, [timeZones, values.timeZone]);

  function errorsFor(field: FieldName): string[] | undefined {
    if ((touched.has(field) || submitted) && live[field]?.length) return live[field];
    if (!editedSinceSubmit.has(field) && server[field]?.length) return server[field];
    return undefined;
  }

  function set(field: FieldName, value: string) {
    setValues((v) => ({ ...v, [field]: value }));
    setEditedSinceSubmit((s) => new Set(s).add(field));
  }
  const touch = (field: FieldName) => () => setTouched((t) => new Set(t).add(field));
  const common = (field: FieldName) => ({
    id: `survey-${field}`,
    name: field,
    value: values[field],
    errors: errorsFor(field),
    onBlur: touch(field),
    disabled,
  });

  return (
    <form
      action={formAction}
      noValidate
      className="space-y-5"
      onSubmit={submitWithoutReset(formAction, () => {
        setSubmitted(true);
        if (Object.keys(live).length === 0) return true;
        setTouched(new Set(FIELDS));
        return false;
      })}
    >
      <FormError message={formErrorOf(state)} />
      <FormSuccess message={successOf(state)} />
      <div className="grid gap-5 sm:grid-cols-[minmax(0,2fr)_minmax(0,1fr)]">
        <TextField {...common("name")} label="Name" required maxLength={120} autoComplete="off" onChange={(e) => set("name", e.target.value)} />
        <TextField
          {...common("code")}
          label="Code"
          required
          maxLength={20}
          autoComplete="off"
          spellCheck={false}
          className="[&_input]:uppercase [&_input]:tracking-wide"
          hint="2–20 capitals, digits or dashes, e.g. BRM-26."
          onChange={(e) => set("code", e.target.value.toUpperCase())}
        />
      </div>
      <div className="grid gap-5 sm:grid-cols-2">
        <TextField {...common("client")} label="Client" optional maxLength={120} onChange={(e) => set("client", e.target.value)} />
        <SelectField
          {...common("timeZone")}
          label="Time zone"
          required
          options={zoneOptions}
          hint="IANA zone where the crew works; screens show field times in it."
          onChange={(e) => {
            set("timeZone", e.target.value);
            touch("timeZone")();
          }}
        />
      </div>
      <TextAreaField
        {...common("areaDescription")}
        label="Area description"
        optional
        rows={3}
        maxLength={2000}
        hint="Where the grid lies, ground conditions, known services or foundations."
        onChange={(e) => set("areaDescription", e.target.value)}
      />
      <TextAreaField {...common("notes")} label="Notes" optional rows={4} maxLength={5000} onChange={(e) => set("notes", e.target.value)} />
      {disabled ? null : (
        <div className="flex flex-wrap gap-2 pt-1">
          <SubmitButton>{submitLabel}</SubmitButton>
        </div>
      )}
    </form>
  );
}
