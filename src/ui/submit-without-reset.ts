"use client";
/**
 * React resets a <form action={fn}> after the action, and a reset puts selects back on their
 * first option even when they are controlled. Forms that keep their values on screen submit
 * through this handler instead: it runs `beforeSubmit` (return false to stop, e.g. on client
 * validation errors) and dispatches the action in a transition, so pending state still shows
 * and nothing is reset. Without JavaScript the form still posts normally.
 */
import { startTransition, type FormEvent } from "react";

export function submitWithoutReset(dispatch: (formData: FormData) => void, beforeSubmit?: () => boolean) {
  return (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    if (beforeSubmit && !beforeSubmit()) return;
    const formData = new FormData(event.currentTarget, (event.nativeEvent as SubmitEvent).submitter);
    startTransition(() => dispatch(formData));
  };
}
