/**
 * `npm run bench`: generates invented data (bench/out/, git-ignored) and runs each case in
 * bench/cases/ in a fresh child process REPEATS times, reporting the median time and the median of
 * the peak resident memory (process.resourceUsage().maxRSS in the child). Time is measured inside
 * the child around the case's work (process start-up and TypeScript loading excluded, for every
 * case alike); CPU seconds (user + system of the child) are shown too, since wall time swings
 * when other work shares the machine. Prints a table, then one JSON line per case, then the targets.
 * Add a case by adding a module to CASES.
 */
import { spawnSync } from "node:child_process";
import os from "node:os";
import path from "node:path";
import { generateBenchData } from "./generate";

const REPEATS = Math.max(3, Number(process.env.BENCH_REPEATS ?? 5) || 5);
const BENCH_DIR = import.meta.dirname;
const OUT_DIR = path.join(BENCH_DIR, "out");
/** Case modules, run in this order; the first is the baseline the others are compared with. */
const CASES = ["cases/papaparse-baseline.ts", "cases/correct-end-to-end.ts"];
const TARGET_TIME_RATIO = 1.5;
const TARGET_PEAK_MB = 600;

interface Sample {
  name: string;
  rows: number;
  seconds: number;
  cpuSeconds: number;
  peakRssMb: number;
}

function median(values: number[]): number {
  const a = [...values].sort((x, y) => x - y);
  const m = a.length >> 1;
  return a.length % 2 ? a[m] : (a[m - 1] + a[m]) / 2;
}

function runChild(casePath: string, ctx: object): Sample {
  const r = spawnSync(process.execPath, ["--import", "tsx", path.join(BENCH_DIR, "child.ts"), path.join(BENCH_DIR, casePath), JSON.stringify(ctx)], {
    cwd: path.dirname(BENCH_DIR),
    encoding: "utf8",
    maxBuffer: 1 << 20,
  });
  if (r.status !== 0) throw new Error(`${casePath} failed: ${r.stderr.trim()}`);
  return JSON.parse(r.stdout.trim().split("\n").pop()!) as Sample;
}

function main(): void {
  const started = Date.now();
  const { baseFile, roverFile } = generateBenchData(OUT_DIR);
  process.stdout.write(`load average ${os.loadavg().map((l) => l.toFixed(1)).join(" ")}; ${os.cpus().length} CPUs\n`);
  process.stdout.write(`data ready in ${((Date.now() - started) / 1000).toFixed(1)} s; ${REPEATS} runs per case\n`);
  const ctx = { baseFile, roverFile, outDir: OUT_DIR };
  // rounds interleave the cases (baseline, case 2, …, baseline, …) so that each sees the same load
  const samples: Sample[][] = CASES.map(() => []);
  for (let round = 0; round < REPEATS; round++) {
    CASES.forEach((c, i) => samples[i].push(runChild(c, ctx)));
  }
  const results: Sample[] = samples.map((runs) => ({
    name: runs[0].name,
    rows: runs[0].rows,
    seconds: median(runs.map((s) => s.seconds)),
    cpuSeconds: median(runs.map((s) => s.cpuSeconds)),
    peakRssMb: median(runs.map((s) => s.peakRssMb)),
  }));
  samples.forEach((runs) => {
    process.stdout.write(`  ${runs[0].name}: ${runs.map((s) => `${s.seconds.toFixed(2)} s (CPU ${s.cpuSeconds.toFixed(2)})`).join(", ")}\n`);
  });
  const baseline = results[0];
  const rows = results.map((r) => [
    r.name,
    String(r.rows),
    r.seconds.toFixed(3),
    (r.seconds / baseline.seconds).toFixed(2),
    r.cpuSeconds.toFixed(3),
    (r.cpuSeconds / baseline.cpuSeconds).toFixed(2),
    r.peakRssMb.toFixed(0),
  ]);
  const head = ["case", "rows", "median s", "× baseline", "median CPU s", "CPU × baseline", "peak RSS MB"];
  const widths = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
  const fmt = (cells: string[]) => cells.map((c, i) => (i === 0 ? c.padEnd(widths[i]) : c.padStart(widths[i]))).join("  ");
  process.stdout.write("\n" + fmt(head) + "\n" + fmt(widths.map((w) => "-".repeat(w))) + "\n" + rows.map(fmt).join("\n") + "\n\n");
  for (const r of results) {
    process.stdout.write(JSON.stringify({ name: r.name, rows: r.rows, seconds: +r.seconds.toFixed(3), peakRssMb: +r.peakRssMb.toFixed(1) }) + "\n");
  }
  for (const r of results.slice(1)) {
    const ratio = r.seconds / baseline.seconds;
    const ok = ratio <= TARGET_TIME_RATIO && r.peakRssMb < TARGET_PEAK_MB;
    process.stdout.write(
      `${r.name}: ${ratio.toFixed(2)} × baseline (target ≤ ${TARGET_TIME_RATIO}), peak ${r.peakRssMb.toFixed(0)} MB (target < ${TARGET_PEAK_MB}) → ${ok ? "met" : "NOT met"}\n`,
    );
  }
}

main();
