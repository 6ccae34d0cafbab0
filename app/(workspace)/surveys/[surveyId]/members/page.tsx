import type { Metadata } from "next";
import { requireActor } from "@/src/server/auth/session";
import { roleAllows } from "@/src/server/authz/permission-table";
import { listInvitations } from "@/src/server/invitations/service";
import { getSurvey, listMembers } from "@/src/server/surveys/service";
import { guardedRead } from "@/app/_lib/guarded-read";
import { EmptyState } from "@/src/ui/empty-state";
import { formatDate, formatDateTime } from "@/src/ui/format";
import { Refusal } from "@/src/ui/refusal";
import { inviteAction, memberAction, revokeInvitationAction } from "./actions";
import { InvitationList } from "./_components/invitation-list";
import { InviteForm } from "./_components/invite-form";
import { MemberTable } from "./_components/member-table";

export const metadata: Metadata = { title: "Members" };

export default async function MembersPage({ params }: { params: Promise<{ surveyId: string }> }) {
  const { surveyId } = await params;
  const actor = await requireActor(`/surveys/${surveyId}/members`);
  const survey = await guardedRead(getSurvey(actor, surveyId));
  if (!survey.ok) return <Refusal message={survey.message} />;
  const s = survey.value;
  const members = await guardedRead(listMembers(actor, surveyId));
  if (!members.ok) return <Refusal message={members.message} />;
  const canManage = roleAllows(s.myRole, "members.manage");
  const archived = Boolean(s.archivedAt);
  const invitations = canManage ? await guardedRead(listInvitations(actor, surveyId)) : null;

  return (
    <div className="space-y-8">
      <section aria-labelledby="members-heading" className="space-y-3">
        <div className="flex flex-wrap items-baseline justify-between gap-2">
          <h2 id="members-heading" className="text-lg font-semibold text-ink-900">
            Members <span className="num text-base font-normal text-ink-500">({members.value.length})</span>
          </h2>
          <p className="text-xs text-ink-500">Joined dates in survey time ({s.timeZone}).</p>
        </div>
        {members.value.length === 0 ? (
          <EmptyState title="Nobody is on this survey yet">
            {canManage ? "Invite the survey lead first; the lead then invites crew, processors and reviewers." : null}
          </EmptyState>
        ) : (
          <MemberTable
            members={members.value.map((m) => ({ ...m, joinedLabel: formatDate(m.joinedAt, s.timeZone) }))}
            canManage={canManage && !archived}
            currentUserId={actor.userId}
            action={memberAction.bind(null, s.id)}
          />
        )}
        {!canManage ? <p className="text-sm text-ink-600">The survey lead manages members and invitations.</p> : null}
      </section>

      {canManage ? (
        <>
          <section aria-labelledby="invite-heading" className="rounded-lg border border-ink-100 bg-white p-5 shadow-sm">
            <h2 id="invite-heading" className="mb-1 text-lg font-semibold text-ink-900">
              Invite someone
            </h2>
            {archived ? (
              <p className="text-sm text-ink-600">This survey is archived. Restore it before inviting anyone.</p>
            ) : (
              <>
                <p className="mb-4 text-sm text-ink-600">
                  We e-mail a link that works once, for 72 hours. New people choose their name and password; people with an account confirm with
                  their password.
                </p>
                <InviteForm action={inviteAction.bind(null, s.id)} />
              </>
            )}
          </section>
          <section aria-labelledby="pending-heading" className="space-y-3">
            <div className="flex flex-wrap items-baseline justify-between gap-2">
              <h2 id="pending-heading" className="text-lg font-semibold text-ink-900">
                Pending invitations
              </h2>
              <p className="text-xs text-ink-500">Expiry in survey time ({s.timeZone}).</p>
            </div>
            {invitations && invitations.ok ? (
              <InvitationList
                invitations={invitations.value.map((inv) => ({ ...inv, expiresLabel: formatDateTime(inv.expiresAt, s.timeZone) }))}
                action={revokeInvitationAction.bind(null, s.id)}
              />
            ) : (
              <p className="text-sm text-ink-600">{invitations?.ok === false ? invitations.message : null}</p>
            )}
          </section>
        </>
      ) : null}
    </div>
  );
}
