/**
 * Bench: the same work on SQLite and on PostgreSQL, side by side (issue 8). Per engine, in a
 * fresh child process with a fresh database each time:
 *   - import a 1,000,000-row rover file through the import service (prepared inserts on
 *     SQLite, COPY on PostgreSQL), after an 86,400-row base day;
 *   - the day-series query the day page's charts make (base and rover, through getDaySeries
 *     as the route calls it): "uncached" clears the readings cache and asks a new point count
 *     each time, so every call reads the readings from the database; "cached" repeats one call.
 * Medians of `repeats` runs; peak RSS is the Node process's (the PostgreSQL server's own memory
 * is not in it). PostgreSQL comes from FIELDTIDE_BENCH_PG_URL (an admin URL; a database is made
 * and dropped per run), else a throwaway server is started with scripts/pg-local.sh.
 *
 * Standalone: `node --conditions=react-server --import tsx bench/engines-bench.ts [rows] [repeats]`
 */
import { spawn, spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { createPgDatabase, dropPgDatabase, newPgDatabaseName, pgDatabaseUrl } from "../scripts/lib/pg-database";
import { addBenchSurvey, BENCH_SURVEY_ID } from "./bench-survey";
import { writeRoverFile } from "./import-bench";

const HERE = fileURLToPath(import.meta.url);
const PROJECT_ROOT = path.resolve(path.dirname(HERE), "..");
const DAY = "2026-05-04";
const SERIES_CALLS = 15;
type Engine = "sqlite" | "postgres";

interface ChildResult {
  engine: Engine;
  rows: number;
  importSeconds: number;
  baseImportSeconds: number;
  series: Record<string, { uncachedMs: number; cachedMs: number; points: number }>;
  peakRssMb: number;
}

const median = (v: number[]) => {
  const s = [...v].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
};

/** 86,400 base readings at 1 Hz over the survey-local day (Europe/London, UTC+1 in May). */
function writeBaseFile(file: string): void {
  const start = Date.parse("2026-05-03T23:00:00Z");
  const rows = ["time,field_nT"];
  for (let i = 0; i < 86_400; i++) rows.push(`${new Date(start + i * 1000).toISOString()},${(49_310 + 22 * Math.sin(((i / 3600 - 6) / 24) * 2 * Math.PI) + 0.3 * Math.sin(i / 7)).toFixed(2)}`);
  fs.writeFileSync(file, rows.join("\n") + "\n");
}

async function child(engine: Engine, roverFile: string, baseFile: string, adminUrl: string): Promise<ChildResult> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), `fieldtide-engines-${engine}-`));
  const dbName = newPgDatabaseName("fieldtide_bench");
  process.env.UPLOAD_DIR = path.join(dir, "uploads");
  process.env.DATABASE_FILE = path.join(dir, "bench.sqlite");
  if (engine === "postgres") {
    await createPgDatabase(adminUrl, dbName);
    process.env.DATABASE_URL = pgDatabaseUrl(adminUrl, dbName);
  } else delete process.env.DATABASE_URL;
  const { getDb, closeDb } = await import("../src/server/db/client");
  const { migrateToLatest } = await import("../src/server/db/migration-source");
  const { importLogStream } = await import("../src/server/logs/import-service");
  const { getDaySeries } = await import("../src/server/days/series");
  try {
    const db = getDb();
    await migrateToLatest(db);
    const actor = await addBenchSurvey(db, "processor");
    const fields = (kind: string, name: string) => ({
      kind,
      fileName: name,
      instrument: `BENCH-${kind}`,
      sensorType: "overhauser",
      ...(kind === "base" ? { baseSiteName: "BENCH-BASE", baseLatitudeDeg: 53.62, baseLongitudeDeg: -1.93, baseHeightM: 318 } : {}),
    });

    let t0 = performance.now();
    await importLogStream(actor, BENCH_SURVEY_ID, fs.createReadStream(baseFile, { highWaterMark: 1 << 20 }), fields("base", "base.csv"));
    const baseImportSeconds = (performance.now() - t0) / 1000;
    t0 = performance.now();
    const rover = await importLogStream(actor, BENCH_SURVEY_ID, fs.createReadStream(roverFile, { highWaterMark: 1 << 20 }), fields("rover", "rover.csv"));
    const importSeconds = (performance.now() - t0) / 1000;

    const cache = (globalThis as { __fieldtideReadingsCache?: unknown[] }).__fieldtideReadingsCache;
    const series: ChildResult["series"] = {};
    for (const kind of ["base", "rover"]) {
      const uncached: number[] = [];
      let points = 0;
      for (let i = 0; i < SERIES_CALLS; i++) {
        if (cache) cache.length = 0;
        const t = performance.now();
        const r = (await getDaySeries(actor, BENCH_SURVEY_ID, DAY, { kind, maxPoints: String(2000 + i) })) as { t?: number[] };
        uncached.push(performance.now() - t);
        points = r.t?.length ?? 0;
      }
      const cached: number[] = [];
      for (let i = 0; i < SERIES_CALLS; i++) {
        const t = performance.now();
        await getDaySeries(actor, BENCH_SURVEY_ID, DAY, { kind, maxPoints: "2000" });
        cached.push(performance.now() - t);
      }
      series[kind] = { uncachedMs: median(uncached), cachedMs: median(cached.slice(1)), points };
    }
    return { engine, rows: rover.log.readingCount, importSeconds, baseImportSeconds, series, peakRssMb: process.resourceUsage().maxRSS / 1024 };
  } finally {
    await closeDb();
    if (engine === "postgres") await dropPgDatabase(adminUrl, dbName);
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

function runChild(engine: Engine, roverFile: string, baseFile: string, adminUrl: string): Promise<ChildResult> {
  return new Promise((resolve, reject) => {
    const p = spawn(process.execPath, ["--conditions=react-server", "--import", "tsx", HERE, "--child", engine, roverFile, baseFile, adminUrl], {
      cwd: PROJECT_ROOT,
      stdio: ["ignore", "pipe", "inherit"],
    });
    let out = "";
    p.stdout.on("data", (d) => (out += d));
    p.on("error", reject);
    p.on("exit", (code) => {
      if (code !== 0) return reject(new Error(`${engine} child exited with ${code}: ${out}`));
      try {
        resolve(JSON.parse(out.trim().split("\n").pop() ?? "") as ChildResult);
      } catch {
        reject(new Error(`${engine} child printed no result: ${out}`));
      }
    });
  });
}

function postgresAdminUrl(): string {
  const given = process.env.FIELDTIDE_BENCH_PG_URL ?? process.env.FIELDTIDE_TEST_PG_URL;
  if (given) return given;
  const r = spawnSync("bash", [path.join(PROJECT_ROOT, "scripts/pg-local.sh"), "start"], { encoding: "utf8" });
  if (r.status !== 0) throw new Error(`could not start PostgreSQL for the bench: ${r.stderr.trim() || r.stdout.trim()} (or set FIELDTIDE_BENCH_PG_URL)`);
  return r.stdout.trim().split("\n").pop()!;
}

async function main(argv: string[]): Promise<void> {
  if (argv[0] === "--child") {
    console.log(JSON.stringify(await child(argv[1] as Engine, argv[2], argv[3], argv[4])));
    return;
  }
  const rows = Number(argv[0] ?? 1_000_000);
  const repeats = Math.max(1, Number(argv[1] ?? 3));
  const adminUrl = postgresAdminUrl();
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "fieldtide-engines-data-"));
  try {
    const roverFile = path.join(dir, "rover.csv");
    const baseFile = path.join(dir, "base.csv");
    writeRoverFile(roverFile, rows);
    writeBaseFile(baseFile);
    process.stdout.write(`load average ${os.loadavg().map((l) => l.toFixed(1)).join(" ")}; ${os.cpus().length} CPUs; ${rows} rover rows; ${repeats} runs per engine\n`);
    const runs: Record<Engine, ChildResult[]> = { sqlite: [], postgres: [] };
    for (let i = 0; i < repeats; i++) for (const e of ["sqlite", "postgres"] as const) runs[e].push(await runChild(e, roverFile, baseFile, adminUrl));
    for (const e of ["sqlite", "postgres"] as const) for (const r of runs[e]) if (r.rows !== rows) throw new Error(`${e} stored ${r.rows} rows instead of ${rows}`);
    const med = (e: Engine, f: (r: ChildResult) => number) => median(runs[e].map(f));
    const table: [string, (r: ChildResult) => number, string][] = [
      [`import ${rows.toLocaleString("en")} rover rows`, (r) => r.importSeconds, "s"],
      ["import 86 400 base rows", (r) => r.baseImportSeconds, "s"],
      ["series base, uncached", (r) => r.series.base.uncachedMs, "ms"],
      ["series rover, uncached", (r) => r.series.rover.uncachedMs, "ms"],
      ["series base, cached", (r) => r.series.base.cachedMs, "ms"],
      ["series rover, cached", (r) => r.series.rover.cachedMs, "ms"],
      ["peak RSS (Node)", (r) => r.peakRssMb, "MB"],
    ];
    const w = Math.max(...table.map((t) => t[0].length));
    process.stdout.write(`\n${"median".padEnd(w)}  ${"SQLite".padStart(10)}  ${"PostgreSQL".padStart(10)}  PG / SQLite\n`);
    for (const [label, f, unit] of table) {
      const s = med("sqlite", f);
      const p = med("postgres", f);
      const fmt = (v: number) => `${unit === "s" ? v.toFixed(2) : v.toFixed(unit === "MB" ? 0 : 1)} ${unit}`;
      process.stdout.write(`${label.padEnd(w)}  ${fmt(s).padStart(10)}  ${fmt(p).padStart(10)}  ${(p / s).toFixed(2)}\n`);
    }
    for (const e of ["sqlite", "postgres"] as const) {
      process.stdout.write(`  ${e} runs: import ${runs[e].map((r) => r.importSeconds.toFixed(2)).join(", ")} s\n`);
    }
    for (const e of ["sqlite", "postgres"] as const) {
      const line = { name: `engine-${e}-import-rover`, rows, seconds: +med(e, (r) => r.importSeconds).toFixed(3), peakRssMb: +med(e, (r) => r.peakRssMb).toFixed(0) };
      process.stdout.write(JSON.stringify(line) + "\n");
      for (const kind of ["base", "rover"]) {
        process.stdout.write(JSON.stringify({ name: `engine-${e}-series-${kind}-uncached`, rows: runs[e][0].series[kind].points, seconds: +(med(e, (r) => r.series[kind].uncachedMs) / 1000).toFixed(4), peakRssMb: line.peakRssMb }) + "\n");
      }
    }
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

if (process.argv[1] && path.resolve(process.argv[1]) === HERE) {
  main(process.argv.slice(2)).catch((err: unknown) => {
    const fieldErrors = (err as { fieldErrors?: unknown }).fieldErrors;
    console.error(`engines bench: ${err instanceof Error ? err.message : String(err)}${fieldErrors ? ` ${JSON.stringify(fieldErrors)}` : ""}`);
    process.exitCode = 1;
  });
}
