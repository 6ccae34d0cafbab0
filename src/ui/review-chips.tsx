/** Review state and suggested verdict as chips (word + icon + colour; reasons on hover and for screen readers). */
import { REVIEW_STATE_LABELS, REVIEW_STATE_TONE, VERDICT_LABELS, VERDICT_TONE, type ReviewState } from "@/src/server/review/states";
import { ClockIcon, FlagIcon } from "./icons";
import { StatusChip } from "./status-chip";

export function ReviewStateChip({ state, detail }: { state: ReviewState; detail?: string }) {
  const icon = state === "awaiting_review" ? ClockIcon : state === "in_processing" ? FlagIcon : undefined;
  return <StatusChip label={REVIEW_STATE_LABELS[state]} tone={REVIEW_STATE_TONE[state]} icon={icon} detail={detail} />;
}

export function VerdictChip({ level, reasons, prefix = "Suggested" }: { level: "quiet" | "disturbed" | "storm" | null; reasons: string[]; prefix?: string }) {
  if (!level) return <StatusChip label={`${prefix}: not assessed`} tone="neutral" detail="No base record (and no Kp) to judge" />;
  return (
    <StatusChip
      label={`${prefix}: ${VERDICT_LABELS[level].toLowerCase()}`}
      tone={VERDICT_TONE[level]}
      detail={reasons.length ? reasons.join("; ") : "All QA metrics within the survey's thresholds"}
    />
  );
}
