/**
 * A small fake of the S3 API on loopback for tests and the demo, so the app's real SDK path runs
 * end to end without a cloud account. Path-style only (http://127.0.0.1:<port>/<bucket>/<key>).
 * It does what the app uses: PutObject, GetObject, HeadObject, DeleteObject, multipart uploads
 * (create, upload part, complete, abort), ListObjectsV2, plus CreateBucket/HeadBucket.
 * Requests must carry a valid SigV4 Authorization header for the configured key pair; bodies in
 * the SDK's aws-chunked encoding are decoded, and CRC32 / SHA-1 / SHA-256 checksums sent with
 * them are verified (a mismatch is refused as BadDigest, as S3 does). Objects are files under
 * `dir`, one JSON sidecar each. Not a general S3 server: no versioning, ACLs, ranges or listings
 * by delimiter.
 *
 * No `server-only`: `npm run demo` (tsx) starts it too.
 */
import { createHash, randomUUID } from "node:crypto";
import fs from "node:fs";
import http from "node:http";
import type { AddressInfo } from "node:net";
import path from "node:path";
import { Transform, type Readable } from "node:stream";
import { pipeline } from "node:stream/promises";
import zlib from "node:zlib";
import { AwsChunkedDecoder } from "./aws-chunked";
import { verifySigV4 } from "./sigv4";

export interface FakeS3Options {
  /** Folder that holds the buckets; created if missing. */
  dir: string;
  host?: string;
  /** 0 (default) lets the OS choose. */
  port?: number;
  /** Buckets created at start (others can be made with CreateBucket). */
  buckets?: string[];
  /** The one key pair accepted. */
  credentials: { accessKeyId: string; secretAccessKey: string };
}

export interface FakeS3Server {
  endpoint: string;
  port: number;
  /** Operation names in the order served ("PutObject", "UploadPart", ...), for tests. */
  readonly operations: string[];
  /** How many request bodies came aws-chunked (the SDK's default for streamed bodies). */
  readonly stats: { awsChunkedBodies: number; checksumsVerified: number };
  close(): Promise<void>;
}

interface ObjectMeta {
  key: string;
  sizeBytes: number;
  etag: string;
  lastModifiedMs: number;
  contentType: string;
  /** Base64 CRC32 of the whole object (single PUT only), returned when the client asks for checksums. */
  crc32?: string;
}

class S3Error extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
  ) {
    super(message);
  }
}

const BUCKET_RE = /^[a-z0-9][a-z0-9.-]{1,61}[a-z0-9]$/;
const MAX_LIST_KEYS = 1000;

const xmlEscape = (s: string) => s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");
const xmlUnescape = (s: string) => s.replace(/&quot;/g, '"').replace(/&lt;/g, "<").replace(/&gt;/g, ">").replace(/&amp;/g, "&");
const XML_HEAD = '<?xml version="1.0" encoding="UTF-8"?>\n';
const NS = 'xmlns="http://s3.amazonaws.com/doc/2006-03-01/"';

function crc32Base64(crc: number): string {
  const b = Buffer.alloc(4);
  b.writeUInt32BE(crc >>> 0);
  return b.toString("base64");
}

/** Counts, hashes (MD5 for the ETag, CRC32, SHA-1, SHA-256) and passes the decoded bytes through. */
class Meter extends Transform {
  sizeBytes = 0;
  crc = 0;
  readonly md5 = createHash("md5");
  readonly sha1 = createHash("sha1");
  readonly sha256 = createHash("sha256");
  override _transform(chunk: Buffer, _enc: BufferEncoding, done: (err?: Error | null, data?: Buffer) => void): void {
    this.sizeBytes += chunk.length;
    this.crc = zlib.crc32(chunk, this.crc);
    this.md5.update(chunk);
    this.sha1.update(chunk);
    this.sha256.update(chunk);
    done(null, chunk);
  }
}

export async function startFakeS3Server(opts: FakeS3Options): Promise<FakeS3Server> {
  const root = path.resolve(opts.dir);
  fs.mkdirSync(root, { recursive: true });
  for (const b of opts.buckets ?? []) fs.mkdirSync(path.join(root, b, "objects"), { recursive: true });
  const operations: string[] = [];
  const stats = { awsChunkedBodies: 0, checksumsVerified: 0 };

  const bucketDir = (bucket: string, mustExist = true) => {
    if (!BUCKET_RE.test(bucket)) throw new S3Error(400, "InvalidBucketName", "The specified bucket is not valid.");
    const dir = path.join(root, bucket);
    if (mustExist && !fs.existsSync(dir)) throw new S3Error(404, "NoSuchBucket", "The specified bucket does not exist");
    return dir;
  };
  const objectFile = (bucket: string, key: string) => path.join(bucketDir(bucket), "objects", createHash("sha256").update(key).digest("hex"));
  const readMeta = (bucket: string, key: string): ObjectMeta | null => {
    try {
      return JSON.parse(fs.readFileSync(objectFile(bucket, key) + ".json", "utf8")) as ObjectMeta;
    } catch {
      return null;
    }
  };
  const uploadDir = (bucket: string, uploadId: string) => {
    if (!/^[0-9a-f-]{36}$/.test(uploadId)) throw new S3Error(404, "NoSuchUpload", "The specified upload does not exist.");
    const dir = path.join(bucketDir(bucket), "uploads", uploadId);
    if (!fs.existsSync(dir)) throw new S3Error(404, "NoSuchUpload", "The specified upload does not exist.");
    return dir;
  };

  /** Writes the request body (decoded) to `file` via a temp name; verifies lengths and checksums. */
  async function receiveBody(req: http.IncomingMessage, bucket: string, file: string): Promise<Meter> {
    const temp = path.join(bucketDir(bucket), `.incoming-${randomUUID()}`);
    const encoding = String(req.headers["content-encoding"] ?? "");
    const payloadHash = String(req.headers["x-amz-content-sha256"] ?? "");
    const chunked = encoding.split(",").some((e) => e.trim() === "aws-chunked") || payloadHash.startsWith("STREAMING-");
    const meter = new Meter();
    const decoder = chunked ? new AwsChunkedDecoder() : null;
    if (chunked) stats.awsChunkedBodies++;
    try {
      const stages: (Readable | Transform | fs.WriteStream)[] = [req];
      if (decoder) stages.push(decoder);
      stages.push(meter, fs.createWriteStream(temp, { flags: "wx" }));
      await (pipeline as (...s: unknown[]) => Promise<void>)(...stages);
      if (decoder) {
        const declared = req.headers["x-amz-decoded-content-length"];
        if (declared !== undefined && Number(declared) !== meter.sizeBytes) {
          throw new S3Error(400, "IncompleteBody", `x-amz-decoded-content-length says ${declared} bytes, the body held ${meter.sizeBytes}`);
        }
      } else if (/^[0-9a-f]{64}$/.test(payloadHash) && meter.sha256.copy().digest("hex") !== payloadHash) {
        throw new S3Error(400, "XAmzContentSHA256Mismatch", "The provided 'x-amz-content-sha256' header does not match what was computed.");
      }
      const given = (name: string) => decoder?.trailers.get(name) ?? (req.headers[name] as string | undefined);
      const checks: [string, () => string][] = [
        ["x-amz-checksum-crc32", () => crc32Base64(meter.crc)],
        ["x-amz-checksum-sha1", () => meter.sha1.copy().digest("base64")],
        ["x-amz-checksum-sha256", () => meter.sha256.copy().digest("base64")],
      ];
      for (const [name, actual] of checks) {
        const value = given(name);
        if (value === undefined) continue;
        if (value !== actual()) throw new S3Error(400, "BadDigest", `The ${name.slice(15).toUpperCase()} you specified did not match the calculated checksum.`);
        stats.checksumsVerified++;
      }
      fs.renameSync(temp, file);
      return meter;
    } finally {
      fs.rmSync(temp, { force: true });
    }
  }

  function sendXml(res: http.ServerResponse, status: number, body: string, headers: Record<string, string> = {}) {
    const buf = Buffer.from(XML_HEAD + body, "utf8");
    res.writeHead(status, { "Content-Type": "application/xml", "Content-Length": String(buf.length), ...headers });
    res.end(buf);
  }

  function objectHeaders(meta: ObjectMeta, req: http.IncomingMessage): Record<string, string> {
    const h: Record<string, string> = {
      "Content-Type": meta.contentType,
      "Content-Length": String(meta.sizeBytes),
      ETag: meta.etag,
      "Last-Modified": new Date(meta.lastModifiedMs).toUTCString(),
      "Accept-Ranges": "bytes",
    };
    if (meta.crc32 && String(req.headers["x-amz-checksum-mode"] ?? "").toUpperCase() === "ENABLED") h["x-amz-checksum-crc32"] = meta.crc32;
    return h;
  }

  async function route(req: http.IncomingMessage, res: http.ServerResponse): Promise<void> {
    const rawUrl = req.url ?? "/";
    const url = new URL(rawUrl, "http://fake-s3.invalid");
    const q = url.searchParams;
    const slash = url.pathname.indexOf("/", 1);
    const bucket = decodeURIComponent(slash < 0 ? url.pathname.slice(1) : url.pathname.slice(1, slash));
    const key = slash < 0 ? "" : decodeURIComponent(url.pathname.slice(slash + 1));
    const method = req.method ?? "GET";

    const auth = verifySigV4({ method, rawUrl, headers: req.headers, ...opts.credentials });
    if (!auth.ok) throw new S3Error(403, auth.code!, auth.message!);
    if (!bucket) throw new S3Error(400, "InvalidRequest", "Path-style requests only: /<bucket>/<key>");

    if (!key) {
      if (method === "PUT") {
        operations.push("CreateBucket");
        fs.mkdirSync(path.join(bucketDir(bucket, false), "objects"), { recursive: true });
        res.writeHead(200, { Location: `/${bucket}`, "Content-Length": "0" }).end();
        return;
      }
      if (method === "HEAD") {
        operations.push("HeadBucket");
        bucketDir(bucket);
        res.writeHead(200, { "Content-Length": "0" }).end();
        return;
      }
      if (method === "GET" && q.get("list-type") === "2") return listObjectsV2(res, bucket, q);
      throw new S3Error(501, "NotImplemented", `${method} on a bucket is not implemented by the fake store`);
    }

    if (method === "POST" && q.has("uploads")) {
      operations.push("CreateMultipartUpload");
      const uploadId = randomUUID();
      const dir = path.join(bucketDir(bucket), "uploads", uploadId);
      fs.mkdirSync(dir, { recursive: true });
      // S3 dates a multipart object by the upload's start
      fs.writeFileSync(path.join(dir, "upload.json"), JSON.stringify({ key, startedMs: Date.now(), contentType: req.headers["content-type"] ?? "application/octet-stream" }));
      req.resume();
      return sendXml(res, 200, `<InitiateMultipartUploadResult ${NS}><Bucket>${xmlEscape(bucket)}</Bucket><Key>${xmlEscape(key)}</Key><UploadId>${uploadId}</UploadId></InitiateMultipartUploadResult>`);
    }
    if (method === "PUT" && q.has("uploadId")) {
      operations.push("UploadPart");
      const dir = uploadDir(bucket, q.get("uploadId")!);
      const partNumber = Number(q.get("partNumber"));
      if (!Number.isInteger(partNumber) || partNumber < 1 || partNumber > 10_000) throw new S3Error(400, "InvalidArgument", "Part number must be an integer between 1 and 10000, inclusive");
      const meter = await receiveBody(req, bucket, path.join(dir, String(partNumber)));
      const etag = `"${meter.md5.digest("hex")}"`;
      fs.writeFileSync(path.join(dir, `${partNumber}.json`), JSON.stringify({ etag, sizeBytes: meter.sizeBytes }));
      res.writeHead(200, { ETag: etag, "x-amz-checksum-crc32": crc32Base64(meter.crc), "Content-Length": "0" }).end();
      return;
    }
    if (method === "POST" && q.has("uploadId")) return completeMultipart(req, res, bucket, key, q.get("uploadId")!);
    if (method === "DELETE" && q.has("uploadId")) {
      operations.push("AbortMultipartUpload");
      fs.rmSync(uploadDir(bucket, q.get("uploadId")!), { recursive: true, force: true });
      res.writeHead(204).end();
      return;
    }
    if (method === "PUT") {
      operations.push("PutObject");
      if (req.headers["x-amz-copy-source"]) throw new S3Error(501, "NotImplemented", "CopyObject is not implemented by the fake store");
      const file = objectFile(bucket, key);
      const meter = await receiveBody(req, bucket, file);
      const meta: ObjectMeta = {
        key,
        sizeBytes: meter.sizeBytes,
        etag: `"${meter.md5.digest("hex")}"`,
        lastModifiedMs: Date.now(),
        contentType: String(req.headers["content-type"] ?? "application/octet-stream"),
        crc32: crc32Base64(meter.crc),
      };
      fs.writeFileSync(file + ".json", JSON.stringify(meta));
      res.writeHead(200, { ETag: meta.etag, "x-amz-checksum-crc32": meta.crc32!, "Content-Length": "0" }).end();
      return;
    }
    if (method === "GET" || method === "HEAD") {
      operations.push(method === "GET" ? "GetObject" : "HeadObject");
      const meta = readMeta(bucket, key);
      if (!meta) {
        if (method === "HEAD") {
          res.writeHead(404, { "Content-Length": "0" }).end();
          return;
        }
        throw new S3Error(404, "NoSuchKey", "The specified key does not exist.");
      }
      res.writeHead(200, objectHeaders(meta, req));
      if (method === "HEAD") {
        res.end();
        return;
      }
      await pipeline(fs.createReadStream(objectFile(bucket, key)), res);
      return;
    }
    if (method === "DELETE") {
      operations.push("DeleteObject");
      const file = objectFile(bucket, key);
      fs.rmSync(file + ".json", { force: true });
      fs.rmSync(file, { force: true });
      res.writeHead(204).end();
      return;
    }
    throw new S3Error(501, "NotImplemented", `${method} is not implemented by the fake store`);
  }

  async function completeMultipart(req: http.IncomingMessage, res: http.ServerResponse, bucket: string, key: string, uploadId: string) {
    operations.push("CompleteMultipartUpload");
    const dir = uploadDir(bucket, uploadId);
    const chunks: Buffer[] = [];
    for await (const c of req) chunks.push(c as Buffer);
    const xml = Buffer.concat(chunks).toString("utf8");
    const parts = [...xml.matchAll(/<Part>([\s\S]*?)<\/Part>/g)].map((m) => ({
      partNumber: Number(/<PartNumber>(\d+)<\/PartNumber>/.exec(m[1])?.[1]),
      etag: xmlUnescape(/<ETag>([\s\S]*?)<\/ETag>/.exec(m[1])?.[1] ?? ""),
    }));
    if (parts.length === 0) throw new S3Error(400, "MalformedXML", "The XML you provided was not well-formed or did not validate against our published schema.");
    const digests: Buffer[] = [];
    let previous = 0;
    for (const p of parts) {
      if (!(p.partNumber > previous)) throw new S3Error(400, "InvalidPartOrder", "The list of parts was not in ascending order.");
      previous = p.partNumber;
      let info: { etag: string };
      try {
        info = JSON.parse(fs.readFileSync(path.join(dir, `${p.partNumber}.json`), "utf8"));
      } catch {
        throw new S3Error(400, "InvalidPart", `Part ${p.partNumber} was not uploaded.`);
      }
      const unquoted = (etag: string) => etag.replace(/"/g, "");
      if (unquoted(info.etag) !== unquoted(p.etag)) throw new S3Error(400, "InvalidPart", `Part ${p.partNumber} has a different ETag.`);
      digests.push(Buffer.from(info.etag.replace(/"/g, ""), "hex"));
    }
    const upload = JSON.parse(fs.readFileSync(path.join(dir, "upload.json"), "utf8")) as { startedMs: number; contentType: string };
    const file = objectFile(bucket, key);
    const temp = path.join(bucketDir(bucket), `.assembling-${randomUUID()}`);
    let sizeBytes = 0;
    try {
      const out = fs.openSync(temp, "wx");
      try {
        for (const p of parts) {
          const data = fs.readFileSync(path.join(dir, String(p.partNumber)));
          fs.writeSync(out, data);
          sizeBytes += data.length;
        }
      } finally {
        fs.closeSync(out);
      }
      fs.renameSync(temp, file);
    } finally {
      fs.rmSync(temp, { force: true });
    }
    const etag = `"${createHash("md5").update(Buffer.concat(digests)).digest("hex")}-${parts.length}"`;
    const meta: ObjectMeta = { key, sizeBytes, etag, lastModifiedMs: upload.startedMs, contentType: upload.contentType };
    fs.writeFileSync(file + ".json", JSON.stringify(meta));
    fs.rmSync(dir, { recursive: true, force: true });
    sendXml(res, 200, `<CompleteMultipartUploadResult ${NS}><Bucket>${xmlEscape(bucket)}</Bucket><Key>${xmlEscape(key)}</Key><ETag>${xmlEscape(etag)}</ETag></CompleteMultipartUploadResult>`);
  }

  function listObjectsV2(res: http.ServerResponse, bucket: string, q: URLSearchParams) {
    operations.push("ListObjectsV2");
    const prefix = q.get("prefix") ?? "";
    const maxKeys = Math.min(MAX_LIST_KEYS, Math.max(0, Number(q.get("max-keys") ?? MAX_LIST_KEYS) || MAX_LIST_KEYS));
    const token = q.get("continuation-token");
    const after = token ? Buffer.from(token, "base64url").toString("utf8") : (q.get("start-after") ?? "");
    const objectsDir = path.join(bucketDir(bucket), "objects");
    const all = fs
      .readdirSync(objectsDir)
      .filter((n) => n.endsWith(".json"))
      .map((n) => JSON.parse(fs.readFileSync(path.join(objectsDir, n), "utf8")) as ObjectMeta)
      .filter((m) => m.key.startsWith(prefix) && m.key > after)
      .sort((a, b) => (a.key < b.key ? -1 : 1));
    const page = all.slice(0, maxKeys);
    const truncated = all.length > page.length;
    const contents = page
      .map((m) => `<Contents><Key>${xmlEscape(m.key)}</Key><LastModified>${new Date(m.lastModifiedMs).toISOString()}</LastModified><ETag>${xmlEscape(m.etag)}</ETag><Size>${m.sizeBytes}</Size><StorageClass>STANDARD</StorageClass></Contents>`)
      .join("");
    const next = truncated ? `<NextContinuationToken>${Buffer.from(page.at(-1)!.key).toString("base64url")}</NextContinuationToken>` : "";
    const echoed = token ? `<ContinuationToken>${xmlEscape(token)}</ContinuationToken>` : "";
    sendXml(
      res,
      200,
      `<ListBucketResult ${NS}><Name>${xmlEscape(bucket)}</Name><Prefix>${xmlEscape(prefix)}</Prefix><KeyCount>${page.length}</KeyCount><MaxKeys>${maxKeys}</MaxKeys><IsTruncated>${truncated}</IsTruncated>${echoed}${contents}${next}</ListBucketResult>`,
    );
  }

  const server = http.createServer((req, res) => {
    route(req, res).catch((err: unknown) => {
      const e = err instanceof S3Error ? err : new S3Error(500, "InternalError", err instanceof Error ? err.message : String(err));
      req.resume();
      if (res.headersSent) {
        res.destroy();
        return;
      }
      if (req.method === "HEAD") {
        res.writeHead(e.status, { "Content-Length": "0" }).end();
        return;
      }
      sendXml(res, e.status, `<Error><Code>${e.code}</Code><Message>${xmlEscape(e.message)}</Message><RequestId>${randomUUID()}</RequestId></Error>`);
    });
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(opts.port ?? 0, opts.host ?? "127.0.0.1", () => resolve());
  });
  const { port } = server.address() as AddressInfo;
  return {
    endpoint: `http://${opts.host ?? "127.0.0.1"}:${port}`,
    port,
    operations,
    stats,
    close: () =>
      new Promise<void>((resolve) => {
        server.closeAllConnections();
        server.close(() => resolve());
      }),
  };
}
