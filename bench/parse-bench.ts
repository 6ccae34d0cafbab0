/**
 * Log reading alone, as the `correct` command meets it: one readLogFile of a file in each of N
 * fresh processes (JIT warm-up included, as in bench/run.ts), median wall ms. The data comes from
 * bench/generate.ts (run `npm run bench -- core` once, or this script generates it).
 *
 *   node --import tsx bench/parse-bench.ts [runs=5] [file=bench/out/rover-1m.csv]
 *   node --import tsx bench/parse-bench.ts --digest FILE [options JSON]   one SHA-256 of everything read
 *
 * The digest covers every reading column, source lines, counts, rejected rows, issues and warnings,
 * so two versions of the parser can be held to the same result on any file.
 */
import { spawnSync } from "node:child_process";
import { createHash } from "node:crypto";
import os from "node:os";
import path from "node:path";
import { readLogFile } from "../src/cli/log-file";
import { generateBenchData } from "./generate";

const BENCH_DIR = import.meta.dirname;
// as the command line and bench/child.ts run: without the source-map support tsx turns on
process.setSourceMapsEnabled(false);

function median(values: number[]): number {
  const a = [...values].sort((x, y) => x - y);
  const m = a.length >> 1;
  return a.length % 2 ? a[m] : (a[m - 1] + a[m]) / 2;
}

async function child(file: string): Promise<void> {
  const start = process.hrtime.bigint();
  const cpuStart = process.cpuUsage();
  const result = await readLogFile(file, {});
  const ms = Number(process.hrtime.bigint() - start) / 1e6;
  const cpu = process.cpuUsage(cpuStart);
  const cpuMs = (cpu.user + cpu.system) / 1000; // all threads: JIT, GC helpers and the read pool too
  process.stdout.write(JSON.stringify({ ms, cpuMs, count: result.readings.count, rejected: result.rejectedCount }) + "\n");
}

async function digest(file: string, optionsJson: string | undefined): Promise<void> {
  const r = await readLogFile(file, optionsJson ? JSON.parse(optionsJson) : {});
  const h = createHash("sha256");
  const { readings, ...summary } = r;
  h.update(JSON.stringify(summary));
  for (const a of [readings.timeMs, readings.fieldNt, readings.latDeg, readings.lonDeg, readings.heightM, readings.sourceLine]) {
    if (a) h.update(new Uint8Array(a.buffer, a.byteOffset, a.byteLength));
    else h.update("null");
  }
  h.update(JSON.stringify(readings.line));
  h.update(JSON.stringify(readings.station));
  process.stdout.write(`${h.digest("hex")}  ${readings.count} readings, ${r.rejectedCount} rejected, ${r.issueCount} issues  ${file}\n`);
}

function main(): void {
  const runs = Math.max(1, Number(process.argv[2] ?? 5) || 5);
  const file = process.argv[3] ?? generateBenchData(path.join(BENCH_DIR, "out")).roverFile;
  const samples: number[] = [];
  for (let i = 0; i < runs; i++) {
    const r = spawnSync(process.execPath, ["--import", "tsx", path.join(BENCH_DIR, "parse-bench.ts"), "--child", file], {
      cwd: path.dirname(BENCH_DIR),
      encoding: "utf8",
    });
    if (r.status !== 0) throw new Error(`child failed: ${r.stderr.trim()}`);
    const sample = JSON.parse(r.stdout.trim().split("\n").pop()!) as { ms: number };
    samples.push(sample.ms);
  }
  const load = os.loadavg().map((l) => l.toFixed(2)).join(" ");
  process.stdout.write(`readLogFile ${path.basename(file)}: ${samples.map((s) => s.toFixed(0)).join(", ")} ms; median ${median(samples).toFixed(0)} ms (load ${load})\n`);
}

const [mode, arg, extra] = process.argv.slice(2);
if (mode === "--child") {
  child(arg).catch((e: unknown) => {
    process.stderr.write(String(e) + "\n");
    process.exit(1);
  });
} else if (mode === "--digest") {
  digest(arg, extra).catch((e: unknown) => {
    process.stderr.write(String(e) + "\n");
    process.exit(1);
  });
} else {
  main();
}
