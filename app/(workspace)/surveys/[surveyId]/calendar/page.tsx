import type { Metadata } from "next";
import Link from "next/link";
import { guardedRead } from "@/app/_lib/guarded-read";
import { requireActor } from "@/src/server/auth/session";
import type { WorstMetric } from "@/src/server/qa-assessment/assess";
import { listSurveyDayReviews } from "@/src/server/review/service";
import { getSurvey } from "@/src/server/surveys/service";
import { EmptyState } from "@/src/ui/empty-state";
import { Refusal } from "@/src/ui/refusal";
import { ReviewStateChip, VerdictChip } from "@/src/ui/review-chips";
import { formatNt } from "../days/_components/day-format";

export const metadata: Metadata = { title: "Survey calendar" };

type Props = { params: Promise<{ surveyId: string }> };

const WEEKDAYS = ["Mon", "Tue", "Wed", "Thu", "Fri", "Sat", "Sun"];
const UNITS: Record<string, string> = { dailyRangeNt: "nT", changeNt: "nT", chordDeviationNt: "nT", noiseRmsNt: "nT", longestGapS: "s", spikeCount: "", kp: "" };

function worstText(w: WorstMetric | null): string {
  if (!w) return "no metrics";
  const u = UNITS[w.metric] ? ` ${UNITS[w.metric]}` : "";
  const digits = w.metric === "spikeCount" || w.metric === "longestGapS" ? 0 : w.metric === "kp" ? 2 : 1;
  return `${w.label} ${formatNt(w.value, digits)}${u} (limit ${w.limit}${u})`;
}

/** Month grids (Monday first) of the months that hold survey days. */
function monthsOf(days: string[]): { month: string; cells: (string | null)[] }[] {
  const months = [...new Set(days.map((d) => d.slice(0, 7)))].sort();
  return months.map((month) => {
    const [y, m] = month.split("-").map(Number);
    const first = new Date(Date.UTC(y, m - 1, 1));
    const count = new Date(Date.UTC(y, m, 0)).getUTCDate();
    const lead = (first.getUTCDay() + 6) % 7;
    const cells: (string | null)[] = Array.from({ length: lead }, () => null);
    for (let d = 1; d <= count; d++) cells.push(`${month}-${String(d).padStart(2, "0")}`);
    return { month, cells };
  });
}

export default async function CalendarPage({ params }: Props) {
  const { surveyId } = await params;
  const actor = await requireActor(`/surveys/${surveyId}/calendar`);
  const survey = await guardedRead(getSurvey(actor, surveyId));
  if (!survey.ok) return <Refusal message={survey.message} />;
  const rows = await guardedRead(listSurveyDayReviews(actor, surveyId));
  if (!rows.ok) return <Refusal message={rows.message} />;
  const byDay = new Map(rows.value.map((r) => [r.summary.day, r.review]));
  const months = monthsOf([...byDay.keys()]);
  const monthName = new Intl.DateTimeFormat("en-GB", { month: "long", year: "numeric", timeZone: "UTC" });
  return (
    <div className="space-y-6">
      <div>
        <h2 className="text-lg font-semibold text-ink-900">Calendar</h2>
        <p className="text-sm text-ink-600">Each survey day with its review state, suggested verdict and its worst metric against the survey's thresholds. Dates are local to {survey.value.timeZone}.</p>
      </div>
      {months.length === 0 ? (
        <EmptyState title="No survey days yet">A day appears once its base or rover log is uploaded.</EmptyState>
      ) : null}
      {months.map(({ month, cells }) => (
        <section key={month} aria-labelledby={`m-${month}`}>
          <h3 id={`m-${month}`} className="mb-2 text-base font-semibold text-ink-900">{monthName.format(new Date(`${month}-01T00:00:00Z`))}</h3>
          <ol className="grid grid-cols-1 gap-2 sm:grid-cols-7" aria-label={`Days of ${month}`}>
            {WEEKDAYS.map((w) => (
              <li key={w} aria-hidden="true" className="hidden text-center text-xs font-medium text-ink-500 sm:block">{w}</li>
            ))}
            {cells.map((day, i) => {
              const review = day ? byDay.get(day) : undefined;
              if (!day || !review) {
                return (
                  <li key={day ?? `pad-${i}`} className={`hidden min-h-16 rounded-md border border-dashed border-ink-100 p-1.5 text-xs text-ink-400 sm:block ${day ? "" : "invisible"}`}>
                    {day ? Number(day.slice(8)) : ""}
                  </li>
                );
              }
              const a = review.assessment;
              return (
                <li key={day} className="min-h-16 rounded-md border border-ink-200 bg-white p-1.5 text-xs shadow-sm" data-testid={`calendar-${day}`}>
                  <Link href={`/surveys/${surveyId}/days/${day}`} className="num font-semibold text-tide-800 underline-offset-2 hover:underline">
                    <span className="sm:hidden">{day}</span><span className="hidden sm:inline">{Number(day.slice(8))}</span>
                  </Link>
                  <div className="mt-1 flex flex-col items-start gap-1">
                    <ReviewStateChip state={review.state} />
                    <VerdictChip level={a.level} reasons={a.reasons.map((r) => r.text)} prefix="QA" />
                    <span className="num text-ink-600" title="Worst metric: the largest value relative to its disturbed limit">{worstText(a.worst)}</span>
                  </div>
                </li>
              );
            })}
          </ol>
        </section>
      ))}
    </div>
  );
}
