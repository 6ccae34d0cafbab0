/**
 * The OriginalStore contract, run against both backends: the local folder and an S3 bucket
 * (the real AWS SDK against the loopback fake S3 server). Same cases, same expectations.
 */
import { createHash, randomUUID } from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import type { Readable } from "node:stream";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createLocalStore } from "@/src/server/storage/local-store";
import { createS3Store, PART_SIZE_BYTES } from "@/src/server/storage/s3-store";
import { sweepOrphanOriginals } from "@/src/server/storage/orphan-sweep";
import type { OriginalStore } from "@/src/server/storage/original-store";
import { setupTestDatabase } from "../../support/test-db";
import { startTestS3, testBytes, TEST_CREDENTIALS } from "./fake-s3-support";

const testDb = setupTestDatabase();
const s3 = await startTestS3();
const { getDb } = await import("@/src/server/db/client");
const { makeSurvey } = await import("../../support/fixtures");

const sha = (b: Buffer) => createHash("sha256").update(b).digest("hex");
const scratch = fs.mkdtempSync(path.join(os.tmpdir(), "fieldtide-store-contract-"));
afterAll(() => fs.rmSync(scratch, { recursive: true, force: true }));

/** A staged file as stageUpload leaves it: a temp file of known bytes. */
function stage(bytes: Buffer) {
  const tempPath = path.join(scratch, `${randomUUID()}.part`);
  fs.writeFileSync(tempPath, bytes);
  return { tempPath, sizeBytes: bytes.length };
}

async function readAll(stream: Readable): Promise<Buffer> {
  const parts: Buffer[] = [];
  for await (const c of stream) parts.push(c as Buffer);
  return Buffer.concat(parts);
}

const backends: { name: string; make: () => OriginalStore }[] = [
  { name: "local folder", make: () => createLocalStore(path.join(testDb.dir, "uploads")) },
  { name: "S3 bucket (fake server, real SDK)", make: () => createS3Store(s3.config) },
];

describe.each(backends)("OriginalStore: $name", ({ make }) => {
  let store: OriginalStore;
  beforeAll(() => {
    store = make();
  });
  afterAll(() => store.close());

  it("commit then read back: identical bytes and SHA-256; exists and list agree", async () => {
    const bytes = testBytes(150_000, 7);
    const key = randomUUID();
    expect(await store.exists(key)).toBe(false);
    await store.commit(stage(bytes), key);
    expect(await store.exists(key)).toBe(true);
    const back = await readAll((await store.open(key))!);
    expect(back.length).toBe(bytes.length);
    expect(sha(back)).toBe(sha(bytes));
    const listed = (await store.list()).find((o) => o.key === key);
    expect(listed?.sizeBytes).toBe(bytes.length);
    expect(Math.abs(listed!.lastModifiedMs - Date.now())).toBeLessThan(60_000);
  });

  it("remove: gone from exists, open and list; removing again is no error", async () => {
    const key = randomUUID();
    await store.commit(stage(Buffer.from("time,field\n2026-05-04T09:00:00Z,48000.1\n")), key);
    await store.remove(key);
    expect(await store.exists(key)).toBe(false);
    expect(await store.open(key)).toBeNull();
    expect((await store.list()).map((o) => o.key)).not.toContain(key);
    await expect(store.remove(key)).resolves.toBeUndefined();
  });

  it("an empty file round-trips as zero bytes", async () => {
    const key = randomUUID();
    await store.commit(stage(Buffer.alloc(0)), key);
    expect((await readAll((await store.open(key))!)).length).toBe(0);
  });

  it("refuses keys it did not generate (a file name, a path) before any I/O", async () => {
    for (const bad of ["survey-day.csv", "../etc/passwd", "a/b", randomUUID().toUpperCase()]) {
      await expect(store.exists(bad)).rejects.toThrow(/invalid storage key/);
      await expect(store.open(bad)).rejects.toThrow(/invalid storage key/);
      await expect(store.remove(bad)).rejects.toThrow(/invalid storage key/);
      await expect(store.commit(stage(Buffer.from("x")), bad)).rejects.toThrow(/invalid storage key/);
    }
  });

  it(`a 21 MiB file (more than two ${PART_SIZE_BYTES / 2 ** 20} MiB parts) is stored whole`, async () => {
    const bytes = testBytes(21 * 1024 * 1024 + 12_345, 11);
    const key = randomUUID();
    const ops = s3.server.operations.length;
    await store.commit(stage(bytes), key);
    const back = await readAll((await store.open(key))!);
    expect(back.length).toBe(bytes.length);
    expect(sha(back)).toBe(sha(bytes));
    if (store.backend === "s3") {
      const served = s3.server.operations.slice(ops);
      // multipart: create, ceil(size / part size) = 3 parts, complete; never a single PutObject
      expect(served.filter((o) => o === "CreateMultipartUpload")).toHaveLength(1);
      expect(served.filter((o) => o === "UploadPart")).toHaveLength(Math.ceil(bytes.length / PART_SIZE_BYTES));
      expect(served.filter((o) => o === "CompleteMultipartUpload")).toHaveLength(1);
      expect(served).not.toContain("PutObject");
    }
    await store.remove(key);
  });

  it("orphan sweep: removes old originals no field_logs row names, keeps named ones and young ones", async () => {
    const surveyId = await makeSurvey();
    const named = randomUUID();
    const orphan = randomUUID();
    await store.commit(stage(Buffer.from("named\n")), named);
    await store.commit(stage(Buffer.from("orphan\n")), orphan);
    await getDb()("field_logs").insert({
      survey_id: surveyId, kind: "base", original_name: "named.csv", storage_key: named, sha256: sha(Buffer.from("named\n")), size_bytes: 6,
      sensor_type: "overhauser", time_basis: "utc", delimiter: ",", header: "[]", mapping: "{}", row_count: 0, reading_count: 0,
      rejected_count: 0, issue_count: 0, uploaded_at: new Date().toISOString(),
    });
    // cut-off before both were written: both are too young to touch
    const young = await sweepOrphanOriginals(store, getDb(), { olderThanMs: Date.now() - 60_000 });
    expect(young.removed).not.toContain(orphan);
    expect(await store.exists(orphan)).toBe(true);
    // cut-off after both: the orphan goes, the named one stays
    const swept = await sweepOrphanOriginals(store, getDb(), { olderThanMs: Date.now() + 1_000 });
    expect(swept.removed).toContain(orphan);
    expect(swept.removed).not.toContain(named);
    expect(await store.exists(orphan)).toBe(false);
    expect(await store.exists(named)).toBe(true);
    // everything still stored is named by a row
    const rows = new Set(await getDb()("field_logs").pluck("storage_key"));
    expect((await store.list()).every((o) => rows.has(o.key))).toBe(true);
  });
});

describe("S3 backend: refusals", () => {
  it("a wrong secret is refused by the store (SignatureDoesNotMatch) and nothing is stored", async () => {
    const wrong = createS3Store({ ...s3.config, credentials: { ...TEST_CREDENTIALS, secretAccessKey: "not-the-secret" } });
    const key = randomUUID();
    await expect(wrong.commit(stage(Buffer.from("x,y\n")), key)).rejects.toMatchObject({ name: "SignatureDoesNotMatch" });
    await wrong.close();
    const right = createS3Store(s3.config);
    expect(await right.exists(key)).toBe(false);
    await right.close();
  });

  it("a missing bucket is an error, not an empty store", async () => {
    const store = createS3Store({ ...s3.config, bucket: "no-such-bucket" });
    await expect(store.list()).rejects.toMatchObject({ name: "NoSuchBucket" });
    await store.close();
  });
});
