"use client";
/** A processor's choice of the day's logs: the defaults, a chosen base (and second base), or looping. */
import { useActionState, useState } from "react";
import { fieldErrorsOf, formErrorOf, IDLE, successOf } from "@/src/ui/action-state";
import { SelectField } from "@/src/ui/field";
import { FormError, FormSuccess } from "@/src/ui/form-message";
import { SubmitButton } from "@/src/ui/submit-button";
import { savePairingAction } from "../actions";

type LogOption = { id: number; name: string };

export function PairingForm({
  surveyId, day, explicit, method, baseLogId, fallbackBaseLogId, baseLogs, roverLogs, chosenRoverIds,
}: {
  surveyId: string; day: string; explicit: boolean; method: "base" | "loop" | "none"; baseLogId: number | null; fallbackBaseLogId: number | null;
  baseLogs: LogOption[]; roverLogs: LogOption[]; chosenRoverIds: number[];
}) {
  const [state, action] = useActionState(savePairingAction.bind(null, surveyId, day), IDLE);
  const [choice, setChoice] = useState<string>(explicit ? (method === "none" ? "base" : method) : "default");
  const errors = fieldErrorsOf(state);
  const baseOptions = baseLogs.map((l) => ({ value: String(l.id), label: l.name }));
  return (
    <form action={action} className="mt-3 space-y-3 border-t border-ink-100 pt-3" noValidate>
      <SelectField id="pairing-method" name="method" label="Logs used" value={choice} onChange={(e) => setChoice(e.target.value)} errors={errors.method}
        options={[
          { value: "default", label: "Default (main base site)" },
          ...(baseLogs.length > 0 ? [{ value: "base", label: "Base logs chosen below" }] : []),
          { value: "loop", label: "Looping from base reoccupations" },
        ]} />
      {choice === "base" ? (
        <>
          <SelectField id="pairing-base" name="baseLogId" label="Base log" defaultValue={String(baseLogId ?? baseLogs[0]?.id ?? "")} options={baseOptions} errors={errors.baseLogId} />
          <SelectField id="pairing-fallback" name="fallbackBaseLogId" label="Second base (fills gaps)" defaultValue={String(fallbackBaseLogId ?? "")}
            options={[{ value: "", label: "None" }, ...baseOptions]} errors={errors.fallbackBaseLogId} />
        </>
      ) : null}
      {choice !== "default" && roverLogs.length > 1 ? (
        <fieldset>
          <legend className="mb-1 text-sm font-medium text-ink-800">Rover logs (none ticked = all)</legend>
          {roverLogs.map((l) => (
            <label key={l.id} className="flex items-center gap-2 text-sm text-ink-700">
              <input type="checkbox" name="roverLogIds" value={l.id} defaultChecked={chosenRoverIds.includes(l.id)} className="accent-tide-700" /> {l.name}
            </label>
          ))}
        </fieldset>
      ) : null}
      <FormError message={formErrorOf(state) ?? errors.roverLogIds?.join(" ")} />
      <FormSuccess message={successOf(state)} />
      <SubmitButton variant="secondary" pendingLabel="saving">Save choice of logs</SubmitButton>
    </form>
  );
}
