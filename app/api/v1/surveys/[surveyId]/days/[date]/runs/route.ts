import { actorFromRequest } from "@/src/server/api-tokens/request-actor";
import { routeAccess } from "@/src/server/authz/route-access";
import { json, toErrorResponse } from "@/src/server/http/respond";
import { listRuns, startRun } from "@/src/server/runs/service";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

type Ctx = { params: Promise<{ surveyId: string; date: string }> };

/** GET → { runs } newest first. */
export async function GET(request: Request, { params }: Ctx): Promise<Response> {
  try {
    const { surveyId, date } = await params;
    const actor = await actorFromRequest(request, routeAccess("GET /api/v1/surveys/[surveyId]/days/[date]/runs"));
    return json({ runs: await listRuns(actor, surveyId, date) });
  } catch (err) {
    return toErrorResponse(err);
  }
}

/** POST (no body: the survey's settings and the day's pairing apply) → 202 { run } queued; poll GET …/runs/{number}. */
export async function POST(request: Request, { params }: Ctx): Promise<Response> {
  try {
    const { surveyId, date } = await params;
    const actor = await actorFromRequest(request, routeAccess("POST /api/v1/surveys/[surveyId]/days/[date]/runs"));
    const run = await startRun(actor, surveyId, date);
    return json({ run }, { status: 202, headers: { Location: new URL(`${request.url.replace(/\/$/, "")}/${run.number}`).pathname } });
  } catch (err) {
    return toErrorResponse(err);
  }
}
