"use client";
/**
 * The survey's logs: @tanstack/react-table with server-side sorting, filtering and paging —
 * every change rewrites the URL's query, and the page reads that page of rows from the server.
 */
import Link from "next/link";
import { usePathname, useRouter } from "next/navigation";
import { useMemo, useTransition } from "react";
import { flexRender, getCoreRowModel, useReactTable, type ColumnDef, type SortingState } from "@tanstack/react-table";
import type { LogListItem, LogListQuery, LogSortKey } from "@/src/server/logs/read-service";
import { formatCount, formatDateTime } from "@/src/ui/format";
import { StatusChip } from "@/src/ui/status-chip";

export interface LogsTableProps {
  items: LogListItem[];
  total: number;
  query: LogListQuery;
  facets: { days: string[]; operators: string[]; instruments: string[] };
  timeZone: string;
}

const SORTABLE: Partial<Record<string, LogSortKey>> = {
  originalName: "originalName",
  kind: "kind",
  instrument: "instrument",
  operator: "operator",
  firstTimeMs: "firstTime",
  readingCount: "readingCount",
  rejectedCount: "rejectedCount",
  uploadedAt: "uploadedAt",
};

function localTime(ms: number | null, timeZone: string): string {
  return ms === null ? "—" : formatDateTime(new Date(ms).toISOString(), timeZone);
}

export function LogsTable({ items, total, query, facets, timeZone }: LogsTableProps) {
  const router = useRouter();
  const pathname = usePathname();
  const [pending, startTransition] = useTransition();

  function go(patch: Partial<Record<keyof LogListQuery, string | number | undefined>>) {
    const next = new URLSearchParams();
    const merged = { ...query, page: 1, ...patch } as Record<string, unknown>;
    for (const [k, v] of Object.entries(merged)) if (v !== undefined && v !== "") next.set(k, String(v));
    startTransition(() => router.push(`${pathname}?${next.toString()}`));
  }

  const columns = useMemo<ColumnDef<LogListItem>[]>(
    () => [
      {
        id: "originalName",
        header: "File",
        cell: ({ row }) => (
          <Link href={row.original.url} className="break-all font-medium text-tide-700 underline-offset-2 hover:underline">
            {row.original.originalName}
          </Link>
        ),
      },
      { id: "kind", header: "Kind", cell: ({ row }) => (row.original.kind === "base" ? "Base" : "Rover") },
      { id: "instrument", header: "Instrument", cell: ({ row }) => row.original.instrument || "—" },
      { id: "operator", header: "Operator", cell: ({ row }) => row.original.operator || "—" },
      { id: "days", header: "Days", enableSorting: false, cell: ({ row }) => <span className="num">{row.original.days.join(", ") || "—"}</span> },
      {
        id: "firstTimeMs",
        header: `Start (${timeZone})`,
        cell: ({ row }) => (
          <span className="num" title={row.original.firstTimeMs === null ? undefined : `${new Date(row.original.firstTimeMs).toISOString()} UTC`}>
            {localTime(row.original.firstTimeMs, timeZone)}
          </span>
        ),
      },
      { id: "lastTimeMs", header: "End", enableSorting: false, cell: ({ row }) => <span className="num">{localTime(row.original.lastTimeMs, timeZone).slice(11) || "—"}</span> },
      { id: "readingCount", header: "Readings", cell: ({ row }) => <span className="num">{formatCount(row.original.readingCount)}</span> },
      {
        id: "rejectedCount",
        header: "Rejected",
        cell: ({ row }) =>
          row.original.rejectedCount + row.original.issueCount > 0 ? (
            <StatusChip
              tone="warn"
              label={formatCount(row.original.rejectedCount + row.original.issueCount)}
              detail={`${row.original.rejectedCount} rows refused, ${row.original.issueCount} with times backwards or repeated`}
            />
          ) : (
            <span className="num text-ink-500">0</span>
          ),
      },
      { id: "uploadedAt", header: "Uploaded", cell: ({ row }) => <span className="num">{formatDateTime(row.original.uploadedAt, timeZone)}</span> },
    ],
    [timeZone],
  );

  const sortColumn = Object.entries(SORTABLE).find(([, v]) => v === query.sort)?.[0] ?? "uploadedAt";
  const sorting: SortingState = [{ id: sortColumn, desc: query.dir === "desc" }];
  const pageCount = Math.max(1, Math.ceil(total / query.pageSize));

  const table = useReactTable({
    data: items,
    columns,
    getCoreRowModel: getCoreRowModel(),
    manualSorting: true,
    manualPagination: true,
    manualFiltering: true,
    pageCount,
    state: { sorting, pagination: { pageIndex: query.page - 1, pageSize: query.pageSize } },
    onSortingChange: (updater) => {
      const next = typeof updater === "function" ? updater(sorting) : updater;
      const first = next[0];
      if (!first) return go({ sort: "uploadedAt", dir: "desc" });
      const key = SORTABLE[first.id];
      if (key) go({ sort: key, dir: first.desc ? "desc" : "asc" });
    },
  });

  const select = "rounded-md border border-ink-200 bg-white px-2 py-1.5 text-sm";

  return (
    <div className={pending ? "opacity-70 transition-opacity" : ""} aria-busy={pending}>
      <form className="mb-3 flex flex-wrap items-end gap-3" role="search" aria-label="Filter logs" onSubmit={(e) => e.preventDefault()}>
        <Filter label="Kind" id="filter-kind" value={query.kind ?? ""} onChange={(v) => go({ kind: v })} className={select} options={[["", "All kinds"], ["base", "Base"], ["rover", "Rover"]]} />
        <Filter label="Day" id="filter-day" value={query.day ?? ""} onChange={(v) => go({ day: v })} className={select} options={[["", "All days"], ...facets.days.map((d) => [d, d] as [string, string])]} />
        <Filter label="Operator" id="filter-operator" value={query.operator ?? ""} onChange={(v) => go({ operator: v })} className={select} options={[["", "All operators"], ...facets.operators.map((d) => [d, d] as [string, string])]} />
        <Filter label="Instrument" id="filter-instrument" value={query.instrument ?? ""} onChange={(v) => go({ instrument: v })} className={select} options={[["", "All instruments"], ...facets.instruments.map((d) => [d, d] as [string, string])]} />
      </form>
      <div className="overflow-x-auto rounded-lg border border-ink-100 bg-white shadow-sm">
        <table className="min-w-full text-sm">
          <caption className="sr-only">Logs of the survey, {total} in all, sorted by {sortColumn} {query.dir === "desc" ? "descending" : "ascending"}</caption>
          <thead className="bg-paper-100 text-left text-xs text-ink-700">
            {table.getHeaderGroups().map((hg) => (
              <tr key={hg.id}>
                {hg.headers.map((h) => {
                  const sortable = h.column.getCanSort() && SORTABLE[h.column.id] !== undefined;
                  const dir = h.column.id === sortColumn ? (query.dir === "desc" ? "descending" : "ascending") : "none";
                  return (
                    <th key={h.id} scope="col" aria-sort={sortable ? dir : undefined} className="px-3 py-2 font-medium whitespace-nowrap">
                      {sortable ? (
                        <button type="button" onClick={h.column.getToggleSortingHandler()} className="inline-flex items-center gap-1 hover:text-ink-900">
                          {flexRender(h.column.columnDef.header, h.getContext())}
                          <span aria-hidden="true">{dir === "ascending" ? "▲" : dir === "descending" ? "▼" : "↕"}</span>
                        </button>
                      ) : (
                        flexRender(h.column.columnDef.header, h.getContext())
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.map((r) => (
              <tr key={r.id} className="border-t border-ink-100 align-top">
                {r.getVisibleCells().map((c) => (
                  <td key={c.id} className="px-3 py-2 text-ink-800">
                    {flexRender(c.column.columnDef.cell, c.getContext())}
                  </td>
                ))}
              </tr>
            ))}
            {items.length === 0 ? (
              <tr>
                <td colSpan={columns.length} className="px-3 py-6 text-center text-ink-600">No logs match these filters.</td>
              </tr>
            ) : null}
          </tbody>
        </table>
      </div>
      <nav aria-label="Pages" className="mt-3 flex flex-wrap items-center justify-between gap-2 text-sm text-ink-700">
        <span className="num">
          {total === 0 ? "0 logs" : `${(query.page - 1) * query.pageSize + 1}–${Math.min(total, query.page * query.pageSize)} of ${formatCount(total)} logs`}
        </span>
        <span className="flex items-center gap-2">
          <button type="button" className="rounded-md border border-ink-200 px-2.5 py-1 disabled:opacity-50" disabled={query.page <= 1} onClick={() => go({ page: query.page - 1 })}>
            Previous
          </button>
          <span className="num">Page {query.page} of {pageCount}</span>
          <button type="button" className="rounded-md border border-ink-200 px-2.5 py-1 disabled:opacity-50" disabled={query.page >= pageCount} onClick={() => go({ page: query.page + 1 })}>
            Next
          </button>
        </span>
      </nav>
    </div>
  );
}

function Filter({ label, id, value, onChange, options, className }: { label: string; id: string; value: string; onChange: (v: string) => void; options: [string, string][]; className: string }) {
  return (
    <div>
      <label htmlFor={id} className="mb-1 block text-xs font-medium text-ink-700">{label}</label>
      <select id={id} value={value} onChange={(e) => onChange(e.target.value)} className={className}>
        {options.map(([v, l]) => (
          <option key={v} value={v}>{l}</option>
        ))}
      </select>
    </div>
  );
}
