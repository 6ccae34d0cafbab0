"use client";
/**
 * A destructive submit in two steps: the first press asks, the second (a real submit button
 * inside the same form) does it. Works inside any <form action={...}>.
 */
import { useState } from "react";
import { Button, type ButtonVariant } from "./button";
import { SubmitButton } from "./submit-button";

export function ConfirmSubmit({
  label,
  question,
  confirmLabel,
  variant = "danger",
  what,
}: {
  label: string;
  question: string;
  confirmLabel: string;
  variant?: ButtonVariant;
  /** Read after the label by screen readers when rows repeat it, e.g. "Remove" + " Priya Lantern". */
  what?: string;
}) {
  const [asking, setAsking] = useState(false);
  if (!asking) {
    return (
      <Button variant={variant} onClick={() => setAsking(true)}>
        {label}
        {what ? <span className="sr-only"> {what}</span> : null}
      </Button>
    );
  }
  return (
    <span role="group" aria-label={question} className="inline-flex flex-wrap items-center gap-2">
      <span className="text-sm text-ink-700">{question}</span>
      <SubmitButton variant="danger">{confirmLabel}</SubmitButton>
      <Button variant="quiet" onClick={() => setAsking(false)}>
        Cancel
      </Button>
    </span>
  );
}
