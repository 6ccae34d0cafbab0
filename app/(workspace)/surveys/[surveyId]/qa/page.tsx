import type { Metadata } from "next";
import { guardedRead } from "@/app/_lib/guarded-read";
import { requireActor } from "@/src/server/auth/session";
import { roleAllows } from "@/src/server/authz/permission-table";
import { listKp } from "@/src/server/kp/service";
import { QA_THRESHOLD_INFO } from "@/src/server/qa-assessment/thresholds";
import { getQaThresholds, listQaThresholdChanges } from "@/src/server/qa-assessment/thresholds-service";
import { getSurvey } from "@/src/server/surveys/service";
import { formatDateTime } from "@/src/ui/format";
import { AlertIcon } from "@/src/ui/icons";
import { Refusal } from "@/src/ui/refusal";
import { KpForm } from "./_components/kp-form";
import { ThresholdsForm } from "./_components/thresholds-form";

export const metadata: Metadata = { title: "QA thresholds and Kp" };

type Props = { params: Promise<{ surveyId: string }> };

export default async function QaPage({ params }: Props) {
  const { surveyId } = await params;
  const actor = await requireActor(`/surveys/${surveyId}/qa`);
  const survey = await guardedRead(getSurvey(actor, surveyId));
  if (!survey.ok) return <Refusal message={survey.message} />;
  const record = await guardedRead(getQaThresholds(actor, surveyId));
  if (!record.ok) return <Refusal message={record.message} />;
  const [history, kp] = await Promise.all([listQaThresholdChanges(actor, surveyId), listKp(actor, surveyId)]);
  const s = survey.value;
  const readOnly = !roleAllows(s.myRole, "qa.update") || Boolean(s.archivedAt);
  const canKp = roleAllows(s.myRole, "kp.update") && !s.archivedAt;
  const limit = record.value.thresholds.kpLimit;
  return (
    <div className="grid gap-5 lg:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
      <section className="rounded-lg border border-ink-100 bg-white p-5 shadow-sm" aria-labelledby="thr-heading">
        <h2 id="thr-heading" className="mb-1 text-lg font-semibold text-ink-900">QA thresholds</h2>
        <p className="mb-4 text-sm text-ink-600">
          Each day's base record is judged against these: above a disturbed limit the suggested verdict is disturbed, above a storm limit it is storm; a Kp above
          the limit makes the day disturbed at least. {readOnly ? "A processor or the lead changes them." : "Every change is recorded."}
          {record.value.updatedAt ? ` Last change by ${record.value.updatedBy ?? "unknown"} at ${formatDateTime(record.value.updatedAt)} UTC.` : " Defaults in use."}
        </p>
        <ThresholdsForm surveyId={surveyId} thresholds={record.value.thresholds} readOnly={readOnly} />
        <h3 className="mt-6 mb-2 text-base font-semibold text-ink-900">Change history</h3>
        {history.length === 0 ? (
          <p className="text-sm text-ink-600">No changes yet.</p>
        ) : (
          <ol className="space-y-2 text-sm">
            {history.map((c) => (
              <li key={c.id} className="border-b border-ink-100 pb-2">
                <p className="font-medium text-ink-900">{QA_THRESHOLD_INFO[c.setting]?.label ?? c.setting}: <span className="num">{c.oldValue ?? "—"} → {c.newValue ?? "—"}</span></p>
                <p className="num text-xs text-ink-500">revision {c.revision} · {c.changedBy ?? "unknown"} · {formatDateTime(c.changedAt)} UTC</p>
              </li>
            ))}
          </ol>
        )}
      </section>
      <section className="rounded-lg border border-ink-100 bg-white p-5 shadow-sm" aria-labelledby="kp-heading">
        <h2 id="kp-heading" className="mb-1 text-lg font-semibold text-ink-900">Geomagnetic activity (Kp)</h2>
        <p className="mb-4 text-sm text-ink-600">3-hourly planetary Kp from your space-weather service. Days are judged from their own base record too.</p>
        {canKp ? <KpForm surveyId={surveyId} /> : <p className="text-sm text-ink-600">A reviewer, processor or the lead enters Kp values.</p>}
        <h3 className="mt-6 mb-2 text-base font-semibold text-ink-900">Held values ({kp.length})</h3>
        {kp.length === 0 ? (
          <p className="text-sm text-ink-600">None yet.</p>
        ) : (
          <table className="w-full text-sm">
            <caption className="sr-only">Kp values held for this survey, interval start in UTC</caption>
            <thead className="text-left text-xs text-ink-600"><tr><th scope="col" className="py-1">Start (UTC)</th><th scope="col">Kp</th><th scope="col">Entered</th></tr></thead>
            <tbody>
              {kp.slice(-200).reverse().map((v) => (
                <tr key={v.intervalStart} className="border-t border-ink-100">
                  <td className="num py-1">{v.intervalStart.slice(0, 16).replace("T", " ")}</td>
                  <td className={`num font-medium ${v.kp > limit ? "text-flare-700" : "text-ink-900"}`}>
                    {v.kp > limit ? <AlertIcon size={12} className="mr-1 inline" /> : null}{v.kp.toFixed(2)}{v.kp > limit ? <span className="sr-only"> (above the limit {limit})</span> : null}
                  </td>
                  <td className="text-xs text-ink-500">{v.enteredBy ?? "unknown"} ({v.source})</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
    </div>
  );
}
