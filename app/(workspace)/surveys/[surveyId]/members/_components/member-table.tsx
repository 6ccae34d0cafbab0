"use client";
/**
 * Members of a survey. Managers (lead, admin) change a role with select + Save and remove with a
 * confirm step; one outcome line above the table reports the last change.
 */
import { useActionState } from "react";
import type { Member } from "@/src/server/surveys/service";
import { IDLE, formErrorOf, successOf, type ActionState } from "@/src/ui/action-state";
import { ConfirmSubmit } from "@/src/ui/confirm-submit";
import { FormError, FormSuccess } from "@/src/ui/form-message";
import { RoleChip } from "@/src/ui/role-chip";
import { SubmitButton } from "@/src/ui/submit-button";
import { ROLE_OPTIONS } from "./role-options";

export type MemberRow = Member & { joinedLabel: string };

export function MemberTable({
  members,
  canManage,
  currentUserId,
  action,
}: {
  members: MemberRow[];
  canManage: boolean;
  currentUserId: string;
  action: (prev: ActionState, formData: FormData) => Promise<ActionState>;
}) {
  const [state, formAction] = useActionState(action, IDLE);
  return (
    <div className="space-y-3">
      <FormError message={formErrorOf(state)} />
      <FormSuccess message={successOf(state)} />
      <div className="overflow-x-auto rounded-lg border border-ink-100 bg-white shadow-sm">
        <table className="w-full min-w-[36rem] text-left text-sm">
          <thead className="bg-ink-50 text-xs font-semibold uppercase tracking-wide text-ink-500">
            <tr>
              <th scope="col" className="px-4 py-2">Name</th>
              <th scope="col" className="px-4 py-2">E-mail</th>
              <th scope="col" className="px-4 py-2">Role</th>
              <th scope="col" className="px-4 py-2">Joined</th>
              {canManage ? <th scope="col" className="px-4 py-2"><span className="sr-only">Remove</span></th> : null}
            </tr>
          </thead>
          <tbody className="divide-y divide-ink-100">
            {members.map((m) => (
              <tr key={m.userId} className="align-middle">
                <td className="px-4 py-2.5 font-medium text-ink-900">
                  {m.name}
                  {m.userId === currentUserId ? <span className="ml-1 text-xs font-normal text-ink-500">(you)</span> : null}
                </td>
                <td className="px-4 py-2.5 break-all text-ink-700">{m.email}</td>
                <td className="px-4 py-2.5">
                  {canManage ? (
                    <form action={formAction} className="flex items-center gap-2">
                      <input type="hidden" name="userId" value={m.userId} />
                      <input type="hidden" name="memberName" value={m.name} />
                      <input type="hidden" name="intent" value="role" />
                      <select
                        name="role"
                        defaultValue={m.role}
                        aria-label={`Change ${m.name} to`}
                        className="rounded-md border border-ink-200 bg-white px-2 py-1.5 text-sm focus:outline-2 focus:outline-tide-600"
                      >
                        {ROLE_OPTIONS.map((o) => (
                          <option key={o.value} value={o.value}>
                            {o.label}
                          </option>
                        ))}
                      </select>
                      <SubmitButton variant="secondary" className="min-h-8 px-2.5 py-1">
                        Save<span className="sr-only"> for {m.name}</span>
                      </SubmitButton>
                    </form>
                  ) : (
                    <RoleChip role={m.role} />
                  )}
                </td>
                <td className="num px-4 py-2.5 whitespace-nowrap text-ink-700">{m.joinedLabel}</td>
                {canManage ? (
                  <td className="px-4 py-2.5 text-right">
                    <form action={formAction}>
                      <input type="hidden" name="userId" value={m.userId} />
                      <input type="hidden" name="memberName" value={m.name} />
                      <input type="hidden" name="intent" value="remove" />
                      <ConfirmSubmit label={`Remove`} question={`Remove ${m.name}?`} confirmLabel="Yes, remove" />
                    </form>
                  </td>
                ) : null}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </div>
  );
}
