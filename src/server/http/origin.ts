import "server-only";
/**
 * Cross-site check for state-changing JSON handlers: when an Origin header is present it must be
 * APP_URL's origin or the origin of the host the request was sent to.
 */
import { getEnv } from "../env";
import { ForbiddenError } from "../errors";

export function assertSameOrigin(request: Request): void {
  const origin = request.headers.get("origin");
  if (origin === null) return; // non-browser clients (scripts) send none
  let originUrl: URL;
  try {
    originUrl = new URL(origin);
  } catch {
    throw new ForbiddenError("Cross-site request refused.");
  }
  if (originUrl.origin === getEnv().appOrigin) return;
  const host = request.headers.get("host") ?? new URL(request.url).host;
  if (originUrl.host === host) return;
  throw new ForbiddenError("Cross-site request refused.");
}
