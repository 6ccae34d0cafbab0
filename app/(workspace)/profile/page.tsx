import type { Metadata } from "next";
import { listApiTokens } from "@/src/server/api-tokens/service";
import { requireActor } from "@/src/server/auth/session";
import { getEnv } from "@/src/server/env";
import { PageHeader } from "@/src/ui/page-header";
import { StatusChip } from "@/src/ui/status-chip";
import { formatDateTime } from "@/src/ui/format";
import { ConfirmSubmit } from "@/src/ui/confirm-submit";
import { revokeApiTokenAction, signOutEverywhereAction } from "./actions";
import { CreateTokenForm } from "./_components/create-token-form";
import { NotificationForm } from "./_components/notification-form";
import { getNotificationPreferences } from "@/src/server/notifications/preferences";

export const metadata: Metadata = { title: "Profile" };

export default async function ProfilePage() {
  const actor = await requireActor("/profile");
  const tokens = await listApiTokens(actor);
  const mailChoices = await getNotificationPreferences(actor);
  const curl = `curl -H "Authorization: Bearer $FIELDTIDE_TOKEN" -F kind=rover -F instrument=ROVER-01 -F timeBasis=utc -F file=@rover.csv ${getEnv().appUrl}/api/v1/surveys/SURVEY_ID/logs`;
  return (
    <>
      <PageHeader title="Profile" description={`${actor.name} · ${actor.email}`} />
      <section className="space-y-4 rounded-lg border border-ink-100 bg-white p-5 shadow-sm">
        <div>
          <h2 className="text-base font-semibold text-ink-900">API tokens</h2>
          <p className="mt-1 max-w-3xl text-sm text-ink-600">
            A token lets a field laptop send logs with <code>curl</code> as you, with your roles on each survey. Revoke it when the laptop is lost or retired.
          </p>
        </div>
        <CreateTokenForm curlExample={curl} />
        {tokens.length === 0 ? (
          <p className="text-sm text-ink-500">No tokens yet.</p>
        ) : (
          <table className="min-w-full text-sm">
            <caption className="sr-only">Your API tokens</caption>
            <thead className="text-left text-xs text-ink-600">
              <tr>{["Name", "Starts with", "Created (UTC)", "Last used (UTC)", "State", ""].map((h) => <th key={h} scope="col" className="px-2 py-1 font-medium">{h}</th>)}</tr>
            </thead>
            <tbody>
              {tokens.map((t) => (
                <tr key={t.id} className="border-t border-ink-100">
                  <td className="px-2 py-1.5">{t.name}</td>
                  <td className="num px-2 py-1.5 font-mono text-xs">{t.prefix}…</td>
                  <td className="num px-2 py-1.5">{formatDateTime(t.createdAt)}</td>
                  <td className="num px-2 py-1.5">{t.lastUsedAt ? formatDateTime(t.lastUsedAt) : "never"}</td>
                  <td className="px-2 py-1.5">{t.revokedAt ? <StatusChip tone="neutral" label="Revoked" detail={`on ${formatDateTime(t.revokedAt)} UTC`} /> : <StatusChip tone="ok" label="Active" />}</td>
                  <td className="px-2 py-1.5 text-right">
                    {t.revokedAt ? null : (
                      <form action={revokeApiTokenAction}>
                        <input type="hidden" name="tokenId" value={t.id} />
                        <ConfirmSubmit label="Revoke" what={t.name} question={`Revoke the token “${t.name}”? Scripts using it stop working.`} confirmLabel="Yes, revoke" />
                      </form>
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
      <section className="mt-6 space-y-3 rounded-lg border border-ink-100 bg-white p-5 shadow-sm" aria-labelledby="mail-heading">
        <div>
          <h2 id="mail-heading" className="text-base font-semibold text-ink-900">Review mail</h2>
          <p className="mt-1 max-w-3xl text-sm text-ink-600">Fieldtide mails you about the review of survey days. Untick what you do not want.</p>
        </div>
        <NotificationForm preferences={mailChoices} />
      </section>
      <section className="mt-6 space-y-3 rounded-lg border border-ink-100 bg-white p-5 shadow-sm">
        <h2 className="text-base font-semibold text-ink-900">Sessions</h2>
        <p className="max-w-3xl text-sm text-ink-600">Signed in on a shared or lost device? End every session of your account, this one included. API tokens keep working until you revoke them above.</p>
        <form action={signOutEverywhereAction}>
          <ConfirmSubmit label="Sign out everywhere" question="End every session of your account, on all browsers and devices?" confirmLabel="Yes, sign out everywhere" />
        </form>
      </section>
    </>
  );
}
