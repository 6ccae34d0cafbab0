/**
 * Storage chores at boot (instrumentation.ts), for either backend:
 * - staged uploads (UPLOAD_DIR/tmp/*.part) older than the boot: left by a process that died mid-upload;
 * - stored originals without a field_logs row, last written more than ORPHAN_MIN_AGE_MS before the
 *   boot: left by a process that died between storing the file and committing its row.
 * A sweep that fails (database not migrated yet, bucket unreachable) is reported and skipped:
 * it must not keep the app from starting.
 * No `server-only`: instrumentation.ts runs outside the React server bundle.
 */
import { getDb } from "../db/client";
import { getEnv } from "../env";
import { sweepStagedUploads } from "./layout";
import { sweepOrphanOriginals } from "./orphan-sweep";
import { getOriginalStore } from "./store";

/** An import stores its original moments before COMMIT; an hour covers a slow 200 MiB upload to a bucket many times over. */
export const ORPHAN_MIN_AGE_MS = 60 * 60 * 1000;

export async function sweepStorageAtBoot(bootMs: number, log: (line: string) => void = console.log): Promise<void> {
  const staged = sweepStagedUploads(getEnv().uploadDir, bootMs);
  if (staged > 0) log(`storage: removed ${staged} staged upload(s) left by an interrupted import`);
  try {
    const db = getDb();
    if (!(await db.schema.hasTable("field_logs"))) return;
    const store = await getOriginalStore();
    const { removed } = await sweepOrphanOriginals(store, db, { olderThanMs: bootMs - ORPHAN_MIN_AGE_MS });
    if (removed.length > 0) log(`storage: removed ${removed.length} original(s) in ${store.location} that no log refers to (an import died before its commit)`);
  } catch (err) {
    log(`storage: orphan sweep skipped (${err instanceof Error ? err.message : String(err)})`);
  }
}
