import type { Metadata } from "next";
import { guardedRead } from "@/app/_lib/guarded-read";
import { requireActor } from "@/src/server/auth/session";
import { roleAllows } from "@/src/server/authz/permission-table";
import { SETTING_LABELS } from "@/src/server/processing/schema";
import { getProcessingSettings, listBaseSiteNames, listProcessingSettingChanges } from "@/src/server/processing/service";
import { getSurvey } from "@/src/server/surveys/service";
import { loadReferenceModel } from "@/src/lib/reference-model";
import { Refusal } from "@/src/ui/refusal";
import { SettingsForm } from "./_components/settings-form";

export const metadata: Metadata = { title: "Processing settings" };

type Props = { params: Promise<{ surveyId: string }> };

function show(v: unknown): string {
  if (v === null || v === undefined || v === "") return "—";
  if (typeof v === "boolean") return v ? "yes" : "no";
  return String(v);
}

function igrfLoaded(): boolean {
  try {
    loadReferenceModel("igrf");
    return true;
  } catch {
    return false;
  }
}

export default async function SettingsPage({ params }: Props) {
  const { surveyId } = await params;
  const actor = await requireActor(`/surveys/${surveyId}/settings`);
  const survey = await guardedRead(getSurvey(actor, surveyId));
  if (!survey.ok) return <Refusal message={survey.message} />;
  const record = await guardedRead(getProcessingSettings(actor, surveyId));
  if (!record.ok) return <Refusal message={record.message} />;
  const history = await listProcessingSettingChanges(actor, surveyId);
  const sites = await listBaseSiteNames(actor, surveyId);
  const readOnly = !roleAllows(survey.value.myRole, "processing.update") || Boolean(survey.value.archivedAt);
  return (
    <div className="grid gap-5 lg:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
      <section className="rounded-lg border border-ink-100 bg-white p-5 shadow-sm">
        <h2 className="mb-1 text-lg font-semibold text-ink-900">Processing settings</h2>
        <p className="mb-4 text-sm text-ink-600">
          How this survey's days are corrected. {readOnly ? "Your role can read them; a processor or the lead changes them." : "Every change is recorded."}
          {record.value.updatedAt ? ` Last change by ${record.value.updatedBy ?? "unknown"} at ${record.value.updatedAt.slice(0, 16).replace("T", " ")} UTC.` : " Defaults in use."}
        </p>
        <SettingsForm surveyId={surveyId} settings={record.value.settings} baseSites={sites} readOnly={readOnly} igrfAvailable={igrfLoaded()} />
      </section>
      <section className="rounded-lg border border-ink-100 bg-white p-5 shadow-sm">
        <h2 className="mb-3 text-lg font-semibold text-ink-900">Change history</h2>
        {history.length === 0 ? (
          <p className="text-sm text-ink-600">No changes yet.</p>
        ) : (
          <ol className="space-y-2 text-sm">
            {history.map((c) => (
              <li key={c.id} className="border-b border-ink-100 pb-2">
                <p className="font-medium text-ink-900">{SETTING_LABELS[c.setting] ?? c.setting}: <span className="num">{show(c.oldValue)} → {show(c.newValue)}</span></p>
                <p className="num text-xs text-ink-500">{c.changedBy ?? "unknown"} · {c.changedAt.slice(0, 16).replace("T", " ")} UTC · revision {c.revision}</p>
              </li>
            ))}
          </ol>
        )}
      </section>
    </div>
  );
}
