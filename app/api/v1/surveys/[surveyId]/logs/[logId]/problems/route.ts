import { actorFromRequest } from "@/src/server/api-tokens/request-actor";
import { routeAccess } from "@/src/server/authz/route-access";
import { contentDisposition } from "@/src/server/logs/content-disposition";
import { logErrorResponse } from "@/src/server/logs/error-response";
import { problemsCsvName, problemsToCsv } from "@/src/server/logs/problems-csv";
import { listLogProblems } from "@/src/server/logs/read-service";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

/** GET → the log's refused and flagged rows as CSV. */
export async function GET(request: Request, { params }: { params: Promise<{ surveyId: string; logId: string }> }): Promise<Response> {
  try {
    const { surveyId, logId } = await params;
    const actor = await actorFromRequest(request, routeAccess("GET /api/v1/surveys/[surveyId]/logs/[logId]/problems"));
    const { fileName, problems } = await listLogProblems(actor, surveyId, logId);
    return new Response(problemsToCsv(problems), {
      headers: { "Content-Type": "text/csv; charset=utf-8", "Content-Disposition": contentDisposition(problemsCsvName(fileName)), "Cache-Control": "private, no-store" },
    });
  } catch (err) {
    return logErrorResponse(err);
  }
}
