/** The day's review: state, suggested verdict with reasons, submit or decide, and every step so far. */
import type { DayReview, ReviewEvent } from "@/src/server/review/service";
import { REVIEW_STATE_LABELS, type ReviewState } from "@/src/server/review/states";
import { formatDateTime } from "@/src/ui/format";
import { ReviewStateChip } from "@/src/ui/review-chips";
import { ReviewControls } from "./review-forms";

type Props = {
  surveyId: string;
  review: DayReview;
  history: ReviewEvent[];
  canSubmit: boolean;
  canDecide: boolean;
  lines: string[];
  timeZone: string;
};

function stepText(e: ReviewEvent): string {
  if (e.kind === "assessed") {
    const level = (e.details.level as string | null) ?? "not assessed";
    const prev = e.details.previousLevel as string | null;
    return `Suggested verdict ${level}${prev ? ` (was ${prev})` : ""}`;
  }
  const to = e.toState ? REVIEW_STATE_LABELS[e.toState as ReviewState] : "";
  const lines = Array.isArray(e.details.lines) && e.details.lines.length > 0 ? `: lines ${(e.details.lines as string[]).join(", ")}` : e.details.scope === "day" ? ": whole day" : "";
  return `${e.label}${to && e.kind !== "accepted" && e.kind !== "resurvey" ? ` → ${to}` : ""}${lines}`;
}

export function ReviewPanel({ surveyId, review, history, canSubmit, canDecide, lines, timeZone }: Props) {
  const s = review.state;
  return (
    <section className="rounded-lg border border-ink-100 bg-white p-4 text-sm shadow-sm" aria-labelledby="review-heading" data-testid="review-panel">
      <div className="mb-2 flex items-center justify-between gap-2">
        <h3 id="review-heading" className="text-base font-semibold text-ink-900">Review</h3>
        <ReviewStateChip state={s} />
      </div>
      {s === "resurvey_needed" ? (
        <div className="mb-3 rounded-md border border-storm-500/30 bg-storm-50 px-3 py-2 text-storm-700">
          <p className="font-medium">{review.scope === "lines" ? `Re-walk lines ${review.lines.join(", ")}` : "Walk the whole day again"}</p>
          {review.comment ? <p className="mt-1 whitespace-pre-line">{review.comment}</p> : null}
          <p className="mt-1 text-xs">by {review.decidedBy ?? "unknown"}</p>
        </div>
      ) : null}
      {s === "accepted" ? <p className="mb-3 text-moss-700">Accepted by {review.decidedBy ?? "unknown"}{review.comment ? `: ${review.comment}` : "."}</p> : null}
      {s === "awaiting_review" ? <p className="mb-3 text-ink-700">Submitted by {review.submittedBy ?? "unknown"}; a QA reviewer decides.</p> : null}
      {canSubmit || canDecide ? <ReviewControls surveyId={surveyId} day={review.day} state={s} canSubmit={canSubmit} canDecide={canDecide} lines={lines} /> : null}
      {!canSubmit && !canDecide ? <p className="text-ink-600">A processor submits the day; a QA reviewer decides it.</p> : null}
      <h4 className="mt-4 mb-1 text-sm font-semibold text-ink-900">History</h4>
      {history.length === 0 ? (
        <p className="text-ink-600">No steps yet.</p>
      ) : (
        <ol className="space-y-1.5" aria-label="Review history, oldest first" data-testid="review-history">
          {history.map((e) => (
            <li key={e.id} className="border-l-2 border-ink-100 pl-2">
              <p className="text-ink-900">{stepText(e)}</p>
              {e.comment ? <p className="whitespace-pre-line text-ink-700">“{e.comment}”</p> : null}
              <p className="num text-xs text-ink-500">{e.actorName ?? "Fieldtide"} · {formatDateTime(e.createdAt, timeZone)} <span title={`${e.createdAt} UTC`}>local</span></p>
            </li>
          ))}
        </ol>
      )}
    </section>
  );
}
