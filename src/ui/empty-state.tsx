/** An empty list that says what to do next. */
import type { ReactNode } from "react";

export function EmptyState({ title, children, action }: { title: string; children?: ReactNode; action?: ReactNode }) {
  return (
    <div className="rounded-lg border border-dashed border-ink-200 bg-white/60 px-6 py-10 text-center">
      <h2 className="text-base font-semibold text-ink-800">{title}</h2>
      {children ? <div className="mx-auto mt-1 max-w-md text-sm text-ink-600">{children}</div> : null}
      {action ? <div className="mt-4 flex justify-center">{action}</div> : null}
    </div>
  );
}
