/** A titled chart card with a loading state, an empty state and a screen-reader summary. */
import type { ReactNode } from "react";

export function ChartFrame({
  title,
  summary,
  loading,
  empty,
  controls,
  legend,
  children,
  testId,
}: {
  title: string;
  summary?: string;
  loading?: boolean;
  empty?: ReactNode;
  controls?: ReactNode;
  legend?: ReactNode;
  children?: ReactNode;
  testId?: string;
}) {
  return (
    <section className="rounded-lg border border-ink-100 bg-white p-4 shadow-sm print:break-inside-avoid print:shadow-none" aria-label={title} data-testid={testId}>
      <div className="mb-2 flex flex-wrap items-center justify-between gap-2">
        <h3 className="text-base font-semibold text-ink-900">{title}</h3>
        {controls ? <div className="no-print flex flex-wrap items-center gap-2">{controls}</div> : null}
      </div>
      {loading ? (
        <div role="status" aria-live="polite" className="flex h-64 items-center justify-center rounded bg-ink-50 text-sm text-ink-500">
          <span className="mr-2 inline-block h-3 w-3 animate-spin rounded-full border-2 border-ink-400 border-r-transparent" aria-hidden="true" />
          Loading {title.toLowerCase()}…
        </div>
      ) : empty ? (
        <div className="flex min-h-32 items-center justify-center rounded border border-dashed border-ink-200 px-4 py-6 text-center text-sm text-ink-600">{empty}</div>
      ) : (
        <>
          {children}
          {legend ? <div className="mt-2 text-xs text-ink-600">{legend}</div> : null}
          {summary ? <p className="sr-only">{summary}</p> : null}
        </>
      )}
    </section>
  );
}
