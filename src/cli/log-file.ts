/**
 * Read a log file through the pure incremental parser, streaming (the text is never held whole),
 * and print its rejected rows and issues on stderr. Node only; used by the correct and qa commands.
 * The file size is passed to the parser as a size hint (its reading columns are sized once).
 */
import fs from "node:fs";
import path from "node:path";
import { createLogStreamParser, LogFormatError, type LogParseOptions, type LogStreamParser, type LogParseSummary, type LogReadings, type RowProblem } from "../core/logs";
import { TimestampError } from "../core/time";
import { CliError } from "./cli-error";

const READ_CHUNK_BYTES = 4 << 20;
/** Rejected rows and issues printed per log; the count of the rest follows. */
const MAX_PRINTED_PROBLEMS = 50;

export type LogFileResult = LogParseSummary & { readings: LogReadings };

export async function readLogFile(file: string, options: LogParseOptions): Promise<LogFileResult> {
  if (!fs.existsSync(file)) throw new CliError(`file not found: ${file}`);
  let handle: fs.promises.FileHandle;
  try {
    handle = await fs.promises.open(file, "r");
  } catch (err) {
    throw new CliError(`cannot read ${file}: ${err instanceof Error ? err.message : String(err)}`);
  }
  try {
    const sizeHintBytes = (await handle.stat()).size;
    let parser;
    try {
      parser = createLogStreamParser({ ...options, sizeHintBytes });
    } catch (err) {
      if (err instanceof RangeError || err instanceof TimestampError) throw new CliError(`${path.basename(file)}: ${err.message}`);
      throw err;
    }
    return await readThrough(handle, parser);
  } catch (err) {
    if (err instanceof LogFormatError) throw new CliError(`${path.basename(file)}: ${err.message}`);
    if (err instanceof Error && "code" in err && typeof err.code === "string") throw new CliError(`cannot read ${file}: ${err.message}`);
    throw err;
  } finally {
    await handle.close();
  }
}

/**
 * Stream the file into the parser through two reused buffers: the next chunk is read while the
 * parser works on this one (the parser copies what it keeps, so a buffer may be refilled once pushed).
 */
async function readThrough(handle: fs.promises.FileHandle, parser: LogStreamParser): Promise<LogFileResult> {
  const buffers = [new Uint8Array(READ_CHUNK_BYTES), new Uint8Array(READ_CHUNK_BYTES)];
  let which = 0;
  let next = handle.read(buffers[which], 0, READ_CHUNK_BYTES, null);
  try {
    for (;;) {
      const { bytesRead } = await next;
      if (bytesRead === 0) break;
      const current = buffers[which];
      which ^= 1;
      next = handle.read(buffers[which], 0, READ_CHUNK_BYTES, null);
      parser.push(current.subarray(0, bytesRead)); // UTF-8 bytes: no decoding of the whole text
    }
  } catch (err) {
    await next.catch(() => undefined); // a read still running must end before the file is closed
    throw err;
  }
  const result = parser.end();
  return { ...result, readings: result.readings! };
}

function describe(p: RowProblem): string {
  return `line ${p.line}, column "${p.column}": ${p.message} [${p.reason}]`;
}

/** Rejected rows, issues and warnings of one log on stderr. */
export function reportLogProblems(label: string, file: string, log: LogParseSummary): void {
  const name = path.basename(file);
  const out = (s: string) => process.stderr.write(`${label} ${name}: ${s}\n`);
  for (const w of log.warnings) out(`warning: ${w}`);
  log.rejected.slice(0, MAX_PRINTED_PROBLEMS).forEach((p) => out(`rejected ${describe(p)}`));
  if (log.rejectedCount > MAX_PRINTED_PROBLEMS) out(`… and ${log.rejectedCount - MAX_PRINTED_PROBLEMS} more rejected rows`);
  log.issues.slice(0, MAX_PRINTED_PROBLEMS).forEach((p) => out(`kept, ${describe(p)}`));
  if (log.issueCount > MAX_PRINTED_PROBLEMS) out(`… and ${log.issueCount - MAX_PRINTED_PROBLEMS} more time issues`);
}
