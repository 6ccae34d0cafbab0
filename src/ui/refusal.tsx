/** A plain "you may not do this here" panel for members without the needed role. */
import { StopIcon } from "./icons";

export function Refusal({ title = "Not available for your role", message, children }: { title?: string; message?: string; children?: React.ReactNode }) {
  return (
    <section className="rounded-lg border border-storm-500/30 bg-storm-50 px-5 py-6 text-storm-700">
      <h2 className="flex items-center gap-2 text-base font-semibold">
        <StopIcon size={18} />
        {title}
      </h2>
      {message ? <p className="mt-1 text-sm">{message}</p> : null}
      {children ? <div className="mt-3 text-sm text-ink-700">{children}</div> : null}
    </section>
  );
}
