/**
 * `npm run bench`: every benchmark, one after the other, each in its own process so that one's
 * memory does not colour the next one's peak:
 *   1. core    — bench/run.ts: papaparse baseline vs `correct` end to end (issue 3 targets)
 *   2. import  — bench/import-bench.ts: 1 M-row rover import vs papaparse + plain insert (issue 4)
 *   3. series  — bench/series-bench.ts: day series and a correction run on the built app (issue 5)
 *   4. engines — bench/engines-bench.ts: 1 M-row import and day series on SQLite and PostgreSQL side by side (issue 8)
 * A benchmark that misses its target exits non-zero; the others still run, and the summary says which.
 * `npm run bench -- core import` runs a subset. The series bench builds the app first unless
 * BENCH_SKIP_BUILD=1 and a build exists.
 */
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";

const ROOT = path.resolve(import.meta.dirname, "..");
const SUITES: Record<string, string[][]> = {
  core: [["--import", "tsx", "bench/run.ts"]],
  import: [["--conditions=react-server", "--import", "tsx", "bench/import-bench.ts"]],
  series: [["node_modules/next/dist/bin/next", "build"], ["--import", "tsx", "bench/series-bench.ts"]],
  engines: [["--conditions=react-server", "--import", "tsx", "bench/engines-bench.ts"]],
};

const wanted = process.argv.slice(2).length ? process.argv.slice(2) : Object.keys(SUITES);
const outcome: string[] = [];
for (const name of wanted) {
  const steps = SUITES[name];
  if (!steps) {
    console.error(`unknown bench "${name}" (known: ${Object.keys(SUITES).join(", ")})`);
    process.exit(2);
  }
  process.stdout.write(`\n=== bench: ${name} ===\n`);
  let status = 0;
  for (const args of steps) {
    const isBuild = args[1] === "build";
    if (isBuild && process.env.BENCH_SKIP_BUILD === "1" && fs.existsSync(path.join(ROOT, ".next", "BUILD_ID"))) continue;
    const r = spawnSync(process.execPath, args, {
      cwd: ROOT,
      stdio: ["ignore", "pipe", "inherit"],
      encoding: "utf8",
      maxBuffer: 64 << 20,
      env: { ...process.env, NEXT_TELEMETRY_DISABLED: "1" },
    });
    process.stdout.write(r.stdout ?? "");
    // A bench that prints a verdict of "NOT met" missed its target even when it exits 0.
    status = r.status ?? 1;
    if (status === 0 && /NOT met/.test(r.stdout ?? "")) status = 1;
    if (status !== 0) break;
  }
  outcome.push(`${name}: ${status === 0 ? "within target" : `missed its target or failed (exit ${status})`}`);
}
process.stdout.write(`\n=== summary ===\n${outcome.join("\n")}\n`);
process.exitCode = outcome.some((o) => !o.includes("within target")) ? 1 : 0;
