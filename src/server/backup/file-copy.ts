/** File chores shared by backup and restore: hash, copy-then-hash, fsync, atomic folder moves. */
import { createHash } from "node:crypto";
import fs from "node:fs";
import { pipeline } from "node:stream/promises";

/** SHA-256 hex of a file's bytes, streamed. */
export async function sha256File(file: string): Promise<string> {
  const hash = createHash("sha256");
  await pipeline(fs.createReadStream(file, { highWaterMark: 1024 * 1024 }), hash);
  return hash.digest("hex");
}

/** Copies `from` to a new file `to` (never overwrites), fsyncs it, and returns the SHA-256 and size of what was written. */
export async function copyAndHash(from: string, to: string): Promise<{ sha256: string; sizeBytes: number }> {
  fs.copyFileSync(from, to, fs.constants.COPYFILE_EXCL);
  fsyncFile(to);
  return { sha256: await sha256File(to), sizeBytes: fs.statSync(to).size };
}

export function fsyncFile(file: string): void {
  const fd = fs.openSync(file, "r+");
  try {
    fs.fsyncSync(fd);
  } finally {
    fs.closeSync(fd);
  }
}

export { fsyncDir } from "../storage/layout";
