import "server-only";
/**
 * Session helpers for pages, server actions and route handlers inside Next's request context
 * (they use next/headers cookies). Everything else goes through the cookie-free ./accounts.ts.
 */
import { cookies, headers } from "next/headers";
import { redirect } from "next/navigation";
import { cache } from "react";
import type { Cookie } from "lucia";
import type { Actor } from "./actor";
import { authenticateInput, blankSessionCookie, checkSession, createSession, invalidateSession, invalidateUserSessions, sessionCookie } from "./accounts";
import { SESSION_COOKIE_NAME } from "./lucia";
import { REQUEST_PATH_HEADER } from "./request-path";
import { clientAddress } from "./throttle";
import { safeNextPath } from "@/src/lib/safe-next-path";

export type { Actor } from "./actor";

async function writeCookie(cookie: Cookie): Promise<void> {
  const store = await cookies();
  try {
    store.set(cookie.name, cookie.value, { ...cookie.attributes, httpOnly: true });
  } catch {
    // Server Components may not set cookies; the next action or route handler will.
  }
}

/** The signed-in actor, or null. Deduplicated per request. */
export const getActor = cache(async (): Promise<Actor | null> => {
  const store = await cookies();
  const sessionId = store.get(SESSION_COOKIE_NAME)?.value;
  if (!sessionId) return null;
  const check = await checkSession(sessionId);
  if (!check) {
    await writeCookie(blankSessionCookie());
    return null;
  }
  if (check.fresh) await writeCookie(sessionCookie(check.sessionId));
  return check.actor;
});

/**
 * The signed-in actor; otherwise redirects to /sign-in (with ?next=<nextPath> when given,
 * e.g. requireActor(`/surveys/${surveyId}`)). Only local paths are passed on.
 */
export async function requireActor(nextPath?: string): Promise<Actor> {
  const actor = await getActor();
  if (actor) return actor;
  // Without an explicit path (e.g. from a layout), return to the URL the proxy saw.
  const wanted = nextPath ?? (await headers()).get(REQUEST_PATH_HEADER);
  const safeNext = safeNextPath(wanted, "") || null;
  redirect(safeNext ? `/sign-in?next=${encodeURIComponent(safeNext)}` : "/sign-in");
}

/** Checks {email, password} (ValidationError "E-mail or password is wrong." on mismatch) and sets the cookie. */
export async function signInWithPassword(input: unknown): Promise<Actor> {
  const actor = await authenticateInput(input, clientAddress(await headers()));
  await startSessionFor(actor.userId);
  return actor;
}

/** New session id on every sign-in (a session id planted before sign-in is ended, never promoted). */
export async function startSessionFor(userId: string): Promise<void> {
  const previous = (await cookies()).get(SESSION_COOKIE_NAME)?.value;
  if (previous) await invalidateSession(previous);
  const session = await createSession(userId);
  await writeCookie(sessionCookie(session.id));
}

export async function signOut(): Promise<void> {
  const store = await cookies();
  const sessionId = store.get(SESSION_COOKIE_NAME)?.value;
  if (sessionId) await invalidateSession(sessionId);
  await writeCookie(blankSessionCookie());
}

/** Ends every session of the signed-in user (all browsers and devices), this one included. API tokens stay until revoked. */
export async function signOutEverywhere(): Promise<void> {
  const actor = await getActor();
  if (actor) await invalidateUserSessions(actor.userId);
  await writeCookie(blankSessionCookie());
}
