import type { Metadata } from "next";
import Link from "next/link";
import { Suspense } from "react";
import type { Actor } from "@/src/server/auth/session";
import { requireActor } from "@/src/server/auth/session";
import { listSurveys } from "@/src/server/surveys/service";
import { LinkButton } from "@/src/ui/button";
import { EmptyState } from "@/src/ui/empty-state";
import { PlusIcon } from "@/src/ui/icons";
import { LoadingBlock } from "@/src/ui/loading-block";
import { PageHeader } from "@/src/ui/page-header";
import { SurveyList } from "./_components/survey-list";

export const metadata: Metadata = { title: "Surveys" };

function NewSurveyButton() {
  return (
    <LinkButton href="/surveys/new" variant="primary">
      <PlusIcon /> New survey
    </LinkButton>
  );
}

async function Surveys({ actor, includeArchived }: { actor: Actor; includeArchived: boolean }) {
  const surveys = await listSurveys(actor, { includeArchived });
  const archivedCount = surveys.filter((s) => s.archivedAt).length;
  return (
    <>
      <div className="mb-4 flex flex-wrap items-center justify-between gap-2 text-sm">
        <p className="text-ink-600">
          <span className="num font-medium text-ink-800">{surveys.length}</span> {surveys.length === 1 ? "survey" : "surveys"}
          {includeArchived ? (
            <>
              {" "}
              (<span className="num">{archivedCount}</span> archived)
            </>
          ) : null}
        </p>
        <Link href={includeArchived ? "/surveys" : "/surveys?archived=1"} className="rounded-md px-2 py-1 text-tide-700 underline underline-offset-2 hover:text-tide-800">
          {includeArchived ? "Hide archived surveys" : "Show archived surveys"}
        </Link>
      </div>
      {surveys.length === 0 ? (
        <EmptyState title={includeArchived ? "No surveys, archived or not" : "No active surveys"} action={actor.isAdmin ? <NewSurveyButton /> : null}>
          {actor.isAdmin
            ? "Create the first survey: give it a code, a client and the time zone the crew works in."
            : "When a survey lead invites you, the invitation arrives by e-mail; follow its link to join. Ask your lead if you expected one."}
        </EmptyState>
      ) : (
        <SurveyList surveys={surveys} />
      )}
    </>
  );
}

export default async function SurveysPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const actor = await requireActor("/surveys");
  const includeArchived = (await searchParams).archived === "1";
  return (
    <>
      <PageHeader
        title="Surveys"
        description={actor.isAdmin ? "Every survey of the organisation." : "The surveys you are a member of."}
        actions={actor.isAdmin ? <NewSurveyButton /> : null}
      />
      <Suspense key={String(includeArchived)} fallback={<LoadingBlock label="Loading surveys…" rows={3} />}>
        <Surveys actor={actor} includeArchived={includeArchived} />
      </Suspense>
    </>
  );
}
