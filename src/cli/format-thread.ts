/**
 * A second thread that formats corrected rows as CSV bytes for the `correct` command, so a large
 * output is formatted on two cores (src/cli/format-thread-entry.ts is its code). It only formats:
 * the same CorrectedCsvStream code on the same values gives the same bytes on either thread, and
 * a job the thread cannot do rejects, so the caller formats that batch itself: the thread can cost
 * time but never change the output. Node only.
 */
import os from "node:os";
import { fileURLToPath } from "node:url";
import { Worker } from "node:worker_threads";
import type { CorrectionColumns, CorrectedCsvRover } from "../core/correction";
import { packFormatJob, type FormatReply } from "./format-thread-jobs";

/**
 * Under tsx (the CLI runs from its .ts files) the thread registers tsx's require hook before loading
 * its entry: lighter than the parent's loader flags, which would start a loader thread of its own.
 */
function startWorker(): Worker {
  const here = import.meta.url;
  if (!here.endsWith(".ts")) return new Worker(new URL("./format-thread-entry.js", here));
  const bootstrap = 'const { workerData } = require("node:worker_threads"); require(workerData.tsxApi).register(); require(workerData.entry);';
  return new Worker(bootstrap, {
    eval: true,
    execArgv: [],
    workerData: { tsxApi: fileURLToPath(import.meta.resolve("tsx/cjs/api")), entry: fileURLToPath(new URL("./format-thread-entry.ts", here)) },
  });
}

export class FormatThread {
  private readonly worker: Worker;
  private readonly pending = new Map<number, { resolve: (chunks: Uint8Array[]) => void; reject: (err: Error) => void }>();
  private nextJob = 1;
  /** True once the thread failed or stopped: every later job rejects at once. */
  failed = false;

  private constructor() {
    this.worker = startWorker();
    this.worker.unref(); // never keeps the process alive
    this.worker.on("message", (m: FormatReply) => this.receive(m));
    this.worker.on("error", (err) => this.fail(err));
    this.worker.on("exit", () => this.fail(new Error("format thread exited")));
  }

  /** A started thread when this machine has a second core, else null. */
  static start(): FormatThread | null {
    if (os.availableParallelism() < 2) return null;
    try {
      return new FormatThread();
    } catch {
      return null;
    }
  }

  /** CSV bytes (no header) of rows [start, start + result.count). */
  format(rover: CorrectedCsvRover, start: number, result: CorrectionColumns): Promise<Uint8Array[]> {
    if (this.failed) return Promise.reject(new Error("format thread not running"));
    const job = this.nextJob++;
    const message = packFormatJob(job, rover, start, result);
    return new Promise((resolve, reject) => {
      this.pending.set(job, { resolve, reject });
      try {
        this.worker.postMessage(message);
      } catch (err) {
        this.pending.delete(job);
        reject(err instanceof Error ? err : new Error(String(err)));
      }
    });
  }

  /** Stop the thread; jobs still out reject. */
  async stop(): Promise<void> {
    this.fail(new Error("format thread stopped"));
    await this.worker.terminate();
  }

  private receive(m: FormatReply): void {
    const waiting = this.pending.get(m.job);
    if (!waiting) return;
    this.pending.delete(m.job);
    if ("chunks" in m) waiting.resolve(m.chunks);
    else waiting.reject(new Error(m.error));
  }

  private fail(err: Error): void {
    this.failed = true;
    for (const { reject } of this.pending.values()) reject(err);
    this.pending.clear();
  }
}
