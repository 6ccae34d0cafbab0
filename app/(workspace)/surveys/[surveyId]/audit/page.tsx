import type { Metadata } from "next";
import { guardedRead } from "@/app/_lib/guarded-read";
import { requireActor } from "@/src/server/auth/session";
import { auditActionLabel } from "@/src/server/audit/labels";
import { listAuditEvents } from "@/src/server/audit/read";
import { getSurvey } from "@/src/server/surveys/service";
import { EmptyState } from "@/src/ui/empty-state";
import { formatDateTime } from "@/src/ui/format";
import { Refusal } from "@/src/ui/refusal";

export const metadata: Metadata = { title: "Audit trail" };

type Props = { params: Promise<{ surveyId: string }>; searchParams: Promise<{ action?: string }> };

const FILTERS = [
  { value: "", label: "Everything" },
  { value: "day.", label: "Review steps" },
  { value: "qa.", label: "QA thresholds" },
  { value: "kp.", label: "Kp values" },
  { value: "run.", label: "Runs and exports" },
  { value: "processing.", label: "Processing settings" },
  { value: "log.", label: "Logs" },
  { value: "member.", label: "Members" },
];

/** Plain "key: value" pairs of an event's details (values JSON-encoded when not text or number). */
function detailText(details: Record<string, unknown>): string {
  return Object.entries(details)
    .map(([k, v]) => `${k}: ${typeof v === "string" || typeof v === "number" ? v : JSON.stringify(v)}`)
    .join(" · ");
}

export default async function AuditPage({ params, searchParams }: Props) {
  const { surveyId } = await params;
  const { action = "" } = await searchParams;
  const actor = await requireActor(`/surveys/${surveyId}/audit`);
  const survey = await guardedRead(getSurvey(actor, surveyId));
  if (!survey.ok) return <Refusal message={survey.message} />;
  const filter = FILTERS.some((f) => f.value === action) ? action : "";
  const events = await guardedRead(listAuditEvents(actor, surveyId, { action: filter || undefined }));
  if (!events.ok) return <Refusal message="The audit trail is read by the survey lead and the org admin." />;
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h2 className="text-lg font-semibold text-ink-900">Audit trail</h2>
          <p className="text-sm text-ink-600">Who did what, and when (UTC): review steps, threshold and Kp changes, settings, runs, exports, logs and members. Newest first, at most 500.</p>
        </div>
        <form className="flex items-end gap-2" method="get">
          <label className="text-sm text-ink-700">
            Show{" "}
            <select name="action" defaultValue={filter} className="rounded-md border border-ink-200 bg-white px-2 py-1.5">
              {FILTERS.map((f) => <option key={f.value} value={f.value}>{f.label}</option>)}
            </select>
          </label>
          <button type="submit" className="rounded-md border border-ink-200 bg-white px-3 py-1.5 text-sm">Filter</button>
        </form>
      </div>
      {events.value.length === 0 ? (
        <EmptyState title="Nothing recorded yet">{filter ? "No events of this kind: choose Everything." : "Changes to this survey appear here."}</EmptyState>
      ) : (
        <div className="overflow-x-auto rounded-lg border border-ink-100 bg-white shadow-sm">
          <table className="w-full min-w-[40rem] text-sm" data-testid="audit-table">
            <caption className="sr-only">Audit trail of the survey, newest first, times in UTC</caption>
            <thead className="bg-ink-50 text-left text-xs uppercase tracking-wide text-ink-600">
              <tr>
                <th scope="col" className="px-3 py-2">When (UTC)</th>
                <th scope="col" className="px-3 py-2">Who</th>
                <th scope="col" className="px-3 py-2">What</th>
                <th scope="col" className="px-3 py-2">Details</th>
              </tr>
            </thead>
            <tbody>
              {events.value.map((e) => (
                <tr key={e.id} className="border-t border-ink-100 align-top">
                  <td className="num whitespace-nowrap px-3 py-1.5">{formatDateTime(e.createdAt)}</td>
                  <td className="px-3 py-1.5" title={e.actorEmail ?? undefined}>{e.actorName ?? "—"}</td>
                  <td className="px-3 py-1.5 font-medium text-ink-900">{auditActionLabel(e.action)}</td>
                  <td className="break-all px-3 py-1.5 text-xs text-ink-600">{detailText(e.details)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </div>
  );
}
