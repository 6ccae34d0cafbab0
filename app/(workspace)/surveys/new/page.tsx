import type { Metadata } from "next";
import Link from "next/link";
import { requireActor } from "@/src/server/auth/session";
import { PageHeader } from "@/src/ui/page-header";
import { Refusal } from "@/src/ui/refusal";
import { SurveyForm } from "../_components/survey-form";
import { timeZoneOptions } from "../_components/time-zones";
import { createSurveyAction } from "./actions";

export const metadata: Metadata = { title: "New survey" };

const EMPTY = { name: "", code: "", client: "", areaDescription: "", timeZone: "", notes: "" };

export default async function NewSurveyPage() {
  const actor = await requireActor("/surveys/new");
  if (!actor.isAdmin) {
    return (
      <Refusal title="Only an org admin creates surveys" message="Ask your org admin to create the survey and invite you as its lead.">
        <Link href="/surveys" className="text-tide-700 underline underline-offset-2">
          Back to surveys
        </Link>
      </Refusal>
    );
  }
  return (
    <div className="max-w-3xl">
      <PageHeader
        eyebrow={<Link href="/surveys" className="hover:underline">Surveys</Link>}
        title="New survey"
        description="After creating it, invite its lead and crew from the members page."
      />
      <div className="rounded-lg border border-ink-100 bg-white p-5 shadow-sm sm:p-6">
        <SurveyForm action={createSurveyAction} initial={EMPTY} timeZones={timeZoneOptions()} submitLabel="Create survey" />
      </div>
    </div>
  );
}
