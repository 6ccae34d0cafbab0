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
        <div className="overflow-x-auto rounded-lg border border-ink-100 bg-white shadow-sm">
          <table className="w-full min-w-[34rem] text-left text-sm">
            <thead className="bg-ink-50 text-xs font-semibold uppercase tracking-wide text-ink-500">
              <tr>
                <th scope="col" className="px-4 py-2">Received (UTC)</th>
                <th scope="col" className="px-4 py-2">To</th>
                <th scope="col" className="px-4 py-2">Subject</th>
              </tr>
            </thead>
            <tbody className="divide-y divide-ink-100">
              {mail.value.map((m) => (
                <tr key={m.id} className="hover:bg-paper-50">
                  <td className="num whitespace-nowrap px-4 py-2.5 text-ink-700">{formatDateTime(m.receivedAt)}</td>
                  <td className="break-all px-4 py-2.5 text-ink-700">{m.to}</td>
                  <td className="px-4 py-2.5">
                    <Link href={`/admin/mailbox/${m.id}`} className="font-medium text-tide-700 underline-offset-2 hover:underline">
                      {m.subject || "(no subject)"}
                    </Link>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </>
  );
}
