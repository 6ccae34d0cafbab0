import type { Metadata } from "next";
import { requireActor } from "@/src/server/auth/session";
import { listReviewQueue } from "@/src/server/review/service";
import { EmptyState } from "@/src/ui/empty-state";
import { PageHeader } from "@/src/ui/page-header";
import { QueueTable, type QueueTableRow } from "./_components/queue-table";

export const metadata: Metadata = { title: "Review queue" };

/** Days of every survey where the signed-in user is a QA reviewer, with their metrics and suggested verdicts. */
export default async function ReviewQueuePage() {
  const actor = await requireActor("/review");
  const queue = await listReviewQueue(actor);
  const rows: QueueTableRow[] = queue.map((q) => ({
    key: `${q.surveyId}/${q.day}`,
    href: `/surveys/${q.surveyId}/days/${q.day}`,
    surveyCode: q.surveyCode,
    surveyName: q.surveyName,
    day: q.day,
    state: q.state,
    verdict: q.assessment.level,
    reasons: q.assessment.reasons.map((r) => r.text),
    rangeNt: q.assessment.metrics?.rangeNt ?? null,
    maxChangeNt: q.assessment.metrics?.maxChangeNt ?? null,
    chordNt: q.assessment.metrics?.maxChordDeviationNt ?? null,
    noiseNt: q.assessment.metrics?.noiseRmsNt ?? null,
    longestGapS: q.assessment.metrics?.longestGapS ?? null,
    spikes: q.assessment.metrics?.spikeCount ?? null,
    kpMax: q.assessment.kpMax,
    submittedBy: q.submittedBy,
    submittedAt: q.submittedAt,
  }));
  return (
    <>
      <PageHeader
        title="Review queue"
        description="Survey days of the surveys you review, with their QA metrics and the suggested verdict against each survey's thresholds. Open a day to accept it or send it back."
      />
      {rows.length === 0 ? (
        <EmptyState title="Nothing to review">You are a QA reviewer on no survey with days yet. Days appear here once their logs are uploaded; a processor submits them for review.</EmptyState>
      ) : (
        <QueueTable rows={rows} />
      )}
    </>
  );
}
