/** Personal API tokens: shown once, stored as SHA-256 only, revocable by their owner alone. */
import { createHash } from "node:crypto";
import { describe, expect, it } from "vitest";
import { setupTestDatabase } from "../../support/test-db";

setupTestDatabase();

const tokens = await import("@/src/server/api-tokens/service");
const { getDb } = await import("@/src/server/db/client");
const { makeUser } = await import("../../support/fixtures");
const { NotFoundError, ValidationError } = await import("@/src/server/errors");

describe("API tokens", () => {
  it("are returned once in plain text and stored only as their SHA-256", async () => {
    const user = await makeUser();
    const { token, apiToken } = await tokens.createApiToken(user, { name: "  Truck laptop " });
    expect(token.startsWith(tokens.API_TOKEN_PREFIX)).toBe(true);
    expect(token.length).toBeGreaterThan(40);
    expect(apiToken.name).toBe("Truck laptop");
    const row = await getDb()("api_tokens").where({ id: apiToken.id }).first();
    expect(row.token_hash).toBe(createHash("sha256").update(token).digest("hex"));
    expect(JSON.stringify(row)).not.toContain(token);
    expect(JSON.stringify(await tokens.listApiTokens(user))).not.toContain(token);
    expect(await tokens.actorForApiToken(token)).toMatchObject({ userId: user.userId });
    expect((await getDb()("api_tokens").where({ id: apiToken.id }).first()).last_used_at).not.toBeNull();
  });

  it("stop working when revoked; only the owner may revoke", async () => {
    const owner = await makeUser();
    const other = await makeUser();
    const { token, apiToken } = await tokens.createApiToken(owner, { name: "x" });
    await expect(tokens.revokeApiToken(other, apiToken.id)).rejects.toBeInstanceOf(NotFoundError);
    expect(await tokens.actorForApiToken(token)).not.toBeNull();
    await tokens.revokeApiToken(owner, apiToken.id);
    expect(await tokens.actorForApiToken(token)).toBeNull();
    expect((await tokens.listApiTokens(owner))[0].revokedAt).not.toBeNull();
  });

  it("need a name; unknown or malformed tokens give no actor", async () => {
    const user = await makeUser();
    await expect(tokens.createApiToken(user, { name: " " })).rejects.toBeInstanceOf(ValidationError);
    expect(await tokens.actorForApiToken("ftk_not-a-real-token")).toBeNull();
    expect(await tokens.actorForApiToken("Basic abc")).toBeNull();
  });
});
