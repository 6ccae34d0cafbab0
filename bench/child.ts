/** Runs one bench case in this fresh process and prints one JSON line: rows, seconds (wall), cpuSeconds, peakRssMb. */
import { pathToFileURL } from "node:url";
import type { BenchCase, BenchContext } from "./bench-case";

// Every case runs without Node's source-map support, as the command line does (src/cli/index.ts):
// tsx, which loads these .ts files, turns it on, and in Node 20 it slows JIT-compiled loops (a
// plain counting loop ~225 ms with it, ~140 ms without). The papaparse baseline is not affected by
// it (its time is in native string functions), the TypeScript cases are.
process.setSourceMapsEnabled(false);

async function main(): Promise<void> {
  const [casePath, ctxJson] = process.argv.slice(2);
  const mod = (await import(pathToFileURL(casePath).href)) as { default: BenchCase };
  const ctx = JSON.parse(ctxJson) as BenchContext;
  const originalWrite = process.stderr.write.bind(process.stderr);
  process.stderr.write = (() => true) as typeof process.stderr.write; // the CLI's summary lines are not bench output
  await mod.default.prepare?.(ctx);
  const start = process.hrtime.bigint();
  const cpuStart = process.cpuUsage();
  const result = await mod.default.run(ctx);
  const seconds = Number(process.hrtime.bigint() - start) / 1e9;
  const cpu = process.cpuUsage(cpuStart);
  const cpuSeconds = (cpu.user + cpu.system) / 1e6; // all threads of this process, incl. the I/O pool
  const peakRssMb = process.resourceUsage().maxRSS / 1024; // maxRSS is in KiB
  process.stderr.write = originalWrite;
  const rows = result && "rows" in result ? result.rows : mod.default.rows ? await mod.default.rows(ctx) : NaN;
  process.stdout.write(JSON.stringify({ name: mod.default.name, rows, seconds, cpuSeconds, peakRssMb }) + "\n");
}

main().catch((err: unknown) => {
  process.stderr.write(`bench child failed: ${err instanceof Error ? err.message : String(err)}\n`);
  process.exit(1);
});
