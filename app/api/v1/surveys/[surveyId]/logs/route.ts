import { actorFromRequest } from "@/src/server/api-tokens/request-actor";
import { routeAccess } from "@/src/server/authz/route-access";
import { json } from "@/src/server/http/respond";
import { logErrorResponse } from "@/src/server/logs/error-response";
import { assertCanUploadLogs, importStagedLog } from "@/src/server/logs/import-service";
import { readLogUpload } from "@/src/server/logs/multipart-upload";
import { listLogs } from "@/src/server/logs/read-service";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

type Ctx = { params: Promise<{ surveyId: string }> };

/** GET ?page&pageSize&sort&dir&kind&day&operator&instrument → { items, total, query, facets }. */
export async function GET(request: Request, { params }: Ctx): Promise<Response> {
  try {
    const { surveyId } = await params;
    const actor = await actorFromRequest(request, routeAccess("GET /api/v1/surveys/[surveyId]/logs"));
    const query = Object.fromEntries(new URL(request.url).searchParams);
    return json(await listLogs(actor, surveyId, query));
  } catch (err) {
    return logErrorResponse(err);
  }
}

/** POST multipart (`file`, `kind`, options) → 201 import result; 4xx with the reason and any problem rows. */
export async function POST(request: Request, { params }: Ctx): Promise<Response> {
  try {
    const { surveyId } = await params;
    const actor = await actorFromRequest(request, routeAccess("POST /api/v1/surveys/[surveyId]/logs"));
    await assertCanUploadLogs(actor, surveyId); // before reading any byte of the body
    const { fields, staged } = await readLogUpload(request);
    const result = await importStagedLog(actor, surveyId, staged, fields, { signal: request.signal });
    return json(result, { status: 201 });
  } catch (err) {
    return logErrorResponse(err);
  }
}
