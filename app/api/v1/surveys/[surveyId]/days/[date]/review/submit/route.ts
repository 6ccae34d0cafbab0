import { actorFromRequest } from "@/src/server/api-tokens/request-actor";
import { routeAccess } from "@/src/server/authz/route-access";
import { json, readJsonBody, toErrorResponse } from "@/src/server/http/respond";
import { submitDayForReview } from "@/src/server/review/service";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

type Ctx = { params: Promise<{ surveyId: string; date: string }> };

/** POST { comment? } (processor, lead) → { review, mail: { sentTo, failedTo } }; 409 when it already awaits review or is accepted. */
export async function POST(request: Request, { params }: Ctx): Promise<Response> {
  try {
    const { surveyId, date } = await params;
    const actor = await actorFromRequest(request, routeAccess("POST /api/v1/surveys/[surveyId]/days/[date]/review/submit"));
    const body = (await request.clone().text()).trim() === "" ? {} : await readJsonBody(request); // no body: no comment
    return json(await submitDayForReview(actor, surveyId, date, body));
  } catch (err) {
    return toErrorResponse(err);
  }
}
