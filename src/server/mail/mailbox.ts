import "server-only";
/** Reading the captured mailbox of the fake SMTP server: org admins only. */
import type { Actor } from "../auth/actor";
import { assertAdmin } from "../authz/permissions";
import { getDb } from "../db/client";
import { NotFoundError } from "../errors";

export type CapturedMailSummary = { id: number; from: string; to: string; subject: string; receivedAt: string };
export type CapturedMail = CapturedMailSummary & {
  messageId: string | null;
  envelopeFrom: string;
  envelopeTo: string[];
  text: string | null;
  /** As received. Do not render as HTML; show it escaped or show `text`. */
  html: string | null;
  raw: string;
};

type Row = {
  id: number;
  message_id: string | null;
  envelope_from: string;
  envelope_to: string;
  from_header: string;
  to_header: string;
  subject: string;
  text_body: string | null;
  html_body: string | null;
  raw: string;
  received_at: string;
};

function summary(r: Pick<Row, "id" | "from_header" | "to_header" | "subject" | "received_at">): CapturedMailSummary {
  return { id: r.id, from: r.from_header, to: r.to_header, subject: r.subject, receivedAt: r.received_at };
}

/** Newest first; at most `limit` (default 200). */
export async function listCapturedMail(actor: Actor, opts: { limit?: number } = {}): Promise<CapturedMailSummary[]> {
  assertAdmin(actor);
  const rows = await getDb()<Row>("captured_mail")
    .select("id", "from_header", "to_header", "subject", "received_at")
    .orderBy("id", "desc")
    .limit(Math.min(Math.max(opts.limit ?? 200, 1), 1000));
  return rows.map(summary);
}

export async function getCapturedMail(actor: Actor, id: string | number): Promise<CapturedMail> {
  assertAdmin(actor);
  const n = typeof id === "number" ? id : /^\d{1,15}$/.test(id) ? Number(id) : NaN;
  const row = Number.isSafeInteger(n) ? await getDb()<Row>("captured_mail").where({ id: n }).first() : undefined;
  if (!row) throw new NotFoundError("Message not found.");
  let envelopeTo: string[] = [];
  try {
    envelopeTo = JSON.parse(row.envelope_to) as string[];
  } catch {
    envelopeTo = [];
  }
  return {
    ...summary(row),
    messageId: row.message_id,
    envelopeFrom: row.envelope_from,
    envelopeTo,
    text: row.text_body,
    html: row.html_body,
    raw: row.raw,
  };
}
