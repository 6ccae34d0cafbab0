import { actorFromRequest } from "@/src/server/api-tokens/request-actor";
import { routeAccess } from "@/src/server/authz/route-access";
import { listDays } from "@/src/server/days/service";
import { json, toErrorResponse } from "@/src/server/http/respond";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

type Ctx = { params: Promise<{ surveyId: string }> };

/** GET → { days: DaySummary[] } newest first. */
export async function GET(request: Request, { params }: Ctx): Promise<Response> {
  try {
    const { surveyId } = await params;
    const actor = await actorFromRequest(request, routeAccess("GET /api/v1/surveys/[surveyId]/days"));
    return json({ days: await listDays(actor, surveyId) });
  } catch (err) {
    return toErrorResponse(err);
  }
}
