import type { Metadata } from "next";
import Link from "next/link";
import { requireActor } from "@/src/server/auth/session";
import { getCapturedMail } from "@/src/server/mail/mailbox";
import { guardedRead } from "@/app/_lib/guarded-read";
import { formatDateTime } from "@/src/ui/format";
import { PageHeader } from "@/src/ui/page-header";
import { Refusal } from "@/src/ui/refusal";
import { LinkedText } from "../_components/linked-text";
import { TestMailboxNotice } from "../_components/test-mailbox-notice";

export const metadata: Metadata = { title: "Message" };

export default async function MailPage({ params }: { params: Promise<{ mailId: string }> }) {
  const { mailId } = await params;
  const actor = await requireActor(`/admin/mailbox/${mailId}`);
  const result = await guardedRead(getCapturedMail(actor, mailId));
  if (!result.ok) return <Refusal message={result.message} />;
  const m = result.value;
  return (
    <>
      <PageHeader
        eyebrow={
          <Link href="/admin/mailbox" className="hover:underline">
            Mailbox
          </Link>
        }
        title={m.subject || "(no subject)"}
      />
      <TestMailboxNotice />
      <article className="rounded-lg border border-ink-100 bg-white shadow-sm">
        <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 border-b border-ink-100 px-5 py-4 text-sm">
          <dt className="text-ink-500">From</dt>
          <dd className="break-all text-ink-800">{m.from}</dd>
          <dt className="text-ink-500">To</dt>
          <dd className="break-all text-ink-800">{m.to}</dd>
          <dt className="text-ink-500">Received</dt>
          <dd className="num text-ink-800">{formatDateTime(m.receivedAt)} UTC</dd>
        </dl>
        <div className="px-5 py-4">
          {m.text ? (
            <pre className="whitespace-pre-wrap break-words font-sans text-sm leading-relaxed text-ink-900">
              <LinkedText text={m.text} />
            </pre>
          ) : (
            <p className="text-sm text-ink-500">This message has no plain-text part. Its HTML source is below.</p>
          )}
        </div>
        {m.html ? (
          <details className="border-t border-ink-100 px-5 py-3 text-sm">
            <summary className="cursor-pointer text-ink-600">HTML part (shown as source, not rendered)</summary>
            <pre className="mt-2 max-h-96 overflow-auto whitespace-pre-wrap break-all rounded bg-ink-50 p-3 text-xs text-ink-800">{m.html}</pre>
          </details>
        ) : null}
        <details className="border-t border-ink-100 px-5 py-3 text-sm">
          <summary className="cursor-pointer text-ink-600">Raw message</summary>
          <pre className="mt-2 max-h-96 overflow-auto whitespace-pre-wrap break-all rounded bg-ink-50 p-3 text-xs text-ink-800">{m.raw}</pre>
        </details>
      </article>
    </>
  );
}
