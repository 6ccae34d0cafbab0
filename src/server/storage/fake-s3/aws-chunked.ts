/**
 * Decoder of the `aws-chunked` content encoding the AWS SDKs use for streamed uploads:
 *   <hex size>[;chunk-signature=<sig>]\r\n<bytes>\r\n ... 0[;chunk-signature=<sig>]\r\n
 *   [<trailer name>:<value>\r\n ...]\r\n
 * Chunk signatures are not checked (the fake store checks the request's SigV4 header only);
 * trailers (e.g. x-amz-checksum-crc32) are collected for the caller to verify.
 */
import { Transform, type TransformCallback } from "node:stream";

const CRLF = Buffer.from("\r\n");
const MAX_LINE_BYTES = 4096;

export class AwsChunkedDecoder extends Transform {
  readonly trailers = new Map<string, string>();
  private pending: Buffer = Buffer.alloc(0);
  private state: "size" | "data" | "data-end" | "trailer" | "done" = "size";
  private remaining = 0;

  override _transform(chunk: Buffer, _enc: BufferEncoding, done: TransformCallback): void {
    this.pending = this.pending.length ? Buffer.concat([this.pending, chunk]) : chunk;
    try {
      this.drain();
      done();
    } catch (err) {
      done(err as Error);
    }
  }

  override _flush(done: TransformCallback): void {
    if (this.state !== "done") done(new Error("aws-chunked body ended before its final chunk"));
    else done();
  }

  private line(): string | null {
    const end = this.pending.indexOf(CRLF);
    if (end < 0) {
      if (this.pending.length > MAX_LINE_BYTES) throw new Error("aws-chunked framing line too long");
      return null;
    }
    const text = this.pending.subarray(0, end).toString("latin1");
    this.pending = this.pending.subarray(end + 2);
    return text;
  }

  private drain(): void {
    for (;;) {
      if (this.state === "size") {
        const line = this.line();
        if (line === null) return;
        const hex = line.split(";")[0].trim();
        if (!/^[0-9a-fA-F]+$/.test(hex)) throw new Error(`bad aws-chunked size line "${line.slice(0, 40)}"`);
        this.remaining = parseInt(hex, 16);
        this.state = this.remaining === 0 ? "trailer" : "data";
      } else if (this.state === "data") {
        if (this.pending.length === 0) return;
        const take = Math.min(this.remaining, this.pending.length);
        this.push(this.pending.subarray(0, take));
        this.pending = this.pending.subarray(take);
        this.remaining -= take;
        if (this.remaining === 0) this.state = "data-end";
      } else if (this.state === "data-end") {
        if (this.pending.length < 2) return;
        if (this.pending[0] !== 0x0d || this.pending[1] !== 0x0a) throw new Error("aws-chunked chunk not followed by CRLF");
        this.pending = this.pending.subarray(2);
        this.state = "size";
      } else if (this.state === "trailer") {
        const line = this.line();
        if (line === null) return;
        if (line === "") {
          this.state = "done";
          continue;
        }
        const colon = line.indexOf(":");
        if (colon <= 0) throw new Error(`bad aws-chunked trailer "${line.slice(0, 40)}"`);
        this.trailers.set(line.slice(0, colon).trim().toLowerCase(), line.slice(colon + 1).trim());
      } else {
        if (this.pending.length > 0) throw new Error("bytes after the end of an aws-chunked body");
        return;
      }
    }
  }
}
