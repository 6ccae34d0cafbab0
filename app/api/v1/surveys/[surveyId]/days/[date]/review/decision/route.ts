import { actorFromRequest } from "@/src/server/api-tokens/request-actor";
import { routeAccess } from "@/src/server/authz/route-access";
import { json, readJsonBody, toErrorResponse } from "@/src/server/http/respond";
import { decideDay } from "@/src/server/review/service";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

type Ctx = { params: Promise<{ surveyId: string; date: string }> };

/**
 * POST { decision: "accept" | "resurvey", scope?: "day" | "lines", lines?: string[] | "L1, L2", comment } (QA reviewer only)
 * → { review, mail }; a re-survey needs a comment; 409 unless the day awaits review.
 */
export async function POST(request: Request, { params }: Ctx): Promise<Response> {
  try {
    const { surveyId, date } = await params;
    const actor = await actorFromRequest(request, routeAccess("POST /api/v1/surveys/[surveyId]/days/[date]/review/decision"));
    return json(await decideDay(actor, surveyId, date, await readJsonBody(request)));
  } catch (err) {
    return toErrorResponse(err);
  }
}
