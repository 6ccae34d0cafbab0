import { actorFromRequest } from "@/src/server/api-tokens/request-actor";
import { routeAccess } from "@/src/server/authz/route-access";
import { json, toErrorResponse } from "@/src/server/http/respond";
import { compareRuns } from "@/src/server/runs/service";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

type Ctx = { params: Promise<{ surveyId: string; date: string; run: string }> };

/** GET ?with=N → { comparison } of run {run} against run N (changed readings, largest change, parameter changes). */
export async function GET(request: Request, { params }: Ctx): Promise<Response> {
  try {
    const { surveyId, date, run } = await params;
    const actor = await actorFromRequest(request, routeAccess("GET /api/v1/surveys/[surveyId]/days/[date]/runs/[run]/compare"));
    const other = new URL(request.url).searchParams.get("with");
    return json({ comparison: await compareRuns(actor, surveyId, date, run, other) });
  } catch (err) {
    return toErrorResponse(err);
  }
}
