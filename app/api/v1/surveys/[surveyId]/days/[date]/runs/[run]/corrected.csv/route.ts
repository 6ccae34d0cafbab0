import { actorFromRequest } from "@/src/server/api-tokens/request-actor";
import { routeAccess } from "@/src/server/authz/route-access";
import { toErrorResponse } from "@/src/server/http/respond";
import { downloadResponse } from "@/src/server/runs/download";
import { exportRunCsv } from "@/src/server/runs/export";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

type Ctx = { params: Promise<{ surveyId: string; date: string; run: string }> };

/** GET → the run's corrected readings as CSV (# header lines, then the CLI's columns). Needs "export". */
export async function GET(request: Request, { params }: Ctx): Promise<Response> {
  try {
    const { surveyId, date, run } = await params;
    const actor = await actorFromRequest(request, routeAccess("GET /api/v1/surveys/[surveyId]/days/[date]/runs/[run]/corrected.csv"));
    const { fileName, chunks } = await exportRunCsv(actor, surveyId, date, run);
    return downloadResponse(chunks, fileName, "text/csv; charset=utf-8");
  } catch (err) {
    return toErrorResponse(err);
  }
}
