/** An atomic file writer (no partial writes) for the CLI's outputs. Node only; the CSV formatting is in src/core/csv. */
import fs from "node:fs";

/**
 * Write a file atomically: chunks go to a temporary file beside the target, renamed into place on
 * `commit()`; `abort()` removes it. Nothing appears at the target unless the whole write succeeds.
 */
export class AtomicFileWriter {
  private readonly temporary: string;
  private fd: number | null;
  /** Bytes written or under way: each write has its own offset, so several may be in flight. */
  private position = 0;
  private pending: string[] = [];
  private pendingChars = 0;

  constructor(private readonly target: string, private readonly flushChars = 1 << 20) {
    this.temporary = `${target}.${process.pid}.tmp`;
    this.fd = fs.openSync(this.temporary, "w");
  }

  /** Raw bytes, written in order after any pending text. */
  writeBytes(bytes: Uint8Array): void {
    this.flush();
    if (this.fd === null) return;
    for (let offset = 0; offset < bytes.length; ) offset += fs.writeSync(this.fd, bytes, offset, bytes.length - offset, this.position + offset);
    this.position += bytes.length;
  }

  /**
   * Raw bytes written by the thread pool at the next offset; the caller keeps `bytes` untouched
   * until it settles. Several may be in flight at once: each has its own place in the file.
   */
  writeBytesAsync(bytes: Uint8Array): Promise<void> {
    this.flush();
    const fd = this.fd;
    if (fd === null) return Promise.reject(new Error("writer already closed"));
    const at = this.position;
    this.position += bytes.length;
    return new Promise((resolve, reject) => {
      const step = (offset: number) =>
        fs.write(fd, bytes, offset, bytes.length - offset, at + offset, (err, written) => {
          if (err) reject(err);
          else if (offset + written < bytes.length) step(offset + written);
          else resolve();
        });
      step(0);
    });
  }

  write(text: string): void {
    this.pending.push(text);
    this.pendingChars += text.length;
    if (this.pendingChars >= this.flushChars) this.flush();
  }

  private flush(): void {
    if (this.fd === null || this.pending.length === 0) return;
    const text = this.pending.join("");
    this.pending = [];
    this.pendingChars = 0;
    this.writeBytes(Buffer.from(text, "utf8"));
  }

  commit(): void {
    this.flush();
    if (this.fd !== null) fs.closeSync(this.fd);
    this.fd = null;
    fs.renameSync(this.temporary, this.target);
  }

  abort(): void {
    if (this.fd !== null) fs.closeSync(this.fd);
    this.fd = null;
    fs.rmSync(this.temporary, { force: true });
  }
}
