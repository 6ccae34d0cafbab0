/**
 * The format thread's code (started by src/cli/format-thread.ts): each job's rows through the same
 * CorrectedCsvStream as the main thread, without header, and the bytes sent back (transferred, not
 * copied). A job that fails answers with its error instead, and the main thread formats it.
 */
import { parentPort } from "node:worker_threads";
import { CorrectedCsvStream } from "../core/correction";
import { unpackFormatJob, type FormatJob, type FormatReply } from "./format-thread-jobs";

async function format(job: FormatJob): Promise<Uint8Array[]> {
  const chunks: Uint8Array[] = [];
  const csv = new CorrectedCsvStream({ writeBytes: (bytes) => void chunks.push(bytes.slice()) }, { header: false });
  await csv.write(unpackFormatJob(job), job.result);
  await csv.finish();
  return chunks;
}

parentPort?.on("message", (job: FormatJob) => {
  format(job).then(
    (chunks) => parentPort!.postMessage({ job: job.job, chunks } satisfies FormatReply, chunks.map((c) => c.buffer as ArrayBuffer)),
    (err: unknown) => parentPort!.postMessage({ job: job.job, error: err instanceof Error ? err.message : String(err) } satisfies FormatReply),
  );
});
