import type { Metadata } from "next";
import Link from "next/link";
import { unstable_rethrow } from "next/navigation";
import { InvalidTokenError } from "@/src/server/errors";
import { getInvitation } from "@/src/server/invitations/service";
import { Refusal } from "@/src/ui/refusal";
import { RoleChip } from "@/src/ui/role-chip";
import { formatDateTime } from "@/src/ui/format";
import { AcceptInvitationForm } from "./accept-invitation-form";

export const metadata: Metadata = { title: "Invitation" };

async function readInvitation(token: string) {
  try {
    return { ok: true as const, invitation: await getInvitation(token) };
  } catch (err) {
    unstable_rethrow(err);
    if (err instanceof InvalidTokenError) return { ok: false as const, message: err.message };
    throw err;
  }
}

export default async function InvitationPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const result = await readInvitation(token);
  if (!result.ok) {
    return (
      <Refusal title="This invitation link cannot be used" message={result.message}>
        Ask the survey lead to send a new invitation.{" "}
        <Link href="/sign-in" className="text-tide-700 underline underline-offset-2">
          Sign in
        </Link>{" "}
        if you already have an account.
      </Refusal>
    );
  }
  const { invitation } = result;
  return (
    <>
      <p className="text-sm font-medium text-ink-500">You are invited to join the survey</p>
      <h1 className="mt-1 text-xl font-semibold text-ink-900">{invitation.surveyName}</h1>
      <dl className="mt-4 mb-6 grid grid-cols-[auto_1fr] gap-x-4 gap-y-2 rounded-md bg-paper-50 px-4 py-3 text-sm">
        <dt className="text-ink-500">Role</dt>
        <dd>
          <RoleChip role={invitation.role} />
        </dd>
        <dt className="text-ink-500">For</dt>
        <dd className="break-all text-ink-800">{invitation.email}</dd>
        <dt className="text-ink-500">Valid until</dt>
        <dd className="num text-ink-800">{formatDateTime(invitation.expiresAt)} UTC</dd>
      </dl>
      <AcceptInvitationForm token={token} existingUser={invitation.existingUser} />
    </>
  );
}
