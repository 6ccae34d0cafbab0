/**
 * The loopback fake S3 server for a test file: started on an OS-chosen port with one bucket,
 * stopped after the file. `s3Env` gives the app's variables for it.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll } from "vitest";
import { startFakeS3Server, type FakeS3Server } from "@/src/server/storage/fake-s3/server";
import type { S3StorageConfig } from "@/src/server/env";

export const TEST_BUCKET = "fieldtide-test";
export const TEST_CREDENTIALS = { accessKeyId: "FIELDTIDETESTKEY", secretAccessKey: "fieldtide-test-secret-not-real" };

export async function startTestS3(): Promise<{ server: FakeS3Server; dir: string; config: S3StorageConfig; env: Record<string, string> }> {
  process.env.AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED ??= "true"; // the SDK's notice about Node 20, once per process
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "fieldtide-fake-s3-"));
  const server = await startFakeS3Server({ dir, buckets: [TEST_BUCKET], credentials: TEST_CREDENTIALS });
  afterAll(async () => {
    await server.close();
    fs.rmSync(dir, { recursive: true, force: true });
  });
  const config: S3StorageConfig = {
    bucket: TEST_BUCKET,
    region: "eu-west-2",
    endpoint: server.endpoint,
    forcePathStyle: true,
    prefix: "test-prefix/",
    credentials: TEST_CREDENTIALS,
  };
  const env = {
    STORAGE_BACKEND: "s3",
    S3_ENDPOINT: server.endpoint,
    S3_REGION: config.region,
    S3_BUCKET: TEST_BUCKET,
    S3_ACCESS_KEY_ID: TEST_CREDENTIALS.accessKeyId,
    S3_SECRET_ACCESS_KEY: TEST_CREDENTIALS.secretAccessKey,
    S3_PREFIX: "test-prefix",
  };
  return { server, dir, config, env };
}

/** Deterministic bytes (every byte value occurs; no repeating 4 KiB pattern). */
export function testBytes(sizeBytes: number, seed = 1): Buffer {
  const b = Buffer.alloc(sizeBytes);
  let x = seed >>> 0 || 1;
  for (let i = 0; i < sizeBytes; i++) {
    x ^= x << 13;
    x ^= x >>> 17;
    x ^= x << 5;
    b[i] = x & 0xff;
  }
  return b;
}
