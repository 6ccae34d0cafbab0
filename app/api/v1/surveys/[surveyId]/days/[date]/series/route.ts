import { actorFromRequest } from "@/src/server/api-tokens/request-actor";
import { routeAccess } from "@/src/server/authz/route-access";
import { getDaySeries } from "@/src/server/days/series";
import { json, toErrorResponse } from "@/src/server/http/respond";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

type Ctx = { params: Promise<{ surveyId: string; date: string }> };

/** GET ?kind=base|rover|corrected&line=&maxPoints=&run= → thinned chart series (≤ maxPoints, default 2 000). */
export async function GET(request: Request, { params }: Ctx): Promise<Response> {
  try {
    const { surveyId, date } = await params;
    const actor = await actorFromRequest(request, routeAccess("GET /api/v1/surveys/[surveyId]/days/[date]/series"));
    const query = Object.fromEntries(new URL(request.url).searchParams);
    return json(await getDaySeries(actor, surveyId, date, query));
  } catch (err) {
    return toErrorResponse(err);
  }
}
