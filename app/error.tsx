"use client";
/** Unexpected errors: a plain sentence and a retry, never the error text or a stack. */
import Link from "next/link";
import { Button } from "@/src/ui/button";

export default function ErrorPage({ error, retry }: { error: unknown; retry: () => void }) {
  const digest = error instanceof Error && "digest" in error ? String((error as { digest?: string }).digest ?? "") : "";
  return (
    <main className="mx-auto flex min-h-[50vh] max-w-lg flex-col items-start justify-center gap-3 px-6 py-16">
      <h1 className="text-2xl font-semibold text-ink-900">Something went wrong</h1>
      <p className="text-ink-600">The page could not be shown. Nothing you entered was changed by this error. Try again in a moment.</p>
      {digest ? <p className="num text-xs text-ink-500">Reference for the administrator: {digest}</p> : null}
      <div className="mt-2 flex gap-2">
        <Button variant="primary" onClick={() => retry()}>
          Try again
        </Button>
        <Link href="/surveys" className="inline-flex min-h-10 items-center px-3 text-sm text-tide-700 underline underline-offset-2">
          Go to your surveys
        </Link>
      </div>
    </main>
  );
}
