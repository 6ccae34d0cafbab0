import { actorFromRequest } from "@/src/server/api-tokens/request-actor";
import { routeAccess } from "@/src/server/authz/route-access";
import { json, toErrorResponse } from "@/src/server/http/respond";
import { getRun } from "@/src/server/runs/service";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

type Ctx = { params: Promise<{ surveyId: string; date: string; run: string }> };

/** GET → { run } with status, progress, parameters, model, inputs, summary. */
export async function GET(request: Request, { params }: Ctx): Promise<Response> {
  try {
    const { surveyId, date, run } = await params;
    const actor = await actorFromRequest(request, routeAccess("GET /api/v1/surveys/[surveyId]/days/[date]/runs/[run]"));
    return json({ run: await getRun(actor, surveyId, date, run) });
  } catch (err) {
    return toErrorResponse(err);
  }
}
