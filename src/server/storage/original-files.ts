import "server-only";
/**
 * Original log files, kept verbatim. An upload is first written to a temp file under UPLOAD_DIR/tmp
 * (hashed with SHA-256 and counted as it streams, fsync'd), and handed to the OriginalStore (the
 * local folder UPLOAD_DIR/originals, or a bucket: see store.ts) under a generated key only when
 * the import that owns it commits; on failure the temp file is removed.
 * File names from uploads never reach a filesystem path or an object key: keys are generated here.
 */
import { createHash, randomUUID } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { pipeline } from "node:stream/promises";
import { Transform, type Readable } from "node:stream";
import { getEnv } from "../env";
import { FileTooLargeError } from "./errors";
import { originalsDir as originalsIn, STORAGE_KEY_RE, tempDir as tempIn } from "./layout";
import { getOriginalStore } from "./store";

import { MAX_UPLOAD_BYTES } from "./limits";

export { MAX_UPLOAD_BYTES } from "./limits";
/** Bytes kept from the start of a file for sniffing (binary check, header line). */
const HEAD_BYTES = 64 * 1024;

export interface StagedFile {
  tempPath: string;
  sha256: string;
  sizeBytes: number;
  /** First bytes of the file (up to 64 KiB). */
  head: Buffer;
  /** A NUL byte anywhere, or many control characters at the start: not a text log. */
  looksBinary: boolean;
  /** The bytes are valid UTF-8 (else they are read as Windows-1252). */
  utf8: boolean;
}

function uploadRoot(): string {
  return getEnv().uploadDir;
}

function tempDir(): string {
  return tempIn(uploadRoot());
}

function originalsDir(): string {
  return originalsIn(uploadRoot());
}

/** Path of a stored original with the local backend; throws on a key this module did not make. */
export function storedPath(storageKey: string): string {
  if (!STORAGE_KEY_RE.test(storageKey)) throw new Error("invalid storage key");
  return path.join(originalsDir(), storageKey);
}

export function newStorageKey(): string {
  return randomUUID();
}

function controlCharShare(head: Buffer): number {
  if (head.length === 0) return 0;
  let bad = 0;
  for (const b of head) {
    if (b < 0x20 && b !== 0x09 && b !== 0x0a && b !== 0x0d && b !== 0x0c) bad++;
  }
  return bad / head.length;
}

/**
 * Streams `source` to a temp file while hashing and counting. Throws FileTooLargeError (and
 * removes the temp file) as soon as more than `maxBytes` arrive; removes it on any other error.
 */
export async function stageUpload(source: Readable | AsyncIterable<Uint8Array>, opts: { maxBytes?: number } = {}): Promise<StagedFile> {
  const maxBytes = opts.maxBytes ?? MAX_UPLOAD_BYTES;
  fs.mkdirSync(tempDir(), { recursive: true });
  const tempPath = path.join(tempDir(), `${randomUUID()}.part`);
  const hash = createHash("sha256");
  const headParts: Buffer[] = [];
  let headLength = 0;
  let sizeBytes = 0;
  let sawNul = false;
  const utf8Check = new TextDecoder("utf-8", { fatal: true });
  let utf8 = true;
  const meter = new Transform({
    transform(chunk: Buffer, _enc, done) {
      sizeBytes += chunk.length;
      if (sizeBytes > maxBytes) {
        done(new FileTooLargeError(maxBytes));
        return;
      }
      hash.update(chunk);
      if (!sawNul && chunk.indexOf(0) >= 0) sawNul = true;
      if (utf8) {
        try {
          utf8Check.decode(chunk, { stream: true });
        } catch {
          utf8 = false;
        }
      }
      if (headLength < HEAD_BYTES) {
        const part = chunk.subarray(0, HEAD_BYTES - headLength);
        headParts.push(Buffer.from(part));
        headLength += part.length;
      }
      done(null, chunk);
    },
  });
  try {
    // flush: the descriptor is fsync'd before it is closed, so the bytes are on disk when this resolves
    await pipeline(source as Readable, meter, fs.createWriteStream(tempPath, { flags: "wx", flush: true }));
  } catch (err) {
    fs.rmSync(tempPath, { force: true });
    throw err;
  }
  if (utf8) {
    try {
      utf8Check.decode();
    } catch {
      utf8 = false;
    }
  }
  const head = Buffer.concat(headParts);
  return {
    tempPath,
    sha256: hash.digest("hex"),
    sizeBytes,
    head,
    looksBinary: sawNul || controlCharShare(head) > 0.01,
    utf8,
  };
}

/** Hands a staged file to the store under `storageKey` (local: atomic rename; S3: upload). */
export async function commitStaged(staged: StagedFile, storageKey: string): Promise<void> {
  await (await getOriginalStore()).commit(staged, storageKey);
}

/** Removes a staged temp file (no error when it is already gone). */
export function discardStaged(staged: StagedFile | null | undefined): void {
  if (staged) fs.rmSync(staged.tempPath, { force: true });
}

/** Removes a stored original (used when the database commit fails after the file was stored). */
export async function removeStored(storageKey: string): Promise<void> {
  await (await getOriginalStore()).remove(storageKey);
}

export async function storedExists(storageKey: string): Promise<boolean> {
  return (await getOriginalStore()).exists(storageKey);
}

/** A read stream of a stored original, or null when it is missing from storage. */
export async function openStored(storageKey: string): Promise<Readable | null> {
  return (await getOriginalStore()).open(storageKey);
}

/** A read stream of a staged (not yet committed) file, in large chunks. */
export function openStaged(staged: StagedFile): fs.ReadStream {
  return fs.createReadStream(staged.tempPath, { highWaterMark: 1024 * 1024 });
}

/** Staged temp files and stored originals' keys (tests check nothing is left over). */
export async function listStorage(): Promise<{ temp: string[]; originals: string[] }> {
  const temp = fs.existsSync(tempDir()) ? fs.readdirSync(tempDir()).sort() : [];
  const originals = (await (await getOriginalStore()).list()).map((o) => o.key);
  return { temp, originals };
}
