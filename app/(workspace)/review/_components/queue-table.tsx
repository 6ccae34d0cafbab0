"use client";
/** The review queue: sortable, filterable by state, survey and verdict (TanStack Table 8, all rows in the browser). */
import Link from "next/link";
import { useMemo, useState } from "react";
import {
  createColumnHelper,
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getSortedRowModel,
  useReactTable,
  type ColumnFiltersState,
  type SortingState,
} from "@tanstack/react-table";
import { REVIEW_STATE_LABELS, REVIEW_STATES, VERDICT_LABELS, type ReviewState } from "@/src/server/review/states";
import { ReviewStateChip, VerdictChip } from "@/src/ui/review-chips";
import { formatNt } from "../../surveys/[surveyId]/days/_components/day-format";

export type QueueTableRow = {
  key: string;
  href: string;
  surveyCode: string;
  surveyName: string;
  day: string;
  state: ReviewState;
  verdict: "quiet" | "disturbed" | "storm" | null;
  reasons: string[];
  rangeNt: number | null;
  maxChangeNt: number | null;
  chordNt: number | null;
  noiseNt: number | null;
  longestGapS: number | null;
  spikes: number | null;
  kpMax: number | null;
  submittedBy: string | null;
  submittedAt: string | null;
};

const VERDICT_ORDER = { storm: 3, disturbed: 2, quiet: 1 } as const;
const col = createColumnHelper<QueueTableRow>();
const num = (digits: number, unit = "") => (v: number | null) => (v === null ? "—" : `${formatNt(v, digits)}${unit ? ` ${unit}` : ""}`);
const exact = (row: { getValue: (id: string) => unknown }, id: string, value: unknown) => value === "" || row.getValue(id) === value;

export function QueueTable({ rows }: { rows: QueueTableRow[] }) {
  const [sorting, setSorting] = useState<SortingState>([{ id: "day", desc: true }]);
  const [filters, setFilters] = useState<ColumnFiltersState>([{ id: "state", value: "awaiting_review" }]);
  const columns = useMemo(
    () => [
      col.accessor("surveyCode", { header: "Survey", filterFn: exact, cell: (c) => <span className="num font-medium" title={c.row.original.surveyName}>{c.getValue()}</span> }),
      col.accessor("day", { header: "Day", cell: (c) => <Link href={c.row.original.href} className="num font-semibold text-tide-800 underline underline-offset-2">{c.getValue()}</Link> }),
      col.accessor("state", { header: "State", filterFn: exact, sortingFn: (a, b) => REVIEW_STATES.indexOf(a.original.state) - REVIEW_STATES.indexOf(b.original.state), cell: (c) => <ReviewStateChip state={c.getValue()} /> }),
      col.accessor((r) => r.verdict ?? "none", {
        id: "verdict",
        header: "Suggested",
        filterFn: exact,
        sortingFn: (a, b) => (a.original.verdict ? VERDICT_ORDER[a.original.verdict] : 0) - (b.original.verdict ? VERDICT_ORDER[b.original.verdict] : 0),
        cell: (c) => <VerdictChip level={c.row.original.verdict} reasons={c.row.original.reasons} prefix="QA" />,
      }),
      col.accessor("rangeNt", { header: "Range", cell: (c) => num(1, "nT")(c.getValue()), sortUndefined: "last" }),
      col.accessor("maxChangeNt", { header: "Change / window", cell: (c) => num(1, "nT")(c.getValue()) }),
      col.accessor("chordNt", { header: "Chord", cell: (c) => num(2, "nT")(c.getValue()) }),
      col.accessor("noiseNt", { header: "d4 RMS", cell: (c) => num(2, "nT")(c.getValue()) }),
      col.accessor("longestGapS", { header: "Gap", cell: (c) => num(0, "s")(c.getValue()) }),
      col.accessor("spikes", { header: "Spikes", cell: (c) => num(0)(c.getValue()) }),
      col.accessor("kpMax", { header: "Kp max", cell: (c) => num(2)(c.getValue()) }),
      col.accessor("submittedBy", { header: "Submitted by", cell: (c) => c.getValue() ?? "—" }),
    ],
    [],
  );
  const table = useReactTable({
    data: rows,
    columns,
    state: { sorting, columnFilters: filters },
    onSortingChange: setSorting,
    onColumnFiltersChange: setFilters,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
  });
  const filterValue = (id: string) => (filters.find((f) => f.id === id)?.value as string | undefined) ?? "";
  const setFilter = (id: string, value: string) => setFilters((fs) => [...fs.filter((f) => f.id !== id), ...(value ? [{ id, value }] : [])]);
  const surveys = [...new Set(rows.map((r) => r.surveyCode))].sort();
  const shown = table.getRowModel().rows;
  const select = "rounded-md border border-ink-200 bg-white px-2 py-1.5 text-sm";
  return (
    <div className="space-y-3">
      <div className="flex flex-wrap items-end gap-3 text-sm">
        <label className="text-ink-700">State{" "}
          <select aria-label="Filter by state" className={select} value={filterValue("state")} onChange={(e) => setFilter("state", e.target.value)}>
            <option value="">All states</option>
            {REVIEW_STATES.map((s) => <option key={s} value={s}>{REVIEW_STATE_LABELS[s]}</option>)}
          </select>
        </label>
        <label className="text-ink-700">Survey{" "}
          <select aria-label="Filter by survey" className={select} value={filterValue("surveyCode")} onChange={(e) => setFilter("surveyCode", e.target.value)}>
            <option value="">All surveys</option>
            {surveys.map((s) => <option key={s} value={s}>{s}</option>)}
          </select>
        </label>
        <label className="text-ink-700">Verdict{" "}
          <select aria-label="Filter by suggested verdict" className={select} value={filterValue("verdict")} onChange={(e) => setFilter("verdict", e.target.value)}>
            <option value="">All verdicts</option>
            {(["storm", "disturbed", "quiet"] as const).map((v) => <option key={v} value={v}>{VERDICT_LABELS[v]}</option>)}
            <option value="none">Not assessed</option>
          </select>
        </label>
        <p className="ml-auto text-ink-600" role="status" aria-live="polite">{shown.length} of {rows.length} days</p>
      </div>
      <div className="overflow-x-auto rounded-lg border border-ink-100 bg-white shadow-sm">
        <table className="w-full min-w-[60rem] text-sm" data-testid="review-queue">
          <caption className="sr-only">Survey days to review; select a column header to sort</caption>
          <thead className="bg-ink-50 text-left text-xs uppercase tracking-wide text-ink-600">
            {table.getHeaderGroups().map((hg) => (
              <tr key={hg.id}>
                {hg.headers.map((h) => {
                  const dir = h.column.getIsSorted();
                  return (
                    <th key={h.id} scope="col" className="px-3 py-2" aria-sort={dir === "asc" ? "ascending" : dir === "desc" ? "descending" : "none"}>
                      <button type="button" className="inline-flex items-center gap-1 uppercase hover:text-ink-900" onClick={h.column.getToggleSortingHandler()}>
                        {flexRender(h.column.columnDef.header, h.getContext())}
                        <span aria-hidden="true">{dir === "asc" ? "▲" : dir === "desc" ? "▼" : ""}</span>
                      </button>
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {shown.length === 0 ? (
              <tr><td colSpan={columns.length} className="px-3 py-6 text-center text-ink-600">No day matches these filters: choose “All states” to see decided days.</td></tr>
            ) : (
              shown.map((r) => (
                <tr key={r.original.key} className="border-t border-ink-100" data-testid={`queue-${r.original.surveyCode}-${r.original.day}`}>
                  {r.getVisibleCells().map((c) => (
                    <td key={c.id} className="num whitespace-nowrap px-3 py-1.5">{flexRender(c.column.columnDef.cell, c.getContext())}</td>
                  ))}
                </tr>
              ))
            )}
          </tbody>
        </table>
      </div>
    </div>
  );
}
