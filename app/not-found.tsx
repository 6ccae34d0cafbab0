import Link from "next/link";
import { WordMark } from "@/src/ui/word-mark";

export default function NotFound() {
  return (
    <main className="mx-auto flex min-h-[60vh] max-w-lg flex-col items-start justify-center gap-3 px-6 py-16">
      <WordMark />
      <h1 className="mt-4 text-2xl font-semibold text-ink-900">Page not found</h1>
      <p className="text-ink-600">
        There is nothing at this address, or it belongs to a survey you are not a member of. Check the link, or ask the survey lead to invite you.
      </p>
      <Link href="/surveys" className="text-tide-700 underline underline-offset-2 hover:text-tide-800">
        Go to your surveys
      </Link>
    </main>
  );
}
