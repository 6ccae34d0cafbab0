import { actorFromRequest } from "@/src/server/api-tokens/request-actor";
import { routeAccess } from "@/src/server/authz/route-access";
import { toErrorResponse } from "@/src/server/http/respond";
import { downloadResponse } from "@/src/server/runs/download";
import { exportRunGeoJson } from "@/src/server/runs/export";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

type Ctx = { params: Promise<{ surveyId: string; date: string; run: string }> };

/** GET → the run's readings with a position as a GeoJSON FeatureCollection (RFC 7946). Needs "export". */
export async function GET(request: Request, { params }: Ctx): Promise<Response> {
  try {
    const { surveyId, date, run } = await params;
    const actor = await actorFromRequest(request, routeAccess("GET /api/v1/surveys/[surveyId]/days/[date]/runs/[run]/corrected.geojson"));
    const { fileName, chunks } = await exportRunGeoJson(actor, surveyId, date, run);
    return downloadResponse(chunks, fileName, "application/geo+json");
  } catch (err) {
    return toErrorResponse(err);
  }
}
