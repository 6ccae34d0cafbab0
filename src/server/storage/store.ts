/**
 * The app's one OriginalStore, chosen from the environment (STORAGE_BACKEND) on first use: the
 * local folder by default, the bucket for `s3` (the SDK is loaded only then).
 * No `server-only`: the boot sweep and scripts use it too.
 */
import { getEnv, type StorageConfig } from "../env";
import { createLocalStore } from "./local-store";
import type { OriginalStore } from "./original-store";

let current: Promise<OriginalStore> | null = null;

export async function createStore(storage: StorageConfig, uploadDir: string): Promise<OriginalStore> {
  if (storage.backend === "local") return createLocalStore(uploadDir);
  const { createS3Store } = await import("./s3-store");
  return createS3Store(storage);
}

export function getOriginalStore(): Promise<OriginalStore> {
  if (!current) {
    const env = getEnv();
    current = createStore(env.storage, env.uploadDir);
    current.catch(() => {
      current = null;
    });
  }
  return current;
}

/** Closes the store's connections (the next use opens a new one). */
export async function closeOriginalStore(): Promise<void> {
  const store = current;
  current = null;
  if (store) await (await store).close();
}
