"use client";
/**
 * Members of a survey: columns on a wide screen, stacked rows on a phone (one markup). Managers
 * (lead, admin) change a role with select + Save and remove with a confirm step; one outcome
 * line above the list reports the last change.
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

const COLUMNS = "md:grid-cols-[minmax(0,1.2fr)_minmax(0,1.6fr)_minmax(0,1.5fr)_6.5rem_9rem]";

function MemberIdentity({ m, isYou }: { m: MemberRow; isYou: boolean }) {
  return (
    <>
      <div className="font-medium text-ink-900">
        {m.name}
        {isYou ? <span className="ml-1 text-xs font-normal text-ink-500">(you)</span> : null}
      </div>
      <div className="break-all text-sm text-ink-700">{m.email}</div>
    </>
  );
}

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
      <div className="overflow-hidden rounded-lg border border-ink-100 bg-white shadow-sm">
        <div aria-hidden="true" className={`hidden gap-4 border-b border-ink-100 bg-ink-50 px-4 py-2 text-xs font-semibold uppercase tracking-wide text-ink-500 md:grid ${COLUMNS}`}>
          <span>Name</span>
          <span>E-mail</span>
          <span>Role</span>
          <span>Joined</span>
          <span />
        </div>
        <ul className="divide-y divide-ink-100">
          {members.map((m) => (
            <li key={m.userId} className={`grid grid-cols-1 gap-2 px-4 py-3 md:items-center md:gap-4 ${COLUMNS}`}>
              <MemberIdentity m={m} isYou={m.userId === currentUserId} />
              <div>
                {canManage ? (
                  <form action={formAction} className="flex items-center gap-2">
                    <input type="hidden" name="userId" value={m.userId} />
                    <input type="hidden" name="memberName" value={m.name} />
                    <input type="hidden" name="intent" value="role" />
                    <select
                      key={m.role /* remount so the form reset after Save shows the saved role */}
                      name="role"
                      defaultValue={m.role}
                      aria-label={`Change ${m.name} to`}
                      className="min-h-9 min-w-0 flex-1 rounded-md border border-ink-200 bg-white px-2 py-1.5 text-sm focus:outline-2 focus:outline-tide-600 md:max-w-[11rem]"
                    >
                      {ROLE_OPTIONS.map((o) => (
                        <option key={o.value} value={o.value}>
                          {o.label}
                        </option>
                      ))}
                    </select>
                    <SubmitButton variant="secondary" className="min-h-9 px-2.5 py-1">
                      Save<span className="sr-only"> for {m.name}</span>
                    </SubmitButton>
                  </form>
                ) : (
                  <RoleChip role={m.role} />
                )}
              </div>
              <div className="text-sm text-ink-700">
                <span className="text-ink-500 md:hidden">Joined </span>
                <span className="num">{m.joinedLabel}</span>
              </div>
              <div className="md:text-right">
                {canManage ? (
                  <form action={formAction}>
                    <input type="hidden" name="userId" value={m.userId} />
                    <input type="hidden" name="memberName" value={m.name} />
                    <input type="hidden" name="intent" value="remove" />
                    <ConfirmSubmit label="Remove" what={m.name} question={`Remove ${m.name}?`} confirmLabel="Yes, remove" />
                  </form>
                ) : null}
              </div>
            </li>
          ))}
        </ul>
      </div>
    </div>
  );
}
