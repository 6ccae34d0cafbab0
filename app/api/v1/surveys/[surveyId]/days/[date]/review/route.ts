import { actorFromRequest } from "@/src/server/api-tokens/request-actor";
import { routeAccess } from "@/src/server/authz/route-access";
import { json, toErrorResponse } from "@/src/server/http/respond";
import { getDayReview, listDayReviewHistory } from "@/src/server/review/service";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

type Ctx = { params: Promise<{ surveyId: string; date: string }> };

/** GET → { review: state, scope, lines, comment, assessment (suggested verdict, reasons, metrics, Kp) , history: every step }. */
export async function GET(request: Request, { params }: Ctx): Promise<Response> {
  try {
    const { surveyId, date } = await params;
    const actor = await actorFromRequest(request, routeAccess("GET /api/v1/surveys/[surveyId]/days/[date]/review"));
    const review = await getDayReview(actor, surveyId, date);
    return json({ review, history: await listDayReviewHistory(actor, surveyId, date) });
  } catch (err) {
    return toErrorResponse(err);
  }
}
