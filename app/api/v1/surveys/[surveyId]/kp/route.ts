import { actorFromRequest } from "@/src/server/api-tokens/request-actor";
import { routeAccess } from "@/src/server/authz/route-access";
import { ValidationError } from "@/src/server/errors";
import { json, readJsonBody, toErrorResponse } from "@/src/server/http/respond";
import { listKp, saveKpValues } from "@/src/server/kp/service";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

type Ctx = { params: Promise<{ surveyId: string }> };

/** Kp CSV bodies are a few rows a day; refuse anything past 1 MB. */
const MAX_BODY_BYTES = 1_000_000;

/** GET → { values: [{ intervalStart, kp, source, enteredBy, enteredAt }] } oldest first. */
export async function GET(request: Request, { params }: Ctx): Promise<Response> {
  try {
    const { surveyId } = await params;
    const actor = await actorFromRequest(request, routeAccess("GET /api/v1/surveys/[surveyId]/kp"));
    return json({ values: await listKp(actor, surveyId) });
  } catch (err) {
    return toErrorResponse(err);
  }
}

/** POST text/csv ("start,kp" rows) or JSON { text } (reviewer, processor, lead) → 201 { saved, replaced }; any bad row refuses all (400, rows listed). */
export async function POST(request: Request, { params }: Ctx): Promise<Response> {
  try {
    const { surveyId } = await params;
    const actor = await actorFromRequest(request, routeAccess("POST /api/v1/surveys/[surveyId]/kp"));
    if (Number(request.headers.get("content-length") ?? 0) > MAX_BODY_BYTES) throw new ValidationError({}, "A Kp upload is at most 1 MB.");
    const type = request.headers.get("content-type") ?? "";
    const input = type.startsWith("text/") ? { text: await request.text(), source: "csv" } : await readJsonBody(request);
    return json(await saveKpValues(actor, surveyId, input), { status: 201 });
  } catch (err) {
    return toErrorResponse(err);
  }
}
