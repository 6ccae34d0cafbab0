import { authenticateThrottled, createSession, invalidateSession, readSessionIdFromHeader, sessionCookie, WRONG_CREDENTIALS } from "@/src/server/auth/accounts";
import { SignInSchema } from "@/src/server/auth/schema";
import { clientAddress } from "@/src/server/auth/throttle";
import { UnauthenticatedError, parseInput } from "@/src/server/errors";
import { assertSameOrigin } from "@/src/server/http/origin";
import { json, readJsonBody, toErrorResponse } from "@/src/server/http/respond";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

/** POST {email, password} → 200 {user} + session cookie; 400 field errors; 401 wrong credentials; 429 too many failures. */
export async function POST(request: Request): Promise<Response> {
  try {
    assertSameOrigin(request);
    const { email, password } = parseInput(SignInSchema, await readJsonBody(request));
    const actor = await authenticateThrottled(email, password, clientAddress(request.headers));
    if (!actor) throw new UnauthenticatedError(WRONG_CREDENTIALS);
    const previous = readSessionIdFromHeader(request.headers.get("cookie"));
    if (previous) await invalidateSession(previous); // a new session id on every sign-in
    const session = await createSession(actor.userId);
    const user = { id: actor.userId, email: actor.email, name: actor.name, isAdmin: actor.isAdmin };
    return json({ user }, { headers: { "Set-Cookie": sessionCookie(session.id).serialize() } });
  } catch (err) {
    return toErrorResponse(err);
  }
}
