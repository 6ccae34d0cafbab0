import "server-only";
/**
 * Who is calling an API route: `Authorization: Bearer <token>` (field laptops) or the browser's
 * session cookie. Cookie calls that change state must come from our own origin.
 */
import type { Actor } from "../auth/actor";
import { readSessionIdFromHeader, validateSessionId } from "../auth/accounts";
import { UnauthenticatedError } from "../errors";
import { assertSameOrigin } from "../http/origin";
import { actorForApiToken } from "./service";

export async function actorFromRequest(request: Request, opts: { changesState?: boolean } = {}): Promise<Actor> {
  const authorization = request.headers.get("authorization");
  if (authorization !== null) {
    const match = /^Bearer\s+(\S+)\s*$/i.exec(authorization);
    const actor = match ? await actorForApiToken(match[1]) : null;
    if (!actor) throw new UnauthenticatedError("The API token is unknown or revoked. Create a new one on your profile page.");
    return actor;
  }
  const sessionId = readSessionIdFromHeader(request.headers.get("cookie"));
  const actor = sessionId ? await validateSessionId(sessionId) : null;
  if (!actor) throw new UnauthenticatedError("Sign in, or send an API token as `Authorization: Bearer …`.");
  if (opts.changesState) assertSameOrigin(request);
  return actor;
}
