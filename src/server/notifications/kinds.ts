/** Kinds of e-mail a user can turn off (no `server-only`: the profile page lists them). */
export const NOTIFICATION_KINDS = ["review.awaiting", "review.accepted", "review.resurvey"] as const;
export type NotificationKind = (typeof NOTIFICATION_KINDS)[number];

export const NOTIFICATION_LABELS: Record<NotificationKind, { label: string; who: string }> = {
  "review.awaiting": { label: "A day awaits review", who: "sent to the QA reviewers of the survey" },
  "review.accepted": { label: "A day was accepted", who: "sent to the crew and processor of the day" },
  "review.resurvey": { label: "A day was sent back for re-survey (with the comment and the lines)", who: "sent to the crew and processor of the day" },
};

export function isNotificationKind(v: unknown): v is NotificationKind {
  return typeof v === "string" && (NOTIFICATION_KINDS as readonly string[]).includes(v);
}
