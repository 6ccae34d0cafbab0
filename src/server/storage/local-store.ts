/**
 * Originals in a local folder, UPLOAD_DIR/originals/<key>: the staged file (already fsync'd when
 * it was written) is renamed into place and the folder fsync'd, so a committed original survives
 * a crash. No `server-only`: used by scripts too.
 */
import fs from "node:fs";
import path from "node:path";
import type { Readable } from "node:stream";
import { fsyncDir, originalsDir, STORAGE_KEY_RE } from "./layout";
import { assertStorageKey, type OriginalStore, type StoredOriginal } from "./original-store";

export function createLocalStore(uploadDir: string): OriginalStore {
  const dir = originalsDir(uploadDir);
  const fileOf = (key: string) => {
    assertStorageKey(key);
    return path.join(dir, key);
  };
  return {
    backend: "local",
    location: dir,
    async commit(staged, key) {
      const target = fileOf(key);
      fs.mkdirSync(dir, { recursive: true });
      fs.renameSync(staged.tempPath, target); // atomic within one filesystem (tmp/ sits beside originals/)
      fsyncDir(dir);
    },
    async open(key): Promise<Readable | null> {
      let handle: fs.promises.FileHandle;
      try {
        handle = await fs.promises.open(fileOf(key), "r");
      } catch (err) {
        if ((err as NodeJS.ErrnoException).code === "ENOENT") return null;
        throw err;
      }
      return handle.createReadStream({ highWaterMark: 1024 * 1024 });
    },
    async exists(key) {
      return fs.existsSync(fileOf(key));
    },
    async remove(key) {
      fs.rmSync(fileOf(key), { force: true });
    },
    async list(): Promise<StoredOriginal[]> {
      if (!fs.existsSync(dir)) return [];
      const out: StoredOriginal[] = [];
      for (const name of fs.readdirSync(dir).sort()) {
        if (!STORAGE_KEY_RE.test(name)) continue;
        try {
          const st = fs.statSync(path.join(dir, name));
          if (st.isFile()) out.push({ key: name, sizeBytes: st.size, lastModifiedMs: st.mtimeMs });
        } catch {
          /* removed meanwhile */
        }
      }
      return out;
    },
    async close() {},
  };
}
