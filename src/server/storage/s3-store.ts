/**
 * Originals in an S3-compatible bucket through the AWS SDK v3, as objects `<prefix>originals/<key>`.
 * A commit streams the staged file with lib-storage's Upload: one PutObject below the part size,
 * a multipart upload (parts of PART_SIZE_BYTES, two in flight) above it, aborted on failure.
 * The SDK's default request checksums (CRC32, sent as aws-chunked trailers) are kept, and the
 * stored size is checked with HeadObject before the commit counts as done.
 * No `server-only`: used by scripts too.
 */
import fs from "node:fs";
import type { Readable } from "node:stream";
import { DeleteObjectCommand, GetObjectCommand, HeadObjectCommand, paginateListObjectsV2, S3Client, S3ServiceException } from "@aws-sdk/client-s3";
import { Upload } from "@aws-sdk/lib-storage";
import type { S3StorageConfig } from "../env";
import { s3OriginalsLocation, s3OriginalsPrefix, STORAGE_KEY_RE } from "./layout";
import { assertStorageKey, type OriginalStore, type StoredOriginal } from "./original-store";

/** 8 MiB parts: S3's minimum is 5 MiB; a 200 MiB original is 25 parts. */
export const PART_SIZE_BYTES = 8 * 1024 * 1024;
const PARTS_IN_FLIGHT = 2;

function isNotFound(err: unknown): boolean {
  if (err instanceof S3ServiceException && err.$metadata?.httpStatusCode === 404) return true;
  const name = (err as { name?: string } | null)?.name;
  return name === "NoSuchKey" || name === "NotFound";
}

export function createS3Store(config: S3StorageConfig): OriginalStore {
  const client = new S3Client({
    region: config.region,
    endpoint: config.endpoint,
    forcePathStyle: config.forcePathStyle,
    credentials: config.credentials,
  });
  const base = s3OriginalsPrefix(config.prefix);
  const objectKey = (key: string) => {
    assertStorageKey(key);
    return base + key;
  };
  const Bucket = config.bucket;
  return {
    backend: "s3",
    location: s3OriginalsLocation(config),
    async commit(staged, key) {
      const Key = objectKey(key);
      const upload = new Upload({
        client,
        params: { Bucket, Key, Body: fs.createReadStream(staged.tempPath, { highWaterMark: 1024 * 1024 }), ContentType: "application/octet-stream" },
        partSize: PART_SIZE_BYTES,
        queueSize: PARTS_IN_FLIGHT,
        leavePartsOnError: false,
      });
      await upload.done();
      const head = await client.send(new HeadObjectCommand({ Bucket, Key }));
      if (head.ContentLength !== staged.sizeBytes) {
        throw new Error(`the bucket holds ${head.ContentLength} bytes for an original of ${staged.sizeBytes} bytes`);
      }
    },
    async open(key): Promise<Readable | null> {
      try {
        const res = await client.send(new GetObjectCommand({ Bucket, Key: objectKey(key) }));
        return res.Body as Readable;
      } catch (err) {
        if (isNotFound(err)) return null;
        throw err;
      }
    },
    async exists(key) {
      try {
        await client.send(new HeadObjectCommand({ Bucket, Key: objectKey(key) }));
        return true;
      } catch (err) {
        if (isNotFound(err)) return false;
        throw err;
      }
    },
    async remove(key) {
      await client.send(new DeleteObjectCommand({ Bucket, Key: objectKey(key) }));
    },
    async list(): Promise<StoredOriginal[]> {
      const out: StoredOriginal[] = [];
      for await (const page of paginateListObjectsV2({ client }, { Bucket, Prefix: base })) {
        for (const o of page.Contents ?? []) {
          const key = o.Key?.slice(base.length) ?? "";
          if (!STORAGE_KEY_RE.test(key)) continue;
          out.push({ key, sizeBytes: o.Size ?? 0, lastModifiedMs: o.LastModified?.getTime() ?? 0 });
        }
      }
      return out.sort((a, b) => (a.key < b.key ? -1 : a.key > b.key ? 1 : 0));
    },
    async close() {
      client.destroy();
    },
  };
}
