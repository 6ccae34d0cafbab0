import type { Metadata } from "next";
import Link from "next/link";
import { requireActor } from "@/src/server/auth/session";
import { listCapturedMail } from "@/src/server/mail/mailbox";
import { guardedRead } from "@/app/_lib/guarded-read";
import { EmptyState } from "@/src/ui/empty-state";
import { formatDateTime } from "@/src/ui/format";
import { PageHeader } from "@/src/ui/page-header";
import { Refusal } from "@/src/ui/refusal";
import { TestMailboxNotice } from "./_components/test-mailbox-notice";

export const metadata: Metadata = { title: "Mailbox" };

const COLUMNS = "md:grid-cols-[10rem_minmax(0,1fr)_minmax(0,2fr)]";

export default async function MailboxPage() {
  const actor = await requireActor("/admin/mailbox");
  const mail = await guardedRead(listCapturedMail(actor));
  if (!mail.ok) return <Refusal message={mail.message} />;
  return (
    <>
      <PageHeader title="Mailbox" description="Messages the app has sent, newest first. Times in UTC." />
      <TestMailboxNotice />
      {mail.value.length === 0 ? (
        <EmptyState title="No messages yet">Send an invitation from a survey&apos;s members page, or ask for a password reset; the message shows up here.</EmptyState>
      ) : (
        <div className="overflow-hidden rounded-lg border border-ink-100 bg-white shadow-sm">
          <div aria-hidden="true" className={`hidden gap-4 border-b border-ink-100 bg-ink-50 px-4 py-2 text-xs font-semibold uppercase tracking-wide text-ink-500 md:grid ${COLUMNS}`}>
            <span>Received (UTC)</span>
            <span>To</span>
            <span>Subject</span>
          </div>
          <ul className="divide-y divide-ink-100">
            {mail.value.map((m) => (
              <li key={m.id} className={`relative grid grid-cols-1 gap-0.5 px-4 py-3 hover:bg-paper-50 md:items-center md:gap-4 ${COLUMNS}`}>
                <span className="num order-3 text-xs text-ink-500 md:order-none md:text-sm md:text-ink-700">
                  {formatDateTime(m.receivedAt)}
                  <span className="md:hidden"> UTC</span>
                </span>
                <span className="order-2 break-all text-sm text-ink-700 md:order-none">
                  <span className="text-ink-500 md:hidden">To </span>
                  {m.to}
                </span>
                <Link
                  href={`/admin/mailbox/${m.id}`}
                  className="order-1 font-medium text-tide-700 underline-offset-2 after:absolute after:inset-0 hover:underline md:order-none"
                >
                  {m.subject || "(no subject)"}
                </Link>
              </li>
            ))}
          </ul>
        </div>
      )}
    </>
  );
}
