"use client";
/** A submit button that disables itself and says so while its form's action runs. */
import { useFormStatus } from "react-dom";
import { Button, type ButtonVariant } from "./button";

export function SubmitButton({
  children,
  pendingLabel,
  variant = "primary",
  className,
  name,
  value,
}: {
  children: React.ReactNode;
  pendingLabel?: string;
  variant?: ButtonVariant;
  className?: string;
  name?: string;
  value?: string;
}) {
  const { pending } = useFormStatus();
  return (
    <Button type="submit" variant={variant} className={className} disabled={pending} aria-disabled={pending} name={name} value={value}>
      {children}
      {pending && pendingLabel ? <span className="sr-only"> ({pendingLabel})</span> : null}
      {pending ? (
        <span aria-hidden="true" className="ml-1 inline-block h-3 w-3 animate-spin rounded-full border-2 border-current border-r-transparent" />
      ) : null}
    </Button>
  );
}
