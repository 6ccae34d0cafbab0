/**
 * Bench case: a 1,000,000-row rover file imported through the same import service the upload
 * route uses, against a baseline measured in the same run (papaparse parse plus a plain
 * better-sqlite3 prepared insert of the same rows in one transaction).
 *
 * Each measurement runs in a fresh child process (its own temp database and upload folder);
 * peak memory is the child's process.resourceUsage().maxRSS. Medians of `repeats` runs.
 * Prints one JSON line per case: {"name","rows","seconds","peakRssMb"} (+ "ratio" on the service line).
 *
 * Budget: service seconds ≤ 2 × baseline seconds; service peak RSS < 500 MB.
 *
 * Standalone: `npx tsx --conditions=react-server bench/import-bench.ts [rows] [repeats]`
 * From a runner: `import { runImportBench } from "./import-bench"; const lines = await runImportBench({ rows, repeats });`
 * (the child processes are started with --conditions=react-server so `server-only` modules load).
 */
import { spawn } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { addBenchSurvey, BENCH_SURVEY_ID } from "./bench-survey";

export interface BenchLine {
  name: string;
  rows: number;
  seconds: number;
  peakRssMb: number;
  ratio?: number;
  withinBudget?: boolean;
}

const HERE = fileURLToPath(import.meta.url);
const PROJECT_ROOT = path.resolve(path.dirname(HERE), "..");
export const IMPORT_TIME_BUDGET_RATIO = 2;
export const IMPORT_RSS_BUDGET_MB = 500;

/** A rover log like the demo's (ISO UTC times, position, height, line, station, field), written in pieces. */
export function writeRoverFile(file: string, rows: number): void {
  const fd = fs.openSync(file, "w");
  try {
    fs.writeSync(fd, "timestamp,latitude,longitude,elevation_m,line,station,tmi_nT\n");
    const start = Date.UTC(2026, 4, 4, 6, 0, 0);
    let buf: string[] = [];
    for (let i = 0; i < rows; i++) {
      const lineNo = 100 + Math.floor(i / 200);
      const station = i % 200;
      const lat = 53.6189 + lineNo * 1.8e-5;
      const lon = -1.9301 + station * 1.5e-5;
      const field = 49_480 + 12 * Math.sin(i / 5000) + 3 * Math.sin(i / 37);
      buf.push(`${new Date(start + i * 200).toISOString()},${lat.toFixed(7)},${lon.toFixed(7)},${(318 + station * 0.01).toFixed(2)},${lineNo},${station},${field.toFixed(2)}`);
      if (buf.length === 10_000) {
        fs.writeSync(fd, buf.join("\n") + "\n");
        buf = [];
      }
    }
    if (buf.length) fs.writeSync(fd, buf.join("\n") + "\n");
  } finally {
    fs.closeSync(fd);
  }
}

function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  const m = Math.floor(s.length / 2);
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

type ChildResult = { seconds: number; peakRssMb: number; rows: number };

function runChild(mode: "baseline" | "service", file: string): Promise<ChildResult> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, ["--conditions=react-server", "--import", "tsx", HERE, "--child", mode, file], {
      cwd: PROJECT_ROOT,
      stdio: ["ignore", "pipe", "inherit"],
      env: { ...process.env },
    });
    let out = "";
    child.stdout.on("data", (d) => (out += d));
    child.on("error", reject);
    child.on("exit", (code) => {
      const last = out.trim().split("\n").pop() ?? "";
      if (code !== 0) return reject(new Error(`${mode} child exited with ${code}: ${out}`));
      try {
        resolve(JSON.parse(last) as ChildResult);
      } catch {
        reject(new Error(`${mode} child printed no result: ${out}`));
      }
    });
  });
}

/** Runs the case; prints and returns the JSON lines. */
export async function runImportBench(opts: { rows?: number; repeats?: number; print?: boolean } = {}): Promise<BenchLine[]> {
  const rows = opts.rows ?? 1_000_000;
  const repeats = opts.repeats ?? 3;
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "fieldtide-import-bench-"));
  try {
    const file = path.join(dir, "rover.csv");
    writeRoverFile(file, rows);
    const baseline: ChildResult[] = [];
    const service: ChildResult[] = [];
    for (let i = 0; i < repeats; i++) {
      // alternate so both see the same machine load
      baseline.push(await runChild("baseline", file));
      service.push(await runChild("service", file));
    }
    for (const r of [...baseline, ...service]) {
      if (r.rows !== rows) throw new Error(`a run stored ${r.rows} rows instead of ${rows}`);
    }
    const base: BenchLine = { name: "import-baseline-papaparse-sqlite", rows, seconds: round(median(baseline.map((r) => r.seconds))), peakRssMb: round(median(baseline.map((r) => r.peakRssMb))) };
    const svcSeconds = median(service.map((r) => r.seconds));
    const svcRss = median(service.map((r) => r.peakRssMb));
    const ratio = svcSeconds / median(baseline.map((r) => r.seconds));
    const svc: BenchLine = {
      name: "import-service-rover",
      rows,
      seconds: round(svcSeconds),
      peakRssMb: round(svcRss),
      ratio: round(ratio),
      withinBudget: ratio <= IMPORT_TIME_BUDGET_RATIO && Math.max(...service.map((r) => r.peakRssMb)) < IMPORT_RSS_BUDGET_MB,
    };
    if (opts.print !== false) for (const line of [base, svc]) console.log(JSON.stringify(line));
    return [base, svc];
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

function round(x: number): number {
  return Math.round(x * 1000) / 1000;
}

function peakRssMb(): number {
  return process.resourceUsage().maxRSS / 1024; // maxRSS is in kilobytes
}

/** Baseline: papaparse streaming the file, one prepared insert per row, one transaction. */
async function childBaseline(file: string): Promise<ChildResult> {
  const Papa = (await import("papaparse")).default;
  const Database = (await import("better-sqlite3")).default;
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "fieldtide-bench-base-"));
  const db = new Database(path.join(dir, "b.sqlite"));
  db.pragma("journal_mode = WAL");
  db.pragma("synchronous = NORMAL");
  db.exec("CREATE TABLE readings (time_ms INTEGER NOT NULL, field_nt REAL NOT NULL, latitude_deg REAL, longitude_deg REAL, height_m REAL, line TEXT, station TEXT, source_line INTEGER NOT NULL)");
  const insert = db.prepare("INSERT INTO readings VALUES (?, ?, ?, ?, ?, ?, ?, ?)");
  const t0 = performance.now();
  let n = 0;
  db.exec("BEGIN");
  await new Promise<void>((resolve, reject) => {
    let lineNo = 1;
    Papa.parse<string[]>(fs.createReadStream(file, { highWaterMark: 1024 * 1024 }) as unknown as File, {
      header: false,
      skipEmptyLines: true,
      step: (res) => {
        lineNo++;
        const r = res.data;
        if (lineNo === 2) return; // header
        insert.run(Date.parse(r[0]), +r[6], +r[1], +r[2], +r[3], r[4], r[5], lineNo - 1);
        n++;
      },
      complete: () => resolve(),
      error: (e: Error) => reject(e),
    });
  });
  db.exec("COMMIT");
  const seconds = (performance.now() - t0) / 1000;
  db.close();
  fs.rmSync(dir, { recursive: true, force: true });
  return { seconds, peakRssMb: peakRssMb(), rows: n };
}

/** The import service as the upload route calls it, on a fresh migrated database. */
async function childService(file: string): Promise<ChildResult> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "fieldtide-bench-svc-"));
  process.env.DATABASE_FILE = path.join(dir, "s.sqlite");
  process.env.UPLOAD_DIR = path.join(dir, "uploads");
  const { getDb, closeDb } = await import("../src/server/db/client");
  const { migrateToLatest } = await import("../src/server/db/migration-source");
  const { importLogStream } = await import("../src/server/logs/import-service");
  const db = getDb();
  await migrateToLatest(db);
  const actor = await addBenchSurvey(db, "crew");
  const t0 = performance.now();
  const result = await importLogStream(actor, BENCH_SURVEY_ID, fs.createReadStream(file, { highWaterMark: 1024 * 1024 }), {
    kind: "rover",
    fileName: "rover.csv",
    instrument: "BENCH-ROVER",
    sensorType: "overhauser",
  });
  const seconds = (performance.now() - t0) / 1000;
  await closeDb();
  fs.rmSync(dir, { recursive: true, force: true });
  return { seconds, peakRssMb: peakRssMb(), rows: result.log.readingCount };
}

async function main(argv: string[]): Promise<void> {
  if (argv[0] === "--child") {
    const result = argv[1] === "baseline" ? await childBaseline(argv[2]) : await childService(argv[2]);
    console.log(JSON.stringify(result));
    return;
  }
  const rows = argv[0] ? Number(argv[0]) : undefined;
  const repeats = argv[1] ? Number(argv[1]) : undefined;
  const lines = await runImportBench({ rows, repeats });
  if (!lines[1].withinBudget) process.exitCode = 1;
}

if (process.argv[1] && path.resolve(process.argv[1]) === HERE) {
  main(process.argv.slice(2)).catch((err: unknown) => {
    console.error(`import bench: ${err instanceof Error ? err.message : String(err)}`);
    process.exitCode = 1;
  });
}
