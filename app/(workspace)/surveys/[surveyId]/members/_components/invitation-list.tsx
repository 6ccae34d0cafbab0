"use client";

import { useActionState } from "react";
import type { PendingInvitation } from "@/src/server/invitations/service";
import { IDLE, formErrorOf, successOf, type ActionState } from "@/src/ui/action-state";
import { ConfirmSubmit } from "@/src/ui/confirm-submit";
import { FormError, FormSuccess } from "@/src/ui/form-message";
import { ClockIcon } from "@/src/ui/icons";
import { RoleChip } from "@/src/ui/role-chip";

export type InvitationRow = PendingInvitation & { expiresLabel: string };

export function InvitationList({
  invitations,
  action,
}: {
  invitations: InvitationRow[];
  action: (prev: ActionState, formData: FormData) => Promise<ActionState>;
}) {
  const [state, formAction] = useActionState(action, IDLE);
  return (
    <div className="space-y-3">
      <FormError message={formErrorOf(state)} />
      <FormSuccess message={successOf(state)} />
      {invitations.length === 0 ? (
        <p className="text-sm text-ink-600">No pending invitations. Invitations you send appear here until they are accepted, revoked or expire.</p>
      ) : (
        <ul className="divide-y divide-ink-100 rounded-lg border border-ink-100 bg-white shadow-sm">
          {invitations.map((inv) => (
            <li key={inv.id} className="flex flex-col gap-2 px-4 py-3 sm:flex-row sm:items-center sm:justify-between">
              <div className="min-w-0 space-y-1">
                <div className="flex flex-wrap items-center gap-2">
                  <span className="break-all font-medium text-ink-900">{inv.email}</span>
                  <RoleChip role={inv.role} />
                </div>
                <p className="flex items-center gap-1 text-xs text-ink-500">
                  <ClockIcon size={12} />
                  <span>
                    Expires <span className="num">{inv.expiresLabel}</span>
                    {inv.invitedBy ? <> · sent by {inv.invitedBy}</> : null}
                  </span>
                </p>
              </div>
              <form action={formAction}>
                <input type="hidden" name="invitationId" value={inv.id} />
                <input type="hidden" name="email" value={inv.email} />
                <ConfirmSubmit label="Revoke" what={`invitation for ${inv.email}`} question={`Revoke the invitation for ${inv.email}?`} confirmLabel="Yes, revoke" />
              </form>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
