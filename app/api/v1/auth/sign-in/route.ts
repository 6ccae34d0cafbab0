import { authenticate, createSession, sessionCookie, WRONG_CREDENTIALS } from "@/src/server/auth/accounts";
import { SignInSchema } from "@/src/server/auth/schema";
import { UnauthenticatedError, parseInput } from "@/src/server/errors";
import { assertSameOrigin } from "@/src/server/http/origin";
import { json, readJsonBody, toErrorResponse } from "@/src/server/http/respond";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

/** POST {email, password} → 200 {user} + session cookie; 400 field errors; 401 wrong credentials. */
export async function POST(request: Request): Promise<Response> {
  try {
    assertSameOrigin(request);
    const { email, password } = parseInput(SignInSchema, await readJsonBody(request));
    const actor = await authenticate(email, password);
    if (!actor) throw new UnauthenticatedError(WRONG_CREDENTIALS);
    const session = await createSession(actor.userId);
    const user = { id: actor.userId, email: actor.email, name: actor.name, isAdmin: actor.isAdmin };
    return json({ user }, { headers: { "Set-Cookie": sessionCookie(session.id).serialize() } });
  } catch (err) {
    return toErrorResponse(err);
  }
}
