/**
 * The `correct` command's output: the rover log corrected a batch at a time and written as the
 * corrected CSV, in input order. With a format thread (src/cli/format-thread.ts) the rows are
 * formatted on two cores: this thread formats and writes batches from the front while the other
 * takes batches from the back, two at a time, until they meet; its bytes follow in order. A batch
 * the other thread does not deliver is formatted here, so the bytes are the same either way.
 */
import {
  CorrectedCsvStream,
  duplicateTimeMarks,
  sliceRoverReadings,
  type CorrectedCsvRover,
  type CorrectionColumns,
  type Corrector,
} from "../core/correction";
import type { ByteSink } from "../core/csv";
import type { LogReadings } from "../core/logs";

/** Readings corrected (and formatted) per batch: a few MB of corrected columns. */
export const BATCH_READINGS = 65_536;
/** Batches the other thread holds at once (one formatting, one waiting), so it never idles on a reply. */
const THREAD_BATCHES_IN_FLIGHT = 2;

/** What this module needs of a format thread (tests pass their own). */
export interface RowFormatter {
  readonly failed: boolean;
  /** CSV bytes, without header, of rows [start, start + result.count). */
  format(rover: CorrectedCsvRover, start: number, result: CorrectionColumns): Promise<Uint8Array[]>;
}

export interface CorrectedOutputOptions {
  batchReadings?: number;
  formatter?: RowFormatter | null;
}

/** A turn of the event loop, so replies from the other thread are taken in. */
const nextTurn = () => new Promise<void>((resolve) => setImmediate(resolve));

export async function writeCorrectedOutput(sink: ByteSink, rover: LogReadings, corrector: Corrector, options: CorrectedOutputOptions = {}): Promise<void> {
  const batchReadings = options.batchReadings ?? BATCH_READINGS;
  const formatter = options.formatter ?? null;
  const marks = duplicateTimeMarks(rover.timeMs, rover.count);
  const csv = new CorrectedCsvStream(sink);
  const correct = (start: number) => {
    const end = Math.min(rover.count, start + batchReadings);
    return corrector.correctBatch(sliceRoverReadings(rover, start, end), marks.subarray(start, end));
  };

  if (!formatter || formatter.failed || rover.count <= batchReadings) {
    for (let start = 0; start < rover.count; start += batchReadings) await csv.write(rover, correct(start), start);
    await csv.finish();
    return;
  }

  // Every batch corrected first, in order (the corrector carries state from one batch to the next).
  const batches: Array<{ start: number; result: CorrectionColumns } | null> = [];
  for (let start = 0; start < rover.count; start += batchReadings) batches.push({ start, result: correct(start) });

  let front = 0; // batches [0, front) are taken by this thread
  let back = batches.length; // batches [back, length) by the other one
  let inFlight = 0;
  const delivered = new Map<number, Promise<Uint8Array[] | null>>();
  const hand = () => {
    while (!formatter.failed && inFlight < THREAD_BATCHES_IN_FLIGHT && back > front) {
      const k = --back;
      const { start, result } = batches[k]!;
      inFlight++;
      delivered.set(
        k,
        formatter.format(rover, start, result).then(
          (chunks) => chunks,
          () => null, // formatted here instead
        ).finally(() => inFlight--),
      );
    }
  };
  hand();
  while (front < back) {
    const k = front++;
    const { start, result } = batches[k]!;
    batches[k] = null;
    await csv.write(rover, result, start);
    await nextTurn();
    hand();
  }
  for (let k = back; k < batches.length; k++) {
    const chunks = await delivered.get(k)!;
    const { start, result } = batches[k]!;
    batches[k] = null;
    if (chunks) for (const c of chunks) await csv.append(c);
    else await csv.write(rover, result, start);
  }
  await csv.finish();
}
