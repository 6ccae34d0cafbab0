/**
 * The loopback fake S3 server itself, driven by the real AWS SDK: a streamed PutObject (sent by
 * the SDK in aws-chunked encoding with a CRC32 trailer) is stored as the decoded bytes, a wrong
 * checksum is refused, an unsigned request is refused, and listings page with continuation tokens.
 */
import { createHash } from "node:crypto";
import { Readable } from "node:stream";
import zlib from "node:zlib";
import { describe, expect, it } from "vitest";
import { GetObjectCommand, ListObjectsV2Command, PutObjectCommand, S3Client } from "@aws-sdk/client-s3";
import { AwsChunkedDecoder } from "@/src/server/storage/fake-s3/aws-chunked";
import { startTestS3, testBytes, TEST_BUCKET } from "./fake-s3-support";

const s3 = await startTestS3();
const client = new S3Client({ region: s3.config.region, endpoint: s3.server.endpoint, forcePathStyle: true, credentials: s3.config.credentials });
const sha = (b: Buffer) => createHash("sha256").update(b).digest("hex");

async function getBytes(Key: string): Promise<Buffer> {
  const res = await client.send(new GetObjectCommand({ Bucket: TEST_BUCKET, Key }));
  return Buffer.from(await res.Body!.transformToByteArray());
}

describe("fake S3 server", () => {
  it("a streamed PutObject arrives aws-chunked and is stored as the decoded bytes (CRC32 trailer verified)", async () => {
    const bytes = testBytes(300_000, 3);
    const chunkedBefore = s3.server.stats.awsChunkedBodies;
    const verifiedBefore = s3.server.stats.checksumsVerified;
    // a stream body of known length: the SDK's default flexible checksum goes in a trailer
    await client.send(new PutObjectCommand({ Bucket: TEST_BUCKET, Key: "streamed/one", Body: Readable.from([bytes.subarray(0, 100_000), bytes.subarray(100_000)]), ContentLength: bytes.length }));
    expect(s3.server.stats.awsChunkedBodies).toBe(chunkedBefore + 1);
    expect(s3.server.stats.checksumsVerified).toBe(verifiedBefore + 1);
    const back = await getBytes("streamed/one");
    expect(back.length).toBe(bytes.length); // not the framed length
    expect(sha(back)).toBe(sha(bytes));
  });

  it("a body whose CRC32 does not match is refused with BadDigest and not stored", async () => {
    const body = Buffer.from("time,field\n2026-05-04T09:00:00Z,48000.1\n");
    const good = Buffer.alloc(4);
    good.writeUInt32BE(zlib.crc32(body));
    const wrong = Buffer.from(good.map((b) => b ^ 0xff)).toString("base64");
    await expect(client.send(new PutObjectCommand({ Bucket: TEST_BUCKET, Key: "bad/digest", Body: body, ChecksumCRC32: wrong }))).rejects.toMatchObject({ name: "BadDigest" });
    await expect(getBytes("bad/digest")).rejects.toMatchObject({ name: "NoSuchKey" });
  });

  it("an unsigned request is refused (403)", async () => {
    const res = await fetch(`${s3.server.endpoint}/${TEST_BUCKET}/streamed/one`);
    expect(res.status).toBe(403);
    expect(await res.text()).toMatch(/<Code>AccessDenied<\/Code>/);
  });

  it("ListObjectsV2 pages by continuation token, in key order, within a prefix", async () => {
    const keys = ["list/c", "list/a", "list/b", "list/e", "list/d"];
    for (const Key of keys) await client.send(new PutObjectCommand({ Bucket: TEST_BUCKET, Key, Body: Key }));
    await client.send(new PutObjectCommand({ Bucket: TEST_BUCKET, Key: "other/z", Body: "z" }));
    const seen: string[] = [];
    let token: string | undefined;
    let pages = 0;
    do {
      const page = await client.send(new ListObjectsV2Command({ Bucket: TEST_BUCKET, Prefix: "list/", MaxKeys: 2, ContinuationToken: token }));
      seen.push(...(page.Contents ?? []).map((o) => o.Key!));
      token = page.IsTruncated ? page.NextContinuationToken : undefined;
      pages++;
    } while (token);
    expect(seen).toEqual([...keys].sort());
    expect(pages).toBe(3);
  });
});

describe("aws-chunked decoder", () => {
  async function decode(framed: string) {
    const d = new AwsChunkedDecoder();
    const out: Buffer[] = [];
    d.on("data", (c: Buffer) => out.push(c));
    const done = new Promise<void>((resolve, reject) => {
      d.on("end", resolve);
      d.on("error", reject);
    });
    // fed one byte at a time: framing split anywhere must still decode
    for (const ch of Buffer.from(framed, "latin1")) d.write(Buffer.from([ch]));
    d.end();
    await done;
    return { data: Buffer.concat(out).toString("latin1"), trailers: Object.fromEntries(d.trailers) };
  }

  it("decodes signed and unsigned chunk lines and collects trailers (framing built by hand)", async () => {
    const framed = "5;chunk-signature=" + "a".repeat(64) + "\r\nhello\r\n7\r\n, world\r\n0\r\nx-amz-checksum-crc32:AAAAAA==\r\n\r\n";
    expect(await decode(framed)).toEqual({ data: "hello, world", trailers: { "x-amz-checksum-crc32": "AAAAAA==" } });
  });

  it("refuses a body cut before its final chunk, and a chunk longer than declared", async () => {
    await expect(decode("5\r\nhello\r\n")).rejects.toThrow(/before its final chunk/);
    await expect(decode("3\r\nhello\r\n0\r\n\r\n")).rejects.toThrow(/not followed by CRLF/);
  });
});
