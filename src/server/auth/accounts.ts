import "server-only";
/**
 * Cookie-free authentication: credentials, sessions. session.ts wraps these with Next's cookies;
 * route handlers and tests use them directly.
 */
import type { Cookie } from "lucia";
import { getDb } from "../db/client";
import { ValidationError, parseInput } from "../errors";
import { actorFromRow, type Actor, type UserRow } from "./actor";
import { luciaCookies, withLucia } from "./lucia";
import { hashPassword, verifyPassword } from "./password";
import { SignInSchema } from "./schema";
import { assertSignInAllowed, clearSignInFailures, recordSignInFailure, signInKey } from "./throttle";

export { hashPassword, verifyPassword } from "./password";

export const WRONG_CREDENTIALS = "E-mail or password is wrong.";

let dummyHash: Promise<string> | null = null;

/** Actor for matching e-mail and password, else null. Unknown e-mails cost one hash check too. */
export async function authenticate(email: string, password: string): Promise<Actor | null> {
  const row = await getDb()<UserRow>("users").where({ email: email.trim().toLowerCase() }).first();
  if (!row) {
    dummyHash ??= hashPassword("not-a-real-password-for-timing");
    await verifyPassword(await dummyHash, password);
    return null;
  }
  return (await verifyPassword(row.password_hash, password)) ? actorFromRow(row) : null;
}

/**
 * authenticate behind the failed sign-in throttle (per account and per client address):
 * TooManySignInsError (429) before any password check while either is at its limit.
 */
export async function authenticateThrottled(email: string, password: string, address: string): Promise<Actor | null> {
  const key = signInKey(email, address);
  await assertSignInAllowed(key);
  const actor = await authenticate(email, password);
  await (actor ? clearSignInFailures(key) : recordSignInFailure(key));
  return actor;
}

/** Validates {email, password} (throttled); ValidationError with WRONG_CREDENTIALS as form error when they do not match. */
export async function authenticateInput(input: unknown, address = "unknown"): Promise<Actor> {
  const { email, password } = parseInput(SignInSchema, input);
  const actor = await authenticateThrottled(email, password, address);
  if (!actor) throw new ValidationError({}, WRONG_CREDENTIALS);
  return actor;
}

/** New session for the user; expired sessions of everyone are swept at the same time. */
export async function createSession(userId: string): Promise<{ id: string; expiresAt: Date }> {
  const session = await withLucia(async (lucia) => {
    await lucia.deleteExpiredSessions();
    return lucia.createSession(userId, {});
  });
  return { id: session.id, expiresAt: session.expiresAt };
}

export type SessionCheck = { actor: Actor; sessionId: string; expiresAt: Date; fresh: boolean };

/** Full result of a session check; `fresh` means the expiry was just extended (re-send the cookie). */
export async function checkSession(sessionId: string): Promise<SessionCheck | null> {
  if (!sessionId) return null;
  const { session, user } = await withLucia((lucia) => lucia.validateSession(sessionId));
  if (!session) return null;
  return {
    actor: { userId: user.id, email: user.email, name: user.name, isAdmin: user.isAdmin },
    sessionId: session.id,
    expiresAt: session.expiresAt,
    fresh: session.fresh,
  };
}

export async function validateSessionId(sessionId: string): Promise<Actor | null> {
  return (await checkSession(sessionId))?.actor ?? null;
}

export async function invalidateSession(sessionId: string): Promise<void> {
  await withLucia((lucia) => lucia.invalidateSession(sessionId));
}

export async function invalidateUserSessions(userId: string): Promise<void> {
  await withLucia((lucia) => lucia.invalidateUserSessions(userId));
}

export function sessionCookie(sessionId: string): Cookie {
  return luciaCookies().createSessionCookie(sessionId);
}

export function blankSessionCookie(): Cookie {
  return luciaCookies().createBlankSessionCookie();
}

/** Session id from a Cookie request header, or null. */
export function readSessionIdFromHeader(cookieHeader: string | null): string | null {
  return cookieHeader ? luciaCookies().readSessionCookie(cookieHeader) : null;
}
