/** Shared option parsing for the correct and qa commands (node:util parseArgs, string options only). */
import { parseArgs } from "node:util";
import { CliError } from "./cli-error";

const NEGATIVE_NUMBER = /^-\d*\.?\d+(e[+-]?\d+)?$/i;

/**
 * Parse `--name value` string options. A value that is a negative number (`--rover-clock-offset-s -2`)
 * is accepted as written; parseArgs alone would take it for an option.
 */
export function parseStringOptions(argv: string[], names: readonly string[], usage: string): Record<string, string | undefined> {
  const joined: string[] = [];
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    const next = argv[i + 1];
    if (a.startsWith("--") && !a.includes("=") && next !== undefined && NEGATIVE_NUMBER.test(next)) {
      joined.push(`${a}=${next}`);
      i++;
    } else {
      joined.push(a);
    }
  }
  try {
    return parseArgs({
      args: joined,
      options: Object.fromEntries(names.map((k) => [k, { type: "string" as const }])),
      strict: true,
      allowPositionals: false,
    }).values as Record<string, string | undefined>;
  } catch (err) {
    const message = (err instanceof Error ? err.message : String(err)).replace(/\s*\n\s*/g, " ");
    throw new CliError(`${message}; ${usage}`);
  }
}
