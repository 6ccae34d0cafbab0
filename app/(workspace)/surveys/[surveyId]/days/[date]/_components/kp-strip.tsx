/** Kp held for the day's hours: one cell per 3-hour interval, above the survey's limit marked with word + icon + colour. */
import type { KpValue } from "@/src/server/kp/service";
import { AlertIcon } from "@/src/ui/icons";
import { localTime } from "../../_components/day-format";

export function KpStrip({ values, limit, timeZone, qaHref }: { values: KpValue[]; limit: number; timeZone: string; qaHref: string }) {
  if (values.length === 0) {
    return (
      <p className="text-sm text-ink-600" data-testid="kp-strip">
        No Kp held for this day. <a className="text-tide-800 underline" href={qaHref}>Enter or upload Kp values</a> (the day is judged from its base record either way).
      </p>
    );
  }
  return (
    <section aria-labelledby="kp-heading" className="rounded-lg border border-ink-100 bg-white px-4 py-3 shadow-sm" data-testid="kp-strip">
      <h3 id="kp-heading" className="mb-2 text-sm font-semibold text-ink-900">
        Planetary Kp, 3-hour intervals <span className="font-normal text-ink-500">(limit {limit}; start times {timeZone})</span>
      </h3>
      <ol className="flex flex-wrap gap-1.5">
        {values.map((v) => {
          const over = v.kp > limit;
          return (
            <li
              key={v.intervalStart}
              className={`num flex min-w-[4.5rem] flex-col rounded-md border px-2 py-1 text-xs ${over ? "border-flare-500/60 bg-flare-50 text-flare-700" : "border-ink-100 bg-paper-50 text-ink-700"}`}
              title={`${v.intervalStart} UTC, entered by ${v.enteredBy ?? "unknown"} (${v.source})`}
            >
              <span>{localTime(v.intervalStartMs, timeZone)}</span>
              <span className="flex items-center gap-1 text-sm font-semibold">
                {over ? <AlertIcon size={12} /> : null}Kp {v.kp.toFixed(2).replace(/\.?0+$/, "")}
                {over ? <span className="sr-only"> above the limit</span> : null}
              </span>
            </li>
          );
        })}
      </ol>
    </section>
  );
}
