/**
 * Fieldtide command line: `npm run -s cli -- <command> [options]`.
 * Each command module exports `run(argv: string[]): Promise<void>` and throws CliError on bad input.
 */
import { CliError } from "./cli-error";

// Node's source-map support (tsx turns it on to map stack traces to the .ts files) slows JIT-compiled
// loops in Node 20: a plain counting loop takes ~225 ms with it against ~140 ms without, and
// `correct` on a million readings ~13 % longer (measured on the bench machine). The command line
// reports a failure as one line without a stack, so it has no use for it.
process.setSourceMapsEnabled(false);

const COMMANDS: Record<string, { summary: string; load: () => Promise<{ run: (argv: string[]) => Promise<void> }> }> = {
  igrf: { summary: "reference field (IGRF-14 or WMM2025) at points from a CSV", load: () => import("./commands/igrf") },
  correct: { summary: "diurnal + reference-field correction of a rover log against a base log", load: () => import("./commands/correct") },
  qa: { summary: "QA metrics of a base record, as JSON", load: () => import("./commands/qa") },
};

function usage(): string {
  const lines = Object.entries(COMMANDS).map(([name, c]) => `  ${name.padEnd(8)} ${c.summary}`);
  return ["usage: npm run -s cli -- <command> [options]", "commands:", ...lines].join("\n");
}

async function main(argv: string[]): Promise<number> {
  const [name, ...rest] = argv;
  if (!name || name === "--help" || name === "-h") {
    process.stdout.write(usage() + "\n");
    return name ? 0 : 2;
  }
  const command = COMMANDS[name];
  if (!command) throw new CliError(`unknown command "${name}" (try: ${Object.keys(COMMANDS).join(", ")})`);
  const mod = await command.load();
  await mod.run(rest);
  return 0;
}

main(process.argv.slice(2)).then(
  (code) => process.exit(code),
  (err: unknown) => {
    if (err instanceof CliError) {
      process.stderr.write(`fieldtide: ${err.message}\n`);
      process.exit(err.exitCode);
    }
    const message = err instanceof Error ? err.message : String(err);
    process.stderr.write(`fieldtide: ${message.split("\n")[0]}\n`);
    process.exit(1);
  },
);
