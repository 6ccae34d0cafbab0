import Link from "next/link";
import { WordMark } from "@/src/ui/word-mark";

/** Signed-out pages: the mark above one centred card, readable at phone width. */
export default function AuthLayout({ children }: { children: React.ReactNode }) {
  return (
    <div className="flex min-h-screen flex-col items-center bg-paper-100 px-4 py-10 sm:py-16">
      <Link href="/sign-in" className="mb-8 rounded focus-visible:outline-2 focus-visible:outline-tide-600">
        <WordMark />
      </Link>
      <main className="w-full max-w-md rounded-xl border border-ink-100 bg-white p-6 shadow-sm sm:p-8">{children}</main>
      <p className="mt-6 max-w-md text-center text-xs text-ink-500">
        Diurnal and main-field correction for ground magnetic surveys.
      </p>
    </div>
  );
}
