import "server-only";
/**
 * Reads for pages: "not on this survey" becomes the 404 page, "on it without the right role"
 * becomes a result the page renders as a plain refusal. Everything else goes to error.tsx.
 */
import { notFound, unstable_rethrow } from "next/navigation";
import { ForbiddenError, NotFoundError } from "@/src/server/errors";

export type Guarded<T> = { ok: true; value: T } | { ok: false; message: string };

export async function guardedRead<T>(read: Promise<T>): Promise<Guarded<T>> {
  try {
    return { ok: true, value: await read };
  } catch (err) {
    unstable_rethrow(err);
    if (err instanceof NotFoundError) notFound();
    if (err instanceof ForbiddenError) return { ok: false, message: err.message };
    throw err;
  }
}
