/**
 * At boot (instrumentation.ts): an invalid or incomplete environment (e.g. STORAGE_BACKEND=s3
 * without S3_BUCKET) stops the server with one line, instead of a 500 on every request.
 * No `server-only`: instrumentation.ts runs outside the React server bundle.
 */
import { getEnv } from "./env";

export function exitOnInvalidEnv(): void {
  try {
    getEnv();
  } catch (err) {
    console.error(`fieldtide: ${err instanceof Error ? err.message : String(err)}`);
    process.exit(1);
  }
}
