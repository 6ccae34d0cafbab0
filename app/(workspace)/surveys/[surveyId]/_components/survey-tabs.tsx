"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";

/** `exact`: current only on its own URL (the overview); other tabs also own their sub-pages. */
export type SurveyTab = { href: string; label: string; exact?: boolean };

/** Section links of one survey; the current one is marked for assistive tech too. */
export function SurveyTabs({ tabs }: { tabs: SurveyTab[] }) {
  const pathname = usePathname();
  return (
    <nav aria-label="Survey sections" className="-mb-px flex gap-1 overflow-x-auto">
      {tabs.map((tab) => {
        const current = pathname === tab.href || (!tab.exact && pathname.startsWith(`${tab.href}/`));
        return (
          <Link
            key={tab.href}
            href={tab.href}
            aria-current={current ? "page" : undefined}
            className={`whitespace-nowrap border-b-2 px-3 py-2 text-sm font-medium focus-visible:outline-2 focus-visible:outline-tide-600 ${
              current ? "border-tide-700 text-tide-800" : "border-transparent text-ink-600 hover:border-ink-200 hover:text-ink-900"
            }`}
          >
            {tab.label}
          </Link>
        );
      })}
    </nav>
  );
}
