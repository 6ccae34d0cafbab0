import { Readable } from "node:stream";
import { actorFromRequest } from "@/src/server/api-tokens/request-actor";
import { routeAccess } from "@/src/server/authz/route-access";
import { logErrorResponse } from "@/src/server/logs/error-response";
import { openLogOriginal } from "@/src/server/logs/read-service";
import { contentDisposition } from "@/src/server/logs/content-disposition";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

/** GET → the original bytes as uploaded, with their SHA-256 in a header. */
export async function GET(request: Request, { params }: { params: Promise<{ surveyId: string; logId: string }> }): Promise<Response> {
  try {
    const { surveyId, logId } = await params;
    const actor = await actorFromRequest(request, routeAccess("GET /api/v1/surveys/[surveyId]/logs/[logId]/original"));
    const file = await openLogOriginal(actor, surveyId, logId);
    return new Response(Readable.toWeb(file.stream as Readable) as ReadableStream, {
      headers: {
        "Content-Type": "application/octet-stream",
        "Content-Length": String(file.sizeBytes),
        "Content-Disposition": contentDisposition(file.fileName),
        "X-Content-SHA256": file.sha256,
        "Cache-Control": "private, no-store",
      },
    });
  } catch (err) {
    return logErrorResponse(err);
  }
}
