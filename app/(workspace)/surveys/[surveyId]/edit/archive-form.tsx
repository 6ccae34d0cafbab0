"use client";

import { useActionState } from "react";
import { IDLE, formErrorOf, successOf, type ActionState } from "@/src/ui/action-state";
import { ConfirmSubmit } from "@/src/ui/confirm-submit";
import { FormError, FormSuccess } from "@/src/ui/form-message";
import { SubmitButton } from "@/src/ui/submit-button";

export function ArchiveForm({
  archived,
  action,
}: {
  archived: boolean;
  action: (prev: ActionState, formData: FormData) => Promise<ActionState>;
}) {
  const [state, formAction] = useActionState(action, IDLE);
  return (
    <form action={formAction} className="space-y-3">
      <FormError message={formErrorOf(state)} />
      <FormSuccess message={successOf(state)} />
      <input type="hidden" name="intent" value={archived ? "restore" : "archive"} />
      {archived ? (
        <SubmitButton variant="secondary">Restore survey</SubmitButton>
      ) : (
        <ConfirmSubmit label="Archive survey" question="Archive this survey? It becomes read-only." confirmLabel="Yes, archive" />
      )}
    </form>
  );
}
