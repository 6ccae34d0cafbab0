import Link from "next/link";
import type { Survey } from "@/src/server/surveys/service";
import { utcOffsetLabel } from "@/src/ui/format";
import { ArchiveIcon } from "@/src/ui/icons";
import { RoleChip } from "@/src/ui/role-chip";
import { StatusChip } from "@/src/ui/status-chip";

/** Surveys as a table on wide screens and stacked rows on a phone (one markup, grid per row). */
export function SurveyList({ surveys }: { surveys: Survey[] }) {
  return (
    <div className="overflow-hidden rounded-lg border border-ink-100 bg-white shadow-sm">
      <div
        aria-hidden="true"
        className="hidden grid-cols-[7rem_minmax(0,2fr)_minmax(0,1.4fr)_minmax(0,1.3fr)_8rem] gap-4 border-b border-ink-100 bg-ink-50 px-4 py-2 text-xs font-semibold uppercase tracking-wide text-ink-500 md:grid"
      >
        <span>Code</span>
        <span>Name</span>
        <span>Client</span>
        <span>Time zone</span>
        <span>My role</span>
      </div>
      <ul className="divide-y divide-ink-100">
        {surveys.map((s) => (
          <li key={s.id} className="relative grid grid-cols-1 gap-1 px-4 py-3 hover:bg-paper-50 md:grid-cols-[7rem_minmax(0,2fr)_minmax(0,1.4fr)_minmax(0,1.3fr)_8rem] md:items-center md:gap-4">
            <span className="num text-sm font-semibold tracking-wide text-ink-700">{s.code}</span>
            <span className="flex min-w-0 flex-wrap items-center gap-2">
              <Link href={`/surveys/${s.id}`} className="font-medium text-ink-900 underline-offset-2 hover:underline after:absolute after:inset-0">
                {s.name}
              </Link>
              {s.archivedAt ? <StatusChip label="Archived" tone="neutral" icon={ArchiveIcon} /> : null}
            </span>
            <span className="truncate text-sm text-ink-700">
              <span className="text-ink-500 md:hidden">Client: </span>
              {s.client || <span className="text-ink-400">—</span>}
            </span>
            <span className="text-sm text-ink-700">
              <span className="text-ink-500 md:hidden">Time zone: </span>
              {s.timeZone} <span className="num text-xs text-ink-500">({utcOffsetLabel(s.timeZone)})</span>
            </span>
            <span className="relative z-10 md:justify-self-start">
              <span className="sr-only">My role: </span>
              <RoleChip role={s.myRole} />
            </span>
          </li>
        ))}
      </ul>
    </div>
  );
}
