/**
 * Removes stored originals that no field_logs row names (field_logs.storage_key, see
 * migrations/0002_field_logs.ts). The import stores the file as the last step before its
 * transaction commits, so a process that dies between the two leaves an original without a
 * row; so can a failed removal after a failed commit. Only originals last written before
 * `olderThanMs` are considered, so an import still in flight elsewhere is never touched.
 * No `server-only`: run from instrumentation.ts at boot.
 */
import type { Knex } from "knex";
import type { OriginalStore } from "./original-store";

/** Keys per `WHERE storage_key IN (...)` (below SQLite's and PostgreSQL's parameter limits). */
const KEYS_PER_QUERY = 500;

export interface OrphanSweepResult {
  /** Stored originals old enough to be checked. */
  checked: number;
  /** Keys removed because no row names them. */
  removed: string[];
}

export async function sweepOrphanOriginals(store: OriginalStore, db: Knex, opts: { olderThanMs: number }): Promise<OrphanSweepResult> {
  const old = (await store.list()).filter((o) => o.lastModifiedMs < opts.olderThanMs).map((o) => o.key);
  const removed: string[] = [];
  for (let i = 0; i < old.length; i += KEYS_PER_QUERY) {
    const batch = old.slice(i, i + KEYS_PER_QUERY);
    const named = new Set<string>(await db("field_logs").whereIn("storage_key", batch).pluck("storage_key"));
    for (const key of batch) {
      if (named.has(key)) continue;
      await store.remove(key);
      removed.push(key);
    }
  }
  return { checked: old.length, removed };
}
