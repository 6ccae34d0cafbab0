import "server-only";
/**
 * Sliding-window throttle of failed sign-ins, per account and per client address, kept in SQLite
 * (table sign_in_failures) so it holds across restarts and for every caller of the app.
 * A sign-in is refused before any password check while either count over the last
 * WINDOW_MS is at its limit; a successful sign-in clears the account's failures.
 */
import { getDb } from "../db/client";
import { AppError } from "../errors";

/** Window and limits: common practice for interactive sign-in (a handful per account, more per address behind shared NAT). */
export const WINDOW_MS = 15 * 60_000;
export const MAX_FAILURES_PER_ACCOUNT = 5;
export const MAX_FAILURES_PER_ADDRESS = 20;

/** 429: too many failed sign-ins; the message says when to try again. */
export class TooManySignInsError extends AppError {
  readonly retryAfterS: number;
  constructor(retryAfterMs: number) {
    const minutes = Math.max(1, Math.ceil(retryAfterMs / 60_000));
    super("too_many_sign_ins", 429, `Too many failed sign-ins; try again in ${minutes} ${minutes === 1 ? "minute" : "minutes"}.`);
    this.retryAfterS = Math.max(1, Math.ceil(retryAfterMs / 1000));
  }
}

export type SignInKey = { account: string; address: string };

export function signInKey(email: string, address: string): SignInKey {
  return { account: email.trim().toLowerCase(), address: address || "unknown" };
}

/**
 * The client address: the last X-Forwarded-For hop (the one our own front proxy, or Next's
 * server when there is none in front, vouches for), else "unknown".
 */
export function clientAddress(headers: Headers): string {
  const hops = (headers.get("x-forwarded-for") ?? "").split(",").map((s) => s.trim()).filter(Boolean);
  return hops.at(-1) ?? headers.get("x-real-ip")?.trim() ?? "unknown";
}

/** Ms until the count of failures in the window drops below `limit`, or 0 when under it. */
async function waitFor(column: "account" | "address", value: string, limit: number, nowMs: number): Promise<number> {
  const times = await getDb()("sign_in_failures")
    .where(column, value)
    .andWhere("failed_at_ms", ">", nowMs - WINDOW_MS)
    .orderBy("failed_at_ms", "desc")
    .limit(limit)
    .pluck("failed_at_ms");
  if (times.length < limit) return 0;
  // The limit-th newest failure leaves the window first among those that keep the count at the limit.
  return Number(times[limit - 1]) + WINDOW_MS - nowMs;
}

/** TooManySignInsError when the account or the address is at its limit. */
export async function assertSignInAllowed(key: SignInKey, nowMs = Date.now()): Promise<void> {
  const wait = Math.max(
    await waitFor("account", key.account, MAX_FAILURES_PER_ACCOUNT, nowMs),
    await waitFor("address", key.address, MAX_FAILURES_PER_ADDRESS, nowMs),
  );
  if (wait > 0) throw new TooManySignInsError(wait);
}

export async function recordSignInFailure(key: SignInKey, nowMs = Date.now()): Promise<void> {
  const db = getDb();
  await db("sign_in_failures").insert({ account: key.account, address: key.address, failed_at_ms: nowMs });
  await db("sign_in_failures").where("failed_at_ms", "<=", nowMs - WINDOW_MS).delete();
}

export async function clearSignInFailures(key: SignInKey): Promise<void> {
  await getDb()("sign_in_failures").where({ account: key.account }).delete();
}
