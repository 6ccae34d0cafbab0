import type { Metadata } from "next";
import Link from "next/link";
import { guardedRead } from "@/app/_lib/guarded-read";
import { requireActor } from "@/src/server/auth/session";
import { roleAllows } from "@/src/server/authz/permission-table";
import { listDays } from "@/src/server/days/service";
import { getSurvey } from "@/src/server/surveys/service";
import { LinkButton } from "@/src/ui/button";
import { EmptyState } from "@/src/ui/empty-state";
import { Refusal } from "@/src/ui/refusal";
import { StatusChip } from "@/src/ui/status-chip";
import { formatCount, localTime } from "./_components/day-format";

export const metadata: Metadata = { title: "Survey days" };

type Props = { params: Promise<{ surveyId: string }> };

export default async function DaysPage({ params }: Props) {
  const { surveyId } = await params;
  const actor = await requireActor(`/surveys/${surveyId}/days`);
  const survey = await guardedRead(getSurvey(actor, surveyId));
  if (!survey.ok) return <Refusal message={survey.message} />;
  const days = await guardedRead(listDays(actor, surveyId));
  if (!days.ok) return <Refusal message={days.message} />;
  const s = survey.value;
  const canUpload = roleAllows(s.myRole, "logs.upload") && !s.archivedAt;
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 className="text-lg font-semibold text-ink-900">Survey days</h2>
        {roleAllows(s.myRole, "processing.update") ? (
          <LinkButton href={`/surveys/${surveyId}/settings`} variant="secondary">Processing settings</LinkButton>
        ) : null}
      </div>
      {days.value.length === 0 ? (
        <EmptyState
          title="No survey days yet"
          action={canUpload ? <LinkButton href={`/surveys/${surveyId}/logs/upload`} variant="primary">Upload logs</LinkButton> : null}
        >
          A day appears here once its base or rover log is uploaded. Upload the base station log and the rover logs of a field day to start.
        </EmptyState>
      ) : (
        <div className="overflow-x-auto rounded-lg border border-ink-100 bg-white shadow-sm">
          <table className="w-full min-w-[40rem] text-sm">
            <caption className="sr-only">Survey days with their logs and correction runs; times in {s.timeZone}</caption>
            <thead className="bg-ink-50 text-left text-xs uppercase tracking-wide text-ink-600">
              <tr>
                <th scope="col" className="px-4 py-2">Day</th>
                <th scope="col" className="px-4 py-2">Base</th>
                <th scope="col" className="px-4 py-2">Rover</th>
                <th scope="col" className="px-4 py-2">Span ({s.timeZone})</th>
                <th scope="col" className="px-4 py-2">Last run</th>
              </tr>
            </thead>
            <tbody className="divide-y divide-ink-100">
              {days.value.map((d) => (
                <tr key={d.day} className="hover:bg-paper-100/60">
                  <td className="px-4 py-2.5">
                    <Link href={`/surveys/${surveyId}/days/${d.day}`} className="num font-semibold text-tide-800 underline-offset-2 hover:underline">
                      {d.day}
                    </Link>
                  </td>
                  <td className="num px-4 py-2.5 text-ink-800">
                    {d.baseLogs.length === 0 ? (
                      <StatusChip label="No base log" tone="warn" detail="Upload the day's base log, or use repeat readings at the base (looping)" />
                    ) : (
                      <>
                        {formatCount(d.baseReadingCount)} <span className="text-ink-500">readings, {d.baseLogs.length} {d.baseLogs.length === 1 ? "log" : "logs"}</span>
                      </>
                    )}
                  </td>
                  <td className="num px-4 py-2.5 text-ink-800">
                    {d.roverLogs.length === 0 ? (
                      <span className="text-ink-500">No rover log</span>
                    ) : (
                      <>
                        {formatCount(d.roverReadingCount)} <span className="text-ink-500">readings, {d.roverLogs.length} {d.roverLogs.length === 1 ? "log" : "logs"}</span>
                      </>
                    )}
                  </td>
                  <td className="num px-4 py-2.5 text-ink-700">
                    {localTime(d.firstTimeMs, s.timeZone)}–{localTime(d.lastTimeMs, s.timeZone)}
                  </td>
                  <td className="px-4 py-2.5">
                    {d.latestRun ? (
                      <StatusChip
                        label={`Run ${d.latestRun.number}: ${d.latestRun.status}`}
                        tone={d.latestRun.status === "done" ? "ok" : d.latestRun.status === "failed" ? "stop" : "info"}
                        detail={`${d.runCount} ${d.runCount === 1 ? "run" : "runs"}; last started ${d.latestRun.createdAt} (UTC)`}
                      />
                    ) : (
                      <span className="text-ink-500">Not corrected yet</span>
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </div>
  );
}
