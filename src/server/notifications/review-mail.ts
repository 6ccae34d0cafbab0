import "server-only";
/**
 * Review mail: reviewers hear when a day awaits review; the crew and processor of a day hear when
 * it is accepted or sent back (with the comment and the lines to re-walk). Sent after the state
 * change is saved; a mail server failure is logged and reported back, never undoes the decision.
 */
import { getDb } from "../db/client";
import { getEnv } from "../env";
import { sendMail } from "../mail/mailer";
import type { NotificationKind } from "./kinds";
import { usersWanting } from "./preferences";

export interface ReviewMailContext {
  surveyId: string;
  surveyCode: string;
  surveyName: string;
  day: string;
  actorName: string;
  actorUserId: string;
}

export interface MailOutcome {
  sentTo: string[];
  failedTo: string[];
}

export function dayLink(surveyId: string, day: string): string {
  return `${getEnv().appUrl}/surveys/${encodeURIComponent(surveyId)}/days/${day}`;
}

async function deliver(userIds: string[], kind: NotificationKind, subject: string, text: string): Promise<MailOutcome> {
  const wanting = await usersWanting(userIds, kind);
  const users = wanting.length ? ((await getDb()("users").whereIn("id", wanting).select("email")) as { email: string }[]) : [];
  const outcome: MailOutcome = { sentTo: [], failedTo: [] };
  for (const u of users) {
    try {
      await sendMail({ to: u.email, subject, text });
      outcome.sentTo.push(u.email);
    } catch {
      outcome.failedTo.push(u.email);
    }
  }
  return outcome;
}

export async function mailAwaitingReview(ctx: ReviewMailContext, reviewerIds: string[], note: { verdict: string; reasons: string[]; comment: string }): Promise<MailOutcome> {
  const subject = `[${ctx.surveyCode}] Day ${ctx.day} awaits review`;
  const text = [
    `${ctx.actorName} submitted ${ctx.day} of ${ctx.surveyCode} “${ctx.surveyName}” for QA review.`,
    "",
    `Suggested verdict: ${note.verdict}`,
    ...note.reasons.map((r) => `  - ${r}`),
    ...(note.comment ? ["", `Note from ${ctx.actorName}:`, note.comment] : []),
    "",
    `Open the day to accept it or send it back:`,
    dayLink(ctx.surveyId, ctx.day),
    "",
    "You get this mail as a QA reviewer of the survey; turn it off on your profile page.",
  ].join("\n");
  return deliver(reviewerIds.filter((id) => id !== ctx.actorUserId), "review.awaiting", subject, text);
}

export async function mailDecision(
  ctx: ReviewMailContext,
  recipientIds: string[],
  decision: { kind: "accepted" | "resurvey"; comment: string; scope: "day" | "lines" | null; lines: string[] },
): Promise<MailOutcome> {
  const accepted = decision.kind === "accepted";
  const subject = accepted ? `[${ctx.surveyCode}] Day ${ctx.day} accepted` : `[${ctx.surveyCode}] Day ${ctx.day}: re-survey needed`;
  const what = accepted
    ? "accepted the day."
    : decision.scope === "lines"
      ? `sent the day back: re-walk line${decision.lines.length === 1 ? "" : "s"} ${decision.lines.join(", ")}.`
      : "sent the day back: the whole day must be walked again.";
  const text = [
    `${ctx.actorName} (QA reviewer) ${what}`,
    `Survey: ${ctx.surveyCode} “${ctx.surveyName}”, day ${ctx.day}.`,
    ...(decision.scope === "lines" && !accepted ? ["", "Lines to re-walk:", ...decision.lines.map((l) => `  - ${l}`)] : []),
    ...(decision.comment ? ["", "Comment:", decision.comment] : []),
    "",
    dayLink(ctx.surveyId, ctx.day),
    "",
    "You get this mail as crew or processor of the day; turn it off on your profile page.",
  ].join("\n");
  return deliver(recipientIds.filter((id) => id !== ctx.actorUserId), accepted ? "review.accepted" : "review.resurvey", subject, text);
}
