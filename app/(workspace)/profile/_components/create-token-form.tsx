"use client";
import { useActionState } from "react";
import { FormError } from "@/src/ui/form-message";
import { TextField } from "@/src/ui/field";
import { SubmitButton } from "@/src/ui/submit-button";
import { createApiTokenAction, type CreateTokenState } from "../actions";

export function CreateTokenForm({ curlExample }: { curlExample: string }) {
  const [state, action] = useActionState<CreateTokenState, FormData>(createApiTokenAction, { status: "idle" });
  return (
    <div className="space-y-3">
      <form action={action} className="flex flex-wrap items-end gap-3">
        <TextField
          id="token-name"
          name="name"
          label="Token name"
          hint="The laptop or script it is for."
          maxLength={80}
          required
          className="min-w-64 flex-1"
          errors={state.status === "error" ? state.fieldErrors.name : undefined}
        />
        <SubmitButton pendingLabel="creating">Create token</SubmitButton>
      </form>
      <FormError message={state.status === "error" ? state.formError : undefined} />
      {state.status === "created" ? (
        <div role="status" className="space-y-2 rounded-md border border-flare-500/50 bg-flare-50 px-3 py-3 text-sm text-ink-800">
          <p className="font-medium text-flare-700">Copy the token for “{state.name}” now: it is shown only once and stored only as a hash.</p>
          <label htmlFor="new-token" className="sr-only">New API token</label>
          <input id="new-token" readOnly value={state.token} className="num block w-full rounded border border-ink-200 bg-white px-2 py-1.5 font-mono text-xs" onFocus={(e) => e.currentTarget.select()} />
          <p className="text-xs text-ink-600">Upload a log from the field laptop:</p>
          <pre className="overflow-x-auto rounded bg-ink-900 px-3 py-2 text-xs text-paper-50">{curlExample.replace("$FIELDTIDE_TOKEN", state.token)}</pre>
        </div>
      ) : null}
    </div>
  );
}
