/** A page's title block: optional eyebrow (e.g. survey code), heading, description and actions. */
import type { ReactNode } from "react";

export function PageHeader({
  eyebrow,
  title,
  description,
  actions,
  children,
}: {
  eyebrow?: ReactNode;
  title: ReactNode;
  description?: ReactNode;
  actions?: ReactNode;
  children?: ReactNode;
}) {
  return (
    <header className="mb-6 flex flex-col gap-3 border-b border-ink-100 pb-5 sm:flex-row sm:items-end sm:justify-between">
      <div className="min-w-0">
        {eyebrow ? <div className="mb-1 text-sm font-medium text-ink-500">{eyebrow}</div> : null}
        <h1 className="text-2xl font-semibold tracking-tight text-ink-900 break-words">{title}</h1>
        {description ? <div className="mt-1 text-sm text-ink-600">{description}</div> : null}
        {children}
      </div>
      {actions ? <div className="flex shrink-0 flex-wrap gap-2">{actions}</div> : null}
    </header>
  );
}
