import "server-only";
/**
 * Personal API tokens for field laptops: created and revoked by their owner on the profile page,
 * shown once, stored only as SHA-256. A token acts as its owner, with the owner's survey roles.
 */
import { randomBytes, randomUUID } from "node:crypto";
import "@/src/lib/zod-jitless";
import { z } from "zod";
import type { Actor } from "../auth/actor";
import { actorFromRow, type UserRow } from "../auth/actor";
import { getDb } from "../db/client";
import { NotFoundError, ValidationError, parseInput } from "../errors";
import { nowIso } from "../time";
import { hashToken } from "../tokens";

/** Tokens start with this, so a leaked one is easy to recognise in a log or a script. */
export const API_TOKEN_PREFIX = "ftk_";
const MAX_ACTIVE_TOKENS = 20;

export interface ApiToken {
  id: string;
  name: string;
  /** First characters of the token, to tell tokens apart. */
  prefix: string;
  createdAt: string;
  lastUsedAt: string | null;
  revokedAt: string | null;
}

type TokenRow = { id: string; user_id: string; name: string; token_hash: string; token_prefix: string; created_at: string; last_used_at: string | null; revoked_at: string | null };

export const ApiTokenInputSchema = z.object({
  name: z.string().trim().min(1, "Name the token, e.g. the laptop it is for.").max(80, "At most 80 characters."),
});

function toToken(r: TokenRow): ApiToken {
  return { id: r.id, name: r.name, prefix: r.token_prefix, createdAt: r.created_at, lastUsedAt: r.last_used_at, revokedAt: r.revoked_at };
}

/** The actor's own tokens, newest first (revoked ones too, marked). */
export async function listApiTokens(actor: Actor): Promise<ApiToken[]> {
  const rows = await getDb()<TokenRow>("api_tokens").where({ user_id: actor.userId }).orderBy("created_at", "desc");
  return rows.map(toToken);
}

/** Creates a token; the plain token is returned only here, never again. */
export async function createApiToken(actor: Actor, input: unknown): Promise<{ token: string; apiToken: ApiToken }> {
  const { name } = parseInput(ApiTokenInputSchema, input);
  const db = getDb();
  const active = await db("api_tokens").where({ user_id: actor.userId }).whereNull("revoked_at").count<{ n: number }[]>({ n: "*" });
  if (Number(active[0].n) >= MAX_ACTIVE_TOKENS) {
    throw new ValidationError({}, `You have ${MAX_ACTIVE_TOKENS} active tokens: revoke one before creating another.`);
  }
  const token = API_TOKEN_PREFIX + randomBytes(32).toString("base64url");
  const row: TokenRow = {
    id: randomUUID(),
    user_id: actor.userId,
    name,
    token_hash: hashToken(token),
    token_prefix: token.slice(0, API_TOKEN_PREFIX.length + 6),
    created_at: nowIso(),
    last_used_at: null,
    revoked_at: null,
  };
  await db("api_tokens").insert(row);
  return { token, apiToken: toToken(row) };
}

/** Revokes one of the actor's own tokens (NotFoundError for anyone else's). */
export async function revokeApiToken(actor: Actor, tokenId: string): Promise<void> {
  const db = getDb();
  const row = await db<TokenRow>("api_tokens").where({ id: String(tokenId), user_id: actor.userId }).first();
  if (!row) throw new NotFoundError("Token not found.");
  if (!row.revoked_at) await db("api_tokens").where({ id: row.id }).update({ revoked_at: nowIso() });
}

/** The owner of an active token, or null. Records when the token was last used. */
export async function actorForApiToken(token: string): Promise<Actor | null> {
  if (!token.startsWith(API_TOKEN_PREFIX) || token.length > 200) return null;
  const db = getDb();
  const row = await db("api_tokens")
    .join("users", "users.id", "api_tokens.user_id")
    .where({ "api_tokens.token_hash": hashToken(token) })
    .whereNull("api_tokens.revoked_at")
    .first<{ token_id: string } & Pick<UserRow, "id" | "email" | "name" | "is_admin">>("api_tokens.id as token_id", "users.id", "users.email", "users.name", "users.is_admin");
  if (!row) return null;
  await db("api_tokens").where({ id: row.token_id }).update({ last_used_at: nowIso() });
  return actorFromRow(row);
}
