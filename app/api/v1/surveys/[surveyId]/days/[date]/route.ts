import { actorFromRequest } from "@/src/server/api-tokens/request-actor";
import { routeAccess } from "@/src/server/authz/route-access";
import { getDay, getDayPairing } from "@/src/server/days/service";
import { json, toErrorResponse } from "@/src/server/http/respond";
import { listRuns } from "@/src/server/runs/service";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

type Ctx = { params: Promise<{ surveyId: string; date: string }> };

/** GET → { day, pairing, runs } (runs newest first, with status and progress). */
export async function GET(request: Request, { params }: Ctx): Promise<Response> {
  try {
    const { surveyId, date } = await params;
    const actor = await actorFromRequest(request, routeAccess("GET /api/v1/surveys/[surveyId]/days/[date]"));
    const day = await getDay(actor, surveyId, date);
    return json({ day, pairing: await getDayPairing(actor, surveyId, date), runs: await listRuns(actor, surveyId, date) });
  } catch (err) {
    return toErrorResponse(err);
  }
}
