/** Review states of a survey day, in our own plain words (no `server-only`: pages show them). */
export const REVIEW_STATES = ["in_processing", "awaiting_review", "accepted", "resurvey_needed"] as const;
export type ReviewState = (typeof REVIEW_STATES)[number];

export const REVIEW_STATE_LABELS: Record<ReviewState, string> = {
  in_processing: "In processing",
  awaiting_review: "Awaiting review",
  accepted: "Accepted",
  resurvey_needed: "Re-survey needed",
};

/** Chip tone of each state (word + icon + colour on screen). */
export const REVIEW_STATE_TONE: Record<ReviewState, "neutral" | "info" | "ok" | "stop"> = {
  in_processing: "neutral",
  awaiting_review: "info",
  accepted: "ok",
  resurvey_needed: "stop",
};

export const VERDICT_LABELS = { quiet: "Quiet", disturbed: "Disturbed", storm: "Storm" } as const;
export const VERDICT_TONE = { quiet: "ok", disturbed: "warn", storm: "stop" } as const;

export type ReviewEventKind = "submitted" | "accepted" | "resurvey" | "assessed";
export const REVIEW_EVENT_LABELS: Record<ReviewEventKind, string> = {
  submitted: "Submitted for review",
  accepted: "Accepted",
  resurvey: "Sent back: re-survey needed",
  assessed: "Automatic assessment",
};

export function isReviewState(v: unknown): v is ReviewState {
  return typeof v === "string" && (REVIEW_STATES as readonly string[]).includes(v);
}
