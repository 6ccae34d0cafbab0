/**
 * One interface for where committed original log files live: a local folder (the default) or an
 * S3-compatible bucket. Staging (hash, sniff, parse) always happens on local disk first; a store
 * only receives whole, already-checked files under generated keys (STORAGE_KEY_RE).
 *
 * No `server-only` import: the backup script and the demo (tsx, outside Next) use it too.
 */
import type { Readable } from "node:stream";
import { STORAGE_KEY_RE } from "./layout";

export interface StoredOriginal {
  key: string;
  sizeBytes: number;
  /** When the object was written (file mtime; S3 LastModified, for multipart the upload's start). */
  lastModifiedMs: number;
}

export interface OriginalStore {
  readonly backend: "local" | "s3";
  /** Where the originals are, for messages (a folder, or `s3://bucket/prefix`). */
  readonly location: string;
  /**
   * Puts a staged file under `key`; resolves once it is durable. The local store moves the file
   * (so the staged path is gone afterwards); the S3 store uploads a copy. The caller removes
   * whatever is left at the staged path either way.
   */
  commit(staged: { tempPath: string; sizeBytes: number }, key: string): Promise<void>;
  /** A read stream of the stored bytes, or null when there is no such original. */
  open(key: string): Promise<Readable | null>;
  exists(key: string): Promise<boolean>;
  /** Removes an original; no error when it is already gone. */
  remove(key: string): Promise<void>;
  /** Every stored original (keys that are not generated storage keys are ignored). */
  list(): Promise<StoredOriginal[]>;
  /** Releases sockets (S3); a no-op for the local folder. */
  close(): Promise<void>;
}

/** Throws on a key this app did not generate: file names from uploads never reach a path or an object key. */
export function assertStorageKey(key: string): void {
  if (!STORAGE_KEY_RE.test(key)) throw new Error("invalid storage key");
}
