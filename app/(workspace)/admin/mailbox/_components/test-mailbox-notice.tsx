import { InfoIcon } from "@/src/ui/icons";

/** Says plainly that this is the app's local capture of outgoing mail, not a real inbox. */
export function TestMailboxNotice() {
  return (
    <div role="note" className="mb-5 flex items-start gap-2 rounded-md border border-tide-500/40 bg-tide-50 px-3 py-2 text-sm text-tide-800">
      <InfoIcon size={16} className="mt-0.5 shrink-0" />
      <p>
        <strong className="font-semibold">Local test mailbox.</strong> This server runs its own test SMTP receiver and keeps every message
        the app sends here; nothing leaves this machine. Use it to follow invitation and password links while testing.
      </p>
    </div>
  );
}
