import { requireActor } from "@/src/server/auth/session";
import { getSurvey } from "@/src/server/surveys/service";
import { guardedRead } from "@/app/_lib/guarded-read";
import { Refusal } from "@/src/ui/refusal";
import { SurveyHeader } from "./_components/survey-header";

/** Every survey page shares the header strip; a survey the actor is not on is a 404. */
export default async function SurveyLayout({ children, params }: { children: React.ReactNode; params: Promise<{ surveyId: string }> }) {
  const { surveyId } = await params;
  const actor = await requireActor(`/surveys/${surveyId}`);
  const survey = await guardedRead(getSurvey(actor, surveyId));
  if (!survey.ok) return <Refusal message={survey.message} />;
  return (
    <>
      <SurveyHeader survey={survey.value} />
      {children}
    </>
  );
}
