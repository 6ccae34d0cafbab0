/**
 * STORAGE_BACKEND and the S3_* variables (src/server/env.ts): local by default; s3 with a bucket
 * and a region; a one-line error naming what is missing or malformed.
 */
import { afterEach, describe, expect, it, vi } from "vitest";

const S3_VARS = ["STORAGE_BACKEND", "S3_ENDPOINT", "S3_REGION", "S3_BUCKET", "S3_ACCESS_KEY_ID", "S3_SECRET_ACCESS_KEY", "S3_FORCE_PATH_STYLE", "S3_PREFIX"];
const saved = Object.fromEntries(S3_VARS.map((k) => [k, process.env[k]]));

afterEach(() => {
  for (const k of S3_VARS) {
    if (saved[k] === undefined) delete process.env[k];
    else process.env[k] = saved[k];
  }
});

/** A fresh env module (getEnv caches) read with exactly these storage variables. */
async function envWith(vars: Record<string, string>) {
  for (const k of S3_VARS) delete process.env[k];
  Object.assign(process.env, vars);
  vi.resetModules();
  const { getEnv } = await import("@/src/server/env");
  return () => getEnv();
}

const FULL = { STORAGE_BACKEND: "s3", S3_BUCKET: "survey-originals", S3_REGION: "eu-west-2" };

describe("storage configuration", () => {
  it("is the local folder when nothing is set", async () => {
    expect((await envWith({}))().storage).toEqual({ backend: "local" });
  });

  it("s3 with bucket and region: AWS endpoint, virtual-hosted style, default credential chain", async () => {
    expect((await envWith(FULL))().storage).toEqual({
      backend: "s3", bucket: "survey-originals", region: "eu-west-2", endpoint: undefined, forcePathStyle: false, prefix: "", credentials: undefined,
    });
  });

  it("s3 with a custom endpoint: path style unless told otherwise; prefix gets its slash; keys as a pair", async () => {
    const storage = (await envWith({ ...FULL, S3_ENDPOINT: "http://127.0.0.1:9000", S3_PREFIX: "fieldtide/prod", S3_ACCESS_KEY_ID: "AK", S3_SECRET_ACCESS_KEY: "SK" }))().storage;
    expect(storage).toMatchObject({ endpoint: "http://127.0.0.1:9000", forcePathStyle: true, prefix: "fieldtide/prod/", credentials: { accessKeyId: "AK", secretAccessKey: "SK" } });
    expect((await envWith({ ...FULL, S3_ENDPOINT: "https://objects.example", S3_FORCE_PATH_STYLE: "false" }))().storage).toMatchObject({ forcePathStyle: false });
  });

  it("names what is missing, in one line", async () => {
    const missingBoth = await envWith({ STORAGE_BACKEND: "s3" });
    expect(missingBoth).toThrow("Invalid environment: STORAGE_BACKEND=s3 needs S3_BUCKET and S3_REGION");
    expect(await envWith({ STORAGE_BACKEND: "s3", S3_BUCKET: "survey-originals" })).toThrow("Invalid environment: STORAGE_BACKEND=s3 needs S3_REGION");
    expect(await envWith({ ...FULL, S3_ACCESS_KEY_ID: "AK" })).toThrow(/set S3_ACCESS_KEY_ID and S3_SECRET_ACCESS_KEY together/);
    expect(missingBoth).toThrow(/^[^\n]+$/); // one line
  });

  it("refuses malformed values", async () => {
    expect(await envWith({ STORAGE_BACKEND: "bucket" })).toThrow(/STORAGE_BACKEND/);
    expect(await envWith({ ...FULL, S3_BUCKET: "Survey_Originals" })).toThrow(/S3_BUCKET: expected an S3 bucket name/);
    expect(await envWith({ ...FULL, S3_ENDPOINT: "ftp://files.example" })).toThrow(/S3_ENDPOINT/);
    expect(await envWith({ ...FULL, S3_PREFIX: "../escape" })).toThrow(/S3_PREFIX/);
    expect(await envWith({ ...FULL, S3_PREFIX: "/rooted" })).toThrow(/S3_PREFIX/);
    expect(await envWith({ ...FULL, S3_FORCE_PATH_STYLE: "yes" })).toThrow(/S3_FORCE_PATH_STYLE/);
  });

  it("with the local backend an incomplete S3 set does not matter (a malformed value is still refused)", async () => {
    expect((await envWith({ S3_BUCKET: "survey-originals" }))().storage).toEqual({ backend: "local" });
    expect(await envWith({ S3_BUCKET: "Survey_Originals" })).toThrow(/S3_BUCKET/);
  });
});
