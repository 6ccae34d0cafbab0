/**
 * Small MIME reader for the fake SMTP mailbox: headers (RFC 5322 with RFC 2047 encoded words),
 * single-part and multipart bodies (RFC 2046), base64 / quoted-printable / 7bit / 8bit.
 * It reads what nodemailer sends (text, optional html alternative); anything else is still
 * kept raw. No `server-only`: loaded by the fake SMTP server started from instrumentation.ts.
 */
export type ParsedMail = {
  from: string;
  to: string;
  subject: string;
  messageId: string | null;
  text: string | null;
  html: string | null;
};

type Part = { headers: Map<string, string>; body: Buffer };

function splitHeaderBody(raw: Buffer): { head: string; body: Buffer } {
  const s = raw.toString("latin1");
  const m = /\r?\n\r?\n/.exec(s);
  if (!m) return { head: s, body: Buffer.alloc(0) };
  return { head: s.slice(0, m.index), body: raw.subarray(Buffer.byteLength(s.slice(0, m.index + m[0].length), "latin1")) };
}

function parseHeaders(head: string): Map<string, string> {
  const headers = new Map<string, string>();
  const unfolded = head.replace(/\r?\n[ \t]+/g, " ");
  for (const line of unfolded.split(/\r?\n/)) {
    const i = line.indexOf(":");
    if (i <= 0) continue;
    const name = line.slice(0, i).trim().toLowerCase();
    if (!headers.has(name)) headers.set(name, line.slice(i + 1).trim());
  }
  return headers;
}

function decodeCharset(bytes: Buffer, charset: string | undefined): string {
  try {
    return new TextDecoder(charset || "utf-8").decode(bytes);
  } catch {
    return bytes.toString("utf8");
  }
}

function decodeQuotedPrintable(input: string, underscoreIsSpace = false): Buffer {
  const s = (underscoreIsSpace ? input.replace(/_/g, " ") : input).replace(/=\r?\n/g, "");
  const bytes: number[] = [];
  for (let i = 0; i < s.length; i++) {
    if (s[i] === "=" && /^[0-9A-Fa-f]{2}$/.test(s.slice(i + 1, i + 3))) {
      bytes.push(parseInt(s.slice(i + 1, i + 3), 16));
      i += 2;
    } else {
      bytes.push(s.charCodeAt(i) & 0xff);
    }
  }
  return Buffer.from(bytes);
}

/** Header value with RFC 2047 encoded words decoded (header text arrives as latin1 bytes). */
export function decodeHeaderValue(value: string): string {
  const joined = value.replace(/(=\?[^?]+\?[BbQq]\?[^?]*\?=)\s+(?==\?)/g, "$1");
  const decoded = joined.replace(/=\?([^?]+)\?([BbQq])\?([^?]*)\?=/g, (_all, charset: string, enc: string, text: string) => {
    const bytes = enc.toUpperCase() === "B" ? Buffer.from(text, "base64") : decodeQuotedPrintable(text, true);
    return decodeCharset(bytes, charset.split("*")[0]);
  });
  // Unencoded 8-bit header bytes are most likely UTF-8.
  return /[\x80-\xff]/.test(decoded) && decoded === joined ? decodeCharset(Buffer.from(decoded, "latin1"), "utf-8") : decoded;
}

function headerParams(value: string): { main: string; params: Map<string, string> } {
  const [main, ...rest] = value.split(";");
  const params = new Map<string, string>();
  for (const p of rest) {
    const i = p.indexOf("=");
    if (i <= 0) continue;
    params.set(p.slice(0, i).trim().toLowerCase(), p.slice(i + 1).trim().replace(/^"(.*)"$/, "$1"));
  }
  return { main: main.trim().toLowerCase(), params };
}

function decodeBody(part: Part): Buffer {
  const cte = (part.headers.get("content-transfer-encoding") ?? "7bit").toLowerCase();
  if (cte === "base64") return Buffer.from(part.body.toString("latin1").replace(/\s+/g, ""), "base64");
  if (cte === "quoted-printable") return decodeQuotedPrintable(part.body.toString("latin1"));
  return part.body;
}

function splitMultipart(body: Buffer, boundary: string): Buffer[] {
  const s = body.toString("latin1");
  const delimiter = `--${boundary}`;
  const parts: Buffer[] = [];
  const chunks = s.split(new RegExp(`(?:^|\\r?\\n)${delimiter.replace(/[.*+?^${}()|[\]\\]/g, "\\$&")}`));
  for (const chunk of chunks.slice(1)) {
    if (chunk.startsWith("--")) break;
    parts.push(Buffer.from(chunk.replace(/^[ \t]*\r?\n/, ""), "latin1"));
  }
  return parts;
}

function collectBodies(raw: Buffer, out: { text: string | null; html: string | null }, depth = 0): void {
  const { head, body } = splitHeaderBody(raw);
  const part: Part = { headers: parseHeaders(head), body };
  const { main: type, params } = headerParams(part.headers.get("content-type") ?? "text/plain");
  const disposition = headerParams(part.headers.get("content-disposition") ?? "inline").main;
  if (type.startsWith("multipart/") && params.get("boundary") && depth < 10) {
    for (const child of splitMultipart(body, params.get("boundary")!)) collectBodies(child, out, depth + 1);
    return;
  }
  if (disposition === "attachment") return;
  const read = () => decodeCharset(decodeBody(part), params.get("charset")).replace(/\r\n/g, "\n");
  if (type === "text/plain" && out.text === null) out.text = read();
  else if (type === "text/html" && out.html === null) out.html = read();
}

export function parseMail(raw: Buffer): ParsedMail {
  const headers = parseHeaders(splitHeaderBody(raw).head);
  const bodies = { text: null as string | null, html: null as string | null };
  collectBodies(raw, bodies);
  return {
    from: decodeHeaderValue(headers.get("from") ?? ""),
    to: decodeHeaderValue(headers.get("to") ?? ""),
    subject: decodeHeaderValue(headers.get("subject") ?? ""),
    messageId: headers.get("message-id") ?? null,
    text: bodies.text,
    html: bodies.html,
  };
}
