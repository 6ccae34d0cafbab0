/**
 * Password hashing: argon2id (the @node-rs/argon2 default: m=19456 KiB, t=2, p=1).
 * No `server-only` import: the seed script (tsx) hashes demo passwords with it.
 */
import { hash, verify } from "@node-rs/argon2";

export { MIN_PASSWORD_LENGTH } from "./schema";

export async function hashPassword(password: string): Promise<string> {
  return hash(password);
}

export async function verifyPassword(passwordHash: string, password: string): Promise<boolean> {
  try {
    return await verify(passwordHash, password);
  } catch {
    return false; // malformed stored hash: treat as a mismatch
  }
}
