/**
 * Checks an AWS Signature Version 4 `Authorization` header (header-signed requests only, as the
 * SDK sends them), following the published SigV4 signing steps: canonical request, string to
 * sign, HMAC-SHA256 key chain. The payload hash is taken from x-amz-content-sha256; the server
 * compares a hex hash with the body separately.
 */
import { createHash, createHmac, timingSafeEqual } from "node:crypto";
import type { IncomingHttpHeaders } from "node:http";

export interface SigV4Result {
  ok: boolean;
  code?: "AccessDenied" | "InvalidAccessKeyId" | "SignatureDoesNotMatch";
  message?: string;
}

const AUTH_RE = /^AWS4-HMAC-SHA256 Credential=([^/]+)\/(\d{8})\/([^/]+)\/([^/]+)\/aws4_request,\s*SignedHeaders=([a-z0-9;-]+),\s*Signature=([0-9a-f]{64})$/;

/** RFC 3986 unreserved characters stay; everything else is %XX (upper case), as SigV4 asks. */
function uriEncode(text: string): string {
  return encodeURIComponent(text).replace(/[!'()*]/g, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`);
}

function canonicalQuery(rawQuery: string): string {
  if (!rawQuery) return "";
  const pairs = rawQuery
    .split("&")
    .filter(Boolean)
    .map((part) => {
      const eq = part.indexOf("=");
      const k = decodeURIComponent((eq < 0 ? part : part.slice(0, eq)).replace(/\+/g, "%20"));
      const v = eq < 0 ? "" : decodeURIComponent(part.slice(eq + 1).replace(/\+/g, "%20"));
      return [uriEncode(k), uriEncode(v)] as const;
    });
  pairs.sort((a, b) => (a[0] < b[0] ? -1 : a[0] > b[0] ? 1 : a[1] < b[1] ? -1 : a[1] > b[1] ? 1 : 0));
  return pairs.map(([k, v]) => `${k}=${v}`).join("&");
}

const hmac = (key: Buffer | string, data: string) => createHmac("sha256", key).update(data, "utf8").digest();

export function verifySigV4(opts: {
  method: string;
  rawUrl: string;
  headers: IncomingHttpHeaders;
  accessKeyId: string;
  secretAccessKey: string;
}): SigV4Result {
  const auth = opts.headers.authorization;
  if (!auth) return { ok: false, code: "AccessDenied", message: "Anonymous access is not allowed" };
  const m = AUTH_RE.exec(auth);
  if (!m) return { ok: false, code: "AccessDenied", message: "Unsupported Authorization header" };
  const [, accessKeyId, date, region, service, signedHeaders, signature] = m;
  if (accessKeyId !== opts.accessKeyId) return { ok: false, code: "InvalidAccessKeyId", message: "The access key id does not exist" };
  const amzDate = String(opts.headers["x-amz-date"] ?? "");
  const payloadHash = String(opts.headers["x-amz-content-sha256"] ?? "");
  const q = opts.rawUrl.indexOf("?");
  const path = q < 0 ? opts.rawUrl : opts.rawUrl.slice(0, q);
  const query = q < 0 ? "" : opts.rawUrl.slice(q + 1);
  const names = signedHeaders.split(";");
  const headerLines = names.map((n) => {
    const v = opts.headers[n];
    const value = Array.isArray(v) ? v.join(",") : (v ?? "");
    return `${n}:${value.trim().replace(/\s+/g, " ")}\n`;
  });
  const canonicalRequest = [opts.method, path, canonicalQuery(query), headerLines.join(""), signedHeaders, payloadHash].join("\n");
  const scope = `${date}/${region}/${service}/aws4_request`;
  const stringToSign = ["AWS4-HMAC-SHA256", amzDate, scope, createHash("sha256").update(canonicalRequest, "utf8").digest("hex")].join("\n");
  const key = hmac(hmac(hmac(hmac(`AWS4${opts.secretAccessKey}`, date), region), service), "aws4_request");
  const expected = createHmac("sha256", key).update(stringToSign, "utf8").digest();
  const given = Buffer.from(signature, "hex");
  if (given.length !== expected.length || !timingSafeEqual(given, expected)) {
    return { ok: false, code: "SignatureDoesNotMatch", message: "The request signature we calculated does not match the signature you provided" };
  }
  return { ok: true };
}
