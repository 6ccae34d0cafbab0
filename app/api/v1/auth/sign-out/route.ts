import { blankSessionCookie, invalidateSession, readSessionIdFromHeader } from "@/src/server/auth/accounts";
import { assertSameOrigin } from "@/src/server/http/origin";
import { toErrorResponse } from "@/src/server/http/respond";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

/** POST → 204; ends the session named by the cookie (if any) and clears the cookie. */
export async function POST(request: Request): Promise<Response> {
  try {
    assertSameOrigin(request);
    const sessionId = readSessionIdFromHeader(request.headers.get("cookie"));
    if (sessionId) await invalidateSession(sessionId);
    return new Response(null, { status: 204, headers: { "Set-Cookie": blankSessionCookie().serialize() } });
  } catch (err) {
    return toErrorResponse(err);
  }
}
