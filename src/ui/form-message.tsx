/** Form-level outcome: an error (role=alert) or a success note (role=status), word + icon + colour. */
import { AlertIcon, CheckIcon } from "./icons";

export function FormError({ message }: { message?: string | null }) {
  if (!message) return null;
  return (
    <div role="alert" className="flex items-start gap-2 rounded-md border border-storm-500/40 bg-storm-50 px-3 py-2 text-sm text-storm-700">
      <AlertIcon size={16} className="mt-0.5 shrink-0" />
      <p>{message}</p>
    </div>
  );
}

export function FormSuccess({ message }: { message?: string | null }) {
  if (!message) return null;
  return (
    <div role="status" className="flex items-start gap-2 rounded-md border border-moss-500/40 bg-moss-50 px-3 py-2 text-sm text-moss-700">
      <CheckIcon size={16} className="mt-0.5 shrink-0" />
      <p>{message}</p>
    </div>
  );
}
