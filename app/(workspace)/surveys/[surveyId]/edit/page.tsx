import type { Metadata } from "next";
import { requireActor } from "@/src/server/auth/session";
import { roleAllows } from "@/src/server/authz/permission-table";
import { getSurvey } from "@/src/server/surveys/service";
import { guardedRead } from "@/app/_lib/guarded-read";
import { Refusal } from "@/src/ui/refusal";
import { SurveyForm } from "../../_components/survey-form";
import { timeZoneOptions } from "../../_components/time-zones";
import { setArchivedAction, updateSurveyAction } from "./actions";
import { ArchiveForm } from "./archive-form";

export const metadata: Metadata = { title: "Edit survey" };

export default async function EditSurveyPage({ params }: { params: Promise<{ surveyId: string }> }) {
  const { surveyId } = await params;
  const actor = await requireActor(`/surveys/${surveyId}/edit`);
  const survey = await guardedRead(getSurvey(actor, surveyId));
  if (!survey.ok) return <Refusal message={survey.message} />;
  const s = survey.value;
  if (!roleAllows(s.myRole, "survey.update")) {
    return <Refusal message="Only the survey lead or an org admin edits survey details." />;
  }
  const archived = Boolean(s.archivedAt);
  return (
    <div className="grid max-w-3xl gap-6">
      <section className="rounded-lg border border-ink-100 bg-white p-5 shadow-sm sm:p-6">
        <h2 className="mb-1 text-base font-semibold text-ink-900">Survey details</h2>
        <p className="mb-5 text-sm text-ink-600">
          {archived ? "This survey is archived: restore it below to edit its details." : "Changes apply to every member at once."}
        </p>
        <SurveyForm
          action={updateSurveyAction.bind(null, s.id)}
          initial={{ name: s.name, code: s.code, client: s.client, areaDescription: s.areaDescription, timeZone: s.timeZone, notes: s.notes }}
          timeZones={timeZoneOptions()}
          submitLabel="Save changes"
          disabled={archived}
        />
      </section>
      {roleAllows(s.myRole, "survey.archive") ? (
        <section className="rounded-lg border border-ink-100 bg-white p-5 shadow-sm sm:p-6">
          <h2 className="mb-1 text-base font-semibold text-ink-900">{archived ? "Restore" : "Archive"}</h2>
          <p className="mb-4 text-sm text-ink-600">
            {archived
              ? "Restoring makes the survey editable again and shows it in the survey list."
              : "Archive a survey when its field work and reporting are done. Its data stays; it becomes read-only and leaves the default survey list."}
          </p>
          <ArchiveForm archived={archived} action={setArchivedAction.bind(null, s.id)} />
        </section>
      ) : null}
    </div>
  );
}
