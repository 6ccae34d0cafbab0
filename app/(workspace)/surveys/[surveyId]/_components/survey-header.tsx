import Link from "next/link";
import { roleAllows } from "@/src/server/authz/permission-table";
import type { Survey } from "@/src/server/surveys/service";
import { formatDate, utcOffsetLabel } from "@/src/ui/format";
import { ArchiveIcon } from "@/src/ui/icons";
import { RoleChip } from "@/src/ui/role-chip";
import { StatusChip } from "@/src/ui/status-chip";
import { SurveyTabs, type SurveyTab } from "./survey-tabs";

/** Header strip of every survey page: code, name, client, time zone, state, my role, sections. */
export function SurveyHeader({ survey }: { survey: Survey }) {
  const base = `/surveys/${survey.id}`;
  const can = (permission: Parameters<typeof roleAllows>[1]) => roleAllows(survey.myRole, permission);
  const tabs: SurveyTab[] = [
    { href: base, label: "Overview", exact: true },
    ...(can("days.read") ? [{ href: `${base}/days`, label: "Days" }] : []),
    ...(can("days.read") ? [{ href: `${base}/calendar`, label: "Calendar" }] : []),
    ...(can("days.read") ? [{ href: `${base}/qa`, label: "QA" }] : []),
    ...(can("logs.read") ? [{ href: `${base}/logs`, label: "Logs" }] : []),
    ...(can("members.read") ? [{ href: `${base}/members`, label: "Members" }] : []),
    { href: `${base}/settings`, label: "Settings" },
    ...(can("survey.update") ? [{ href: `${base}/edit`, label: "Edit" }] : []),
    ...(can("audit.read") ? [{ href: `${base}/audit`, label: "Audit" }] : []),
  ];
  return (
    <header className="mb-6 border-b border-ink-100">
      <div className="mb-1 text-sm">
        <Link href="/surveys" className="text-ink-500 hover:text-ink-800 hover:underline">
          Surveys
        </Link>
        <span className="mx-1.5 text-ink-300" aria-hidden="true">/</span>
        <span className="num font-semibold tracking-wide text-ink-700">{survey.code}</span>
      </div>
      <div className="flex flex-wrap items-center gap-x-3 gap-y-1">
        <h1 className="text-2xl font-semibold tracking-tight text-ink-900 break-words">{survey.name}</h1>
        {survey.archivedAt ? (
          <StatusChip label="Archived" tone="neutral" icon={ArchiveIcon} detail={`Archived on ${formatDate(survey.archivedAt)} (UTC); read-only until restored`} />
        ) : null}
      </div>
      <dl className="mt-2 mb-4 flex flex-wrap gap-x-6 gap-y-1 text-sm">
        <div className="flex gap-1.5">
          <dt className="text-ink-500">Client</dt>
          <dd className="text-ink-800">{survey.client || "—"}</dd>
        </div>
        <div className="flex gap-1.5">
          <dt className="text-ink-500">Time zone</dt>
          <dd className="text-ink-800">
            {survey.timeZone} <span className="num text-ink-500">({utcOffsetLabel(survey.timeZone)} now)</span>
          </dd>
        </div>
        <div className="flex items-center gap-1.5">
          <dt className="text-ink-500">Your role</dt>
          <dd>
            <RoleChip role={survey.myRole} />
          </dd>
        </div>
      </dl>
      <SurveyTabs tabs={tabs} />
    </header>
  );
}
