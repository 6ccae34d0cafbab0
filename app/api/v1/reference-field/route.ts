import { actorFromRequest } from "@/src/server/api-tokens/request-actor";
import { routeAccess } from "@/src/server/authz/route-access";
import { json, toErrorResponse } from "@/src/server/http/respond";
import { referenceFieldAt } from "@/src/server/processing/reference-field";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

/** GET ?lat=&lon=&heightM=&date=&model=igrf|wmm → { model, point, field: { northNt, eastNt, downNt, horizontalNt, totalNt, inclinationDeg, declinationDeg } }. */
export async function GET(request: Request): Promise<Response> {
  try {
    const actor = await actorFromRequest(request, routeAccess("GET /api/v1/reference-field"));
    return json(referenceFieldAt(actor, Object.fromEntries(new URL(request.url).searchParams)));
  } catch (err) {
    return toErrorResponse(err);
  }
}
