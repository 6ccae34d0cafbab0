/** Shared option parsing for the correct and qa commands (node:util parseArgs, string options only). */
import { parseArgs } from "node:util";
import { z } from "zod";
import { CliError } from "./cli-error";

/** An optional numeric option: finite, and passing `check` (described by `what` in the error). */
export function numberOption(flag: string, check: (v: number) => boolean = () => true, what = "a number") {
  return z
    .string()
    .optional()
    .transform((s, ctx) => {
      if (s === undefined) return undefined;
      const v = Number(s);
      if (s.trim() === "" || !Number.isFinite(v) || !check(v)) {
        ctx.addIssue({ code: "custom", message: `${flag} must be ${what}, got "${s}"` });
        return z.NEVER;
      }
      return v;
    });
}

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
