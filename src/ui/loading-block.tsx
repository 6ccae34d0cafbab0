/** Placeholder while a page's data loads: a few calm bars, announced once to screen readers. */
export function LoadingBlock({ label = "Loading…", rows = 4 }: { label?: string; rows?: number }) {
  return (
    <div role="status" aria-live="polite" className="space-y-3">
      <span className="sr-only">{label}</span>
      <div className="h-7 w-1/3 animate-pulse rounded bg-ink-100" />
      {Array.from({ length: rows }, (_, i) => (
        <div key={i} className="h-12 animate-pulse rounded bg-ink-50" style={{ opacity: 1 - i * 0.15 }} />
      ))}
    </div>
  );
}
