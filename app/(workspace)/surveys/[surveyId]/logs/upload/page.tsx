import type { Metadata } from "next";
import Link from "next/link";
import { guardedRead } from "@/app/_lib/guarded-read";
import { requireActor } from "@/src/server/auth/session";
import { roleAllows } from "@/src/server/authz/permission-table";
import { listImportProfiles } from "@/src/server/logs/profiles";
import { logsUrl } from "@/src/server/logs/urls";
import { getSurvey } from "@/src/server/surveys/service";
import { Refusal } from "@/src/ui/refusal";
import { UploadPanel } from "../_components/upload-panel";

export const metadata: Metadata = { title: "Upload logs" };

export default async function UploadLogsPage({ params }: { params: Promise<{ surveyId: string }> }) {
  const { surveyId } = await params;
  const actor = await requireActor(`/surveys/${surveyId}/logs/upload`);
  const survey = await guardedRead(getSurvey(actor, surveyId));
  if (!survey.ok) return <Refusal message={survey.message} />;
  const s = survey.value;
  if (!roleAllows(s.myRole, "logs.upload")) return <Refusal message="Field crews, processors and the survey lead upload logs. Your role may read them." />;
  if (s.archivedAt) return <Refusal title="Survey archived" message="This survey is archived: a lead restores it before logs can be added." />;
  const profiles = await listImportProfiles(actor, surveyId);
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 className="text-lg font-semibold text-ink-900">Upload base and rover logs</h2>
        <Link href={logsUrl(surveyId)} className="text-sm text-tide-700 underline underline-offset-2">Back to the logs table</Link>
      </div>
      <p className="max-w-3xl text-sm text-ink-600">
        Each file is stored exactly as sent, with its SHA-256. A file with bad rows is refused as a whole unless you choose to import its good
        rows; nothing is half-imported. The same file twice is refused.
      </p>
      <UploadPanel
        apiUrl={`/api/v1/surveys/${encodeURIComponent(surveyId)}/logs`}
        logsUrl={logsUrl(surveyId)}
        profiles={profiles.map((p) => ({ id: p.id, name: p.name, headerSignature: p.headerSignature, mapping: p.mapping }))}
        defaultOperator={actor.name}
        surveyTimeZone={s.timeZone}
      />
    </div>
  );
}
