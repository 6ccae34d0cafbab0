/** The messages between the CLI and its format thread (src/cli/format-thread.ts): plain data, no Node imports. */
import type { CorrectionColumns, CorrectedCsvRover } from "../core/correction";

/** One batch of rows, copied into plain arrays for the message (lines as codes into `lineTexts`). */
export interface FormatJob {
  job: number;
  timeMs: Float64Array;
  fieldNt: Float64Array;
  latDeg: Float64Array | null;
  lonDeg: Float64Array | null;
  heightM: Float64Array | null;
  lineCodes: Uint32Array | null;
  lineTexts: string[];
  result: CorrectionColumns;
}

export type FormatReply = { job: number; chunks: Uint8Array[] } | { job: number; error: string };

/** Rows [start, start + result.count) of the rover log with their corrected values, as a job. */
export function packFormatJob(job: number, rover: CorrectedCsvRover, start: number, result: CorrectionColumns): FormatJob {
  const end = start + result.count;
  const copy = (a: Float64Array | null) => (a ? a.slice(start, end) : null);
  let lineCodes: Uint32Array | null = null;
  const lineTexts: string[] = [];
  if (rover.line) {
    lineCodes = new Uint32Array(end - start);
    const codeOf = new Map<string, number>();
    let last: string | undefined;
    let lastCode = 0;
    for (let i = start; i < end; i++) {
      const text = rover.line[i];
      if (text !== last) {
        let code = codeOf.get(text);
        if (code === undefined) {
          code = lineTexts.push(text) - 1;
          codeOf.set(text, code);
        }
        last = text;
        lastCode = code;
      }
      lineCodes[i - start] = lastCode;
    }
  }
  return { job, timeMs: copy(rover.timeMs)!, fieldNt: copy(rover.fieldNt)!, latDeg: copy(rover.latDeg), lonDeg: copy(rover.lonDeg), heightM: copy(rover.heightM), lineCodes, lineTexts, result };
}

/** The rover rows of a job, as the CSV writer reads them. */
export function unpackFormatJob(j: FormatJob): CorrectedCsvRover {
  const line = j.lineCodes ? Array.from(j.lineCodes, (code) => j.lineTexts[code]) : null;
  return { count: j.timeMs.length, timeMs: j.timeMs, fieldNt: j.fieldNt, latDeg: j.latDeg, lonDeg: j.lonDeg, heightM: j.heightM, line };
}
