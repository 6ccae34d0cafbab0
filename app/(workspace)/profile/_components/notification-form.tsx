"use client";
/** Which review mail the user wants: one checkbox per kind. */
import { useActionState } from "react";
import { NOTIFICATION_KINDS, NOTIFICATION_LABELS, type NotificationKind } from "@/src/server/notifications/kinds";
import { formErrorOf, IDLE, successOf } from "@/src/ui/action-state";
import { FormError, FormSuccess } from "@/src/ui/form-message";
import { SubmitButton } from "@/src/ui/submit-button";
import { saveNotificationPreferencesAction } from "../notification-actions";

export function NotificationForm({ preferences }: { preferences: Record<NotificationKind, boolean> }) {
  const [state, action] = useActionState(saveNotificationPreferencesAction, IDLE);
  return (
    <form action={action} className="space-y-3">
      <fieldset className="space-y-2">
        <legend className="sr-only">Review mail you receive</legend>
        {NOTIFICATION_KINDS.map((k) => (
          <label key={k} className="flex items-start gap-2 text-sm">
            <input type="checkbox" name="enabled" value={k} defaultChecked={preferences[k]} className="mt-1" />
            <span>
              <span className="font-medium text-ink-900">{NOTIFICATION_LABELS[k].label}</span>
              <span className="block text-xs text-ink-500">{NOTIFICATION_LABELS[k].who}</span>
            </span>
          </label>
        ))}
      </fieldset>
      <FormError message={formErrorOf(state)} />
      <FormSuccess message={successOf(state)} />
      <SubmitButton variant="secondary" pendingLabel="saving">Save mail choices</SubmitButton>
    </form>
  );
}
