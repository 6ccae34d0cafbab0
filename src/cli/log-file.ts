/**
 * Read a log file through the pure incremental parser, streaming (the text is never held whole),
 * and print its rejected rows and issues on stderr. Node only; used by the correct and qa commands.
 */
import fs from "node:fs";
import path from "node:path";
import { createLogStreamParser, LogFormatError, type LogParseOptions, type LogParseSummary, type LogReadings, type RowProblem } from "../core/logs";
import { TimestampError } from "../core/time";
import { CliError } from "./cli-error";

const READ_CHUNK_BYTES = 1 << 20;
/** Rejected rows and issues printed per log; the count of the rest follows. */
const MAX_PRINTED_PROBLEMS = 50;

export type LogFileResult = LogParseSummary & { readings: LogReadings };

export async function readLogFile(file: string, options: LogParseOptions): Promise<LogFileResult> {
  if (!fs.existsSync(file)) throw new CliError(`file not found: ${file}`);
  let parser;
  try {
    parser = createLogStreamParser(options);
  } catch (err) {
    if (err instanceof RangeError || err instanceof TimestampError) throw new CliError(`${path.basename(file)}: ${err.message}`);
    throw err;
  }
  try {
    const stream = fs.createReadStream(file, { highWaterMark: READ_CHUNK_BYTES });
    for await (const chunk of stream) parser.push(chunk as Buffer); // UTF-8 bytes: no decoding of the whole text
    const result = parser.end();
    return { ...result, readings: result.readings! };
  } catch (err) {
    if (err instanceof LogFormatError) throw new CliError(`${path.basename(file)}: ${err.message}`);
    if (err instanceof Error && "code" in err && typeof err.code === "string") throw new CliError(`cannot read ${file}: ${err.message}`);
    throw err;
  }
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
