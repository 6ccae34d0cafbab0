import type { Metadata } from "next";
import Link from "next/link";
import { requireActor } from "@/src/server/auth/session";
import { roleAllows } from "@/src/server/authz/permission-table";
import { SURVEY_ROLES, SURVEY_ROLE_LABELS } from "@/src/server/authz/roles";
import { getSurvey, listMembers } from "@/src/server/surveys/service";
import { guardedRead } from "@/app/_lib/guarded-read";
import { LinkButton } from "@/src/ui/button";
import { formatDateTime } from "@/src/ui/format";
import { PencilIcon, PeopleIcon } from "@/src/ui/icons";
import { Refusal } from "@/src/ui/refusal";

type Props = { params: Promise<{ surveyId: string }> };

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const { surveyId } = await params;
  const actor = await requireActor(`/surveys/${surveyId}`);
  const survey = await guardedRead(getSurvey(actor, surveyId));
  return { title: survey.ok ? `${survey.value.code} ${survey.value.name}` : "Survey" };
}

function Section({ title, children, action }: { title: string; children: React.ReactNode; action?: React.ReactNode }) {
  return (
    <section className="rounded-lg border border-ink-100 bg-white p-5 shadow-sm">
      <div className="mb-2 flex items-center justify-between gap-2">
        <h2 className="text-base font-semibold text-ink-900">{title}</h2>
        {action}
      </div>
      {children}
    </section>
  );
}

function Prose({ text, empty }: { text: string; empty: string }) {
  return text ? <p className="whitespace-pre-line text-sm leading-relaxed text-ink-800">{text}</p> : <p className="text-sm text-ink-500">{empty}</p>;
}

export default async function SurveyOverviewPage({ params }: Props) {
  const { surveyId } = await params;
  const actor = await requireActor(`/surveys/${surveyId}`);
  const survey = await guardedRead(getSurvey(actor, surveyId));
  if (!survey.ok) return <Refusal message={survey.message} />;
  const s = survey.value;
  const canEdit = roleAllows(s.myRole, "survey.update");
  const members = await guardedRead(listMembers(actor, surveyId));

  return (
    <div className="grid gap-5 lg:grid-cols-[minmax(0,2fr)_minmax(0,1fr)]">
      <div className="space-y-5">
        <Section
          title="Area"
          action={canEdit && !s.archivedAt ? <LinkButton href={`/surveys/${s.id}/edit`} variant="quiet"><PencilIcon /> Edit details</LinkButton> : null}
        >
          <Prose text={s.areaDescription} empty={canEdit ? "No area description yet. Add where the grid lies and what is known in the ground." : "No area description yet."} />
        </Section>
        <Section title="Notes">
          <Prose text={s.notes} empty="No notes." />
        </Section>
      </div>
      <div className="space-y-5">
        <LinkButton href={`/surveys/${s.id}/days`} variant="primary" className="w-full">Days: drift curves, corrections, exports</LinkButton>
        <Section
          title="Members"
          action={<LinkButton href={`/surveys/${s.id}/members`} variant="quiet"><PeopleIcon /> {roleAllows(s.myRole, "members.manage") ? "Manage" : "View"}</LinkButton>}
        >
          {members.ok ? (
            members.value.length === 0 ? (
              <p className="text-sm text-ink-600">
                Nobody is on this survey yet.
                {roleAllows(s.myRole, "members.manage") ? (
                  <>
                    {" "}
                    <Link href={`/surveys/${s.id}/members`} className="text-tide-700 underline underline-offset-2">Invite its lead</Link> to start.
                  </>
                ) : null}
              </p>
            ) : (
              <>
                <p className="mb-3 text-sm text-ink-700">
                  <span className="num font-semibold text-ink-900">{members.value.length}</span> {members.value.length === 1 ? "member" : "members"}
                </p>
                <ul className="space-y-1.5 text-sm">
                  {SURVEY_ROLES.filter((role) => members.value.some((m) => m.role === role))
                    .toReversed()
                    .map((role) => {
                      const names = members.value.filter((m) => m.role === role).map((m) => m.name);
                      return (
                        <li key={role} className="flex gap-2">
                          <span className="w-28 shrink-0 text-ink-500">{SURVEY_ROLE_LABELS[role]}</span>
                          <span className="text-ink-800">{names.join(", ")}</span>
                        </li>
                      );
                    })}
                </ul>
              </>
            )
          ) : (
            <p className="text-sm text-ink-600">{members.message}</p>
          )}
        </Section>
        <Section title="Record">
          <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
            <dt className="text-ink-500">Created</dt>
            <dd className="num text-ink-800">{formatDateTime(s.createdAt)} UTC</dd>
            <dt className="text-ink-500">Last change</dt>
            <dd className="num text-ink-800">{formatDateTime(s.updatedAt)} UTC</dd>
            {s.archivedAt ? (
              <>
                <dt className="text-ink-500">Archived</dt>
                <dd className="num text-ink-800">{formatDateTime(s.archivedAt)} UTC</dd>
              </>
            ) : null}
          </dl>
        </Section>
      </div>
    </div>
  );
}
