import Link from "next/link";
import type { Actor } from "@/src/server/auth/session";
import { decidesAnywhere } from "@/src/server/review/service";
import { WordMark } from "@/src/ui/word-mark";
import { signOutAction } from "../actions";
import { NavLink } from "./nav-link";

export async function TopBar({ actor }: { actor: Actor }) {
  const reviews = await decidesAnywhere(actor);
  return (
    <header className="no-print bg-ink-900 text-paper-50">
      <div className="mx-auto flex max-w-6xl flex-wrap items-center gap-x-6 gap-y-2 px-4 py-2.5 sm:px-6">
        <Link href="/surveys" className="rounded focus-visible:outline-2 focus-visible:outline-tide-300" aria-label="Fieldtide, surveys">
          <WordMark tone="light" />
        </Link>
        <nav aria-label="Main" className="order-3 flex w-full gap-1 sm:order-none sm:w-auto">
          <NavLink href="/surveys">Surveys</NavLink>
          {reviews ? <NavLink href="/review">Review</NavLink> : null}
          {actor.isAdmin ? <NavLink href="/admin/mailbox">Mailbox</NavLink> : null}
          <NavLink href="/profile">Profile</NavLink>
        </nav>
        <div className="ml-auto flex items-center gap-3">
          <div className="text-right leading-tight">
            <div className="max-w-[11rem] truncate text-sm font-medium" title={actor.email}>
              {actor.name}
            </div>
            <div className="text-xs text-ink-300">{actor.isAdmin ? "Org admin" : "Survey member"}</div>
          </div>
          <form action={signOutAction}>
            <button
              type="submit"
              className="min-h-10 rounded-md border border-ink-600 px-3 py-1.5 text-sm text-paper-50 hover:bg-ink-800 focus-visible:outline-2 focus-visible:outline-tide-300"
            >
              Sign out
            </button>
          </form>
        </div>
      </div>
    </header>
  );
}
