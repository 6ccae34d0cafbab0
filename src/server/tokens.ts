/** Link tokens: 32 random bytes, base64url in the link; only the SHA-256 hex is stored. */
import { createHash, randomBytes } from "node:crypto";

export function newLinkToken(): { token: string; tokenHash: string } {
  const token = randomBytes(32).toString("base64url");
  return { token, tokenHash: hashToken(token) };
}

export function hashToken(token: string): string {
  return createHash("sha256").update(token, "utf8").digest("hex");
}
