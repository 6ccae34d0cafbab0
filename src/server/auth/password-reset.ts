import "server-only";
/**
 * Password reset by e-mail link `${APP_URL}/reset-password/${token}`, valid 1 hour, single use.
 * The answer to a request is the same whether or not the address has an account.
 */
import { randomUUID } from "node:crypto";
import type { Knex } from "knex";
import { recordAudit } from "../audit/record";
import { getDb } from "../db/client";
import { getEnv } from "../env";
import { InvalidTokenError, parseInput } from "../errors";
import { sendMail } from "../mail/mailer";
import { HOUR_MS, isoAfterMs, nowIso } from "../time";
import { hashToken, newLinkToken } from "../tokens";
import { hashPassword } from "./password";
import { PasswordResetRequestSchema, PasswordResetSchema } from "./schema";

export const PASSWORD_RESET_TTL_MS = 1 * HOUR_MS;

type ResetRow = { id: string; user_id: string; token_hash: string; expires_at: string; used_at: string | null };

/**
 * Mails a reset link when the address has an account. Resolves the same way either way; a mail
 * failure is logged server-side only (telling the caller would reveal that the account exists),
 * and then no reset row is kept.
 */
export async function requestPasswordReset(input: unknown): Promise<void> {
  const { email } = parseInput(PasswordResetRequestSchema, input);
  const db = getDb();
  const user = await db("users").select("id", "name").where({ email }).first();
  if (!user) return;
  const { token, tokenHash } = newLinkToken();
  try {
    await sendMail({
      to: email,
      subject: "Reset your Fieldtide password",
      text: [
        `Hello ${user.name},`,
        "",
        "Someone asked to reset the password of your Fieldtide account. To choose a new one, open this link within an hour:",
        `${getEnv().appUrl}/reset-password/${token}`,
        "",
        "If it was not you, ignore this message; your password stays as it is.",
      ].join("\n"),
    });
  } catch (err) {
    console.error("password reset mail not sent:", err instanceof Error ? err.message : String(err));
    return;
  }
  await db.transaction(async (trx) => {
    // Only the newest link works.
    await trx("password_resets").where({ user_id: user.id }).whereNull("used_at").update({ used_at: nowIso() });
    await trx("password_resets").insert({ id: randomUUID(), user_id: user.id, token_hash: tokenHash, expires_at: isoAfterMs(PASSWORD_RESET_TTL_MS), used_at: null, created_at: nowIso() });
  });
}

async function loadUsableReset(db: Knex | Knex.Transaction, token: string): Promise<ResetRow> {
  const row = typeof token === "string" && token.length > 0 && token.length <= 200
    ? await db<ResetRow>("password_resets").where({ token_hash: hashToken(token) }).first()
    : undefined;
  if (!row) throw new InvalidTokenError("unknown", "This reset link is not valid. Check that you copied all of it.");
  if (row.used_at) throw new InvalidTokenError("used", "This reset link has already been used or replaced by a newer one. Ask for a new link.");
  if (row.expires_at <= nowIso()) throw new InvalidTokenError("expired", "This reset link has expired. Ask for a new link.");
  return row;
}

/** For the reset page: which account the link is for (InvalidTokenError when it cannot be used). */
export async function getPasswordReset(token: string): Promise<{ email: string; expiresAt: string }> {
  const db = getDb();
  const row = await loadUsableReset(db, token);
  const user = await db("users").select("email").where({ id: row.user_id }).first();
  return { email: user.email, expiresAt: row.expires_at };
}

/** Sets the new password, spends the link and ends every session of the account. */
export async function resetPassword(token: string, input: unknown): Promise<{ userId: string }> {
  const db = getDb();
  const row = await loadUsableReset(db, token);
  const { password } = parseInput(PasswordResetSchema, input);
  const passwordHash = await hashPassword(password);
  await db.transaction(async (trx) => {
    const now = nowIso();
    const spent = await trx("password_resets").where({ id: row.id }).whereNull("used_at").where("expires_at", ">", now).update({ used_at: now });
    if (spent === 0) throw new InvalidTokenError("used", "This reset link has already been used. Ask for a new link.");
    await trx("users").where({ id: row.user_id }).update({ password_hash: passwordHash, updated_at: now });
    // Through the transaction, not lucia (see lucia.ts): all sessions of the account end.
    await trx("sessions").where({ user_id: row.user_id }).delete();
    await recordAudit(trx, { surveyId: null, actorUserId: row.user_id, action: "password.reset" });
  });
  return { userId: row.user_id };
}
