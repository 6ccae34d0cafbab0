import type { Metadata } from "next";
import { guardedRead } from "@/app/_lib/guarded-read";
import { requireActor } from "@/src/server/auth/session";
import { roleAllows } from "@/src/server/authz/permission-table";
import { ValidationError } from "@/src/server/errors";
import { listLogs } from "@/src/server/logs/read-service";
import { getSurvey } from "@/src/server/surveys/service";
import { LinkButton } from "@/src/ui/button";
import { EmptyState } from "@/src/ui/empty-state";
import { PlusIcon } from "@/src/ui/icons";
import { Refusal } from "@/src/ui/refusal";
import { LogsTable } from "./_components/logs-table";

export const metadata: Metadata = { title: "Logs" };

type Props = { params: Promise<{ surveyId: string }>; searchParams: Promise<Record<string, string | string[] | undefined>> };

export default async function LogsPage({ params, searchParams }: Props) {
  const { surveyId } = await params;
  const actor = await requireActor(`/surveys/${surveyId}/logs`);
  const survey = await guardedRead(getSurvey(actor, surveyId));
  if (!survey.ok) return <Refusal message={survey.message} />;
  const s = survey.value;
  const raw = Object.fromEntries(Object.entries(await searchParams).map(([k, v]) => [k, Array.isArray(v) ? v[0] : v]));
  const page = await guardedRead(listLogs(actor, surveyId, raw).catch((err: unknown) => (err instanceof ValidationError ? listLogs(actor, surveyId, {}) : Promise.reject(err))));
  if (!page.ok) return <Refusal message={page.message} />;
  const canUpload = roleAllows(s.myRole, "logs.upload") && !s.archivedAt;
  const upload = canUpload ? (
    <LinkButton href={`/surveys/${surveyId}/logs/upload`} variant="primary">
      <PlusIcon /> Upload logs
    </LinkButton>
  ) : null;
  const filtered = Boolean(page.value.query.kind || page.value.query.day || page.value.query.operator || page.value.query.instrument);
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 className="text-lg font-semibold text-ink-900">Field logs</h2>
        {upload}
      </div>
      {page.value.total === 0 && !filtered ? (
        <EmptyState title="No logs yet" action={upload}>
          {canUpload
            ? "Upload the day's base station log and the rover logs: CSV or plain text, straight from the instruments."
            : "When the crew uploads the day's base and rover logs, they appear here."}
        </EmptyState>
      ) : (
        <LogsTable items={page.value.items} total={page.value.total} query={page.value.query} facets={page.value.facets} timeZone={s.timeZone} />
      )}
    </div>
  );
}
