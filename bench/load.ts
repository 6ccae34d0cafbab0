/**
 * Load: the built app on loopback with a fresh database (migrated and seeded), for a bounded
 * time, `crews` concurrent field crews each uploading distinct 50 000-row rover logs with their
 * own API token while `viewers` concurrent viewers poll the day's series. Passes when no request
 * failed, no SQLite busy/locked error reached a user, and every reading the app said it accepted
 * is in the database afterwards (readings counted per log, against the upload answers).
 * Prints throughput and p50/p95/p99 latency per kind of request.
 *
 *   npx tsx bench/load.ts [--seconds 60] [--crews 20] [--viewers 20] [--rows 50000] [--engine sqlite|postgres]
 *
 * --engine postgres runs the app on a fresh PostgreSQL database (on the server named by
 * FIELDTIDE_BENCH_PG_URL, an admin URL, else a throwaway one from scripts/pg-local.sh).
 *
 * Needs `next build` done. Loopback only; exits non-zero when the load was not held.
 */
import { randomBytes, randomUUID, createHash } from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { parseArgs } from "node:util";
import { spawnSync } from "node:child_process";
import type { Knex } from "knex";
import { freePort, runStep, startBuiltApp } from "../scripts/lib/app-process";
import { createPgDatabase, dropPgDatabase, newPgDatabaseName, pgDatabaseUrl } from "../scripts/lib/pg-database";
import { createDb } from "../src/server/db/create-db";

const { values: args } = parseArgs({
  options: {
    seconds: { type: "string", default: "60" },
    crews: { type: "string", default: "20" },
    viewers: { type: "string", default: "20" },
    rows: { type: "string", default: "50000" },
    engine: { type: "string", default: "sqlite" },
  },
});
const ENGINE = args.engine;
if (ENGINE !== "sqlite" && ENGINE !== "postgres") throw new Error("--engine must be sqlite or postgres");
const SECONDS = Number(args.seconds);
const CREWS = Number(args.crews);
const VIEWERS = Number(args.viewers);
const ROWS = Number(args.rows);
for (const [k, v] of Object.entries({ SECONDS, CREWS, VIEWERS, ROWS })) {
  if (!Number.isInteger(v) || v < 1) throw new Error(`--${k.toLowerCase()} must be a positive whole number`);
}
const MAX_SECONDS = 600; // bounded, whatever the flag says
const DAY = "2026-05-04";
const DAY_START_MS = Date.parse("2026-05-04T01:00:00Z");
const BUSY = /SQLITE_BUSY|database is locked|SQLITE_LOCKED|deadlock detected|could not serialize/i;

type Sample = { kind: string; ms: number; ok: boolean };
const samples: Sample[] = [];
const failures: string[] = [];
const accepted = new Map<number, number>(); // log id → readings the app said it stored

/** A rover log of `rows` 5 Hz readings; crew and round go into the line names, so every file's bytes (and SHA-256) differ. */
function roverLog(crew: number, round: number, rows: number): Buffer {
  const out: string[] = ["timestamp,latitude,longitude,elevation_m,line,station,tmi_nT"];
  const startMs = DAY_START_MS + ((crew * 7 + round * 3) % 40) * 60_000;
  const perLine = 500;
  for (let i = 0; i < rows; i++) {
    const line = Math.floor(i / perLine);
    const east = line % 2 === 0 ? i % perLine : perLine - 1 - (i % perLine);
    const field = 49_480 + 15 * Math.sin(i / 4000) + 40 * Math.exp(-(((east - 250) / 12) ** 2));
    out.push(
      `${new Date(startMs + i * 200).toISOString()},${(53.6189 + line * 1.8e-5).toFixed(7)},${(-1.9301 + east * 0.6e-5).toFixed(7)},318.20,C${crew}R${round}L${line},${east},${field.toFixed(2)}`,
    );
  }
  return Buffer.from(out.join("\n") + "\n", "utf8");
}

function baseLog(): Buffer {
  const out = ["time,field_nT"];
  for (let t = DAY_START_MS - 3_600_000; t < DAY_START_MS + 20 * 3_600_000; t += 5000) out.push(`${new Date(t).toISOString()},${(49_310 + 15 * Math.sin((t - DAY_START_MS) / 3_600_000)).toFixed(2)}`);
  return Buffer.from(out.join("\n") + "\n", "utf8");
}

async function timed(kind: string, fn: () => Promise<Response>): Promise<{ res: Response | null; text: string }> {
  const t0 = performance.now();
  let res: Response | null = null;
  let text = "";
  try {
    res = await fn();
    text = await res.text();
  } catch (err) {
    const cause = (err as { cause?: { code?: string; message?: string } }).cause;
    text = `${String(err)}${cause ? ` (${cause.code ?? ""} ${cause.message ?? ""})` : ""}`;
  }
  const ms = performance.now() - t0;
  const ok = res !== null && res.status < 300;
  samples.push({ kind, ms, ok });
  if (!ok) failures.push(`${kind}: ${res?.status ?? "no answer"} after ${(ms / 1000).toFixed(1)} s: ${text.slice(0, 200)}`);
  if (BUSY.test(text)) failures.push(`${kind}: SQLite busy/locked reached the caller: ${text.slice(0, 200)}`);
  return { res, text };
}

/** Test people straight into the fresh database before the app starts: crews and viewers, each with an API token. */
async function addPeople(db: Knex): Promise<{ surveyId: string; crewTokens: string[]; viewerTokens: string[] }> {
  const survey = (await db("surveys").where({ code: "BRM-26" }).first("id")) as { id: string };
  const now = new Date().toISOString();
  const make = async (role: string, i: number): Promise<string> => {
    const id = randomUUID();
    // No password: these people sign in only with their token ("!" is no argon2 hash).
    await db("users").insert({ id, email: `load-${role}-${i}@bench.invalid`, name: `Load ${role} ${i}`, password_hash: "!", is_admin: 0, created_at: now, updated_at: now });
    await db("survey_members").insert({ survey_id: survey.id, user_id: id, role, joined_at: now });
    const plain = "ftk_" + randomBytes(32).toString("base64url");
    await db("api_tokens").insert({ id: randomUUID(), user_id: id, name: "load bench", token_hash: createHash("sha256").update(plain).digest("hex"), token_prefix: plain.slice(0, 10), created_at: now });
    return plain;
  };
  const crewTokens: string[] = [];
  for (let i = 0; i < CREWS; i++) crewTokens.push(await make("crew", i));
  const viewerTokens: string[] = [];
  for (let i = 0; i < VIEWERS; i++) viewerTokens.push(await make("reviewer", i));
  return { surveyId: survey.id, crewTokens, viewerTokens };
}

/** A fresh PostgreSQL database for this run; returns its URL and how to drop it. */
async function freshPostgres(): Promise<{ url: string; drop: () => Promise<void> }> {
  let admin = process.env.FIELDTIDE_BENCH_PG_URL;
  if (!admin) {
    const r = spawnSync("bash", ["scripts/pg-local.sh", "start"], { encoding: "utf8" });
    if (r.status !== 0) throw new Error(`could not start PostgreSQL: ${r.stderr.trim()} (or set FIELDTIDE_BENCH_PG_URL)`);
    admin = r.stdout.trim().split("\n").pop()!;
  }
  const name = newPgDatabaseName("fieldtide_load");
  await createPgDatabase(admin, name);
  return { url: pgDatabaseUrl(admin, name), drop: () => dropPgDatabase(admin!, name) };
}

/** Readings stored per log, and SQLite's integrity_check ("n/a" on PostgreSQL). */
async function storedReadings(db: Knex): Promise<{ stored: Map<number, number>; integrity: string }> {
  const rows = (await db("log_readings").select("log_id").count({ n: "*" }).groupBy("log_id")) as { log_id: number; n: number }[];
  const stored = new Map(rows.map((r) => [Number(r.log_id), Number(r.n)]));
  const integrity = ENGINE === "sqlite" ? ((await db.raw("pragma integrity_check")) as { integrity_check: string }[])[0].integrity_check : "n/a (PostgreSQL)";
  return { stored, integrity };
}

function pct(sorted: number[], p: number): number {
  return sorted.length === 0 ? NaN : sorted[Math.min(sorted.length - 1, Math.ceil(p * sorted.length) - 1)];
}

async function main(): Promise<void> {
  const seconds = Math.min(SECONDS, MAX_SECONDS);
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "fieldtide-load-"));
  const port = await freePort();
  const postgres = ENGINE === "postgres" ? await freshPostgres() : null;
  const env = { DATABASE_FILE: path.join(dir, "load.sqlite"), DATABASE_URL: postgres?.url ?? "", UPLOAD_DIR: path.join(dir, "uploads"), APP_URL: `http://localhost:${port}` };
  const dbConfig = postgres ? { engine: "postgres" as const, url: postgres.url } : { engine: "sqlite" as const, file: env.DATABASE_FILE };
  await runStep("npx", ["tsx", "scripts/db.ts", "migrate"], env);
  await runStep("npx", ["tsx", "scripts/db.ts", "seed"], env);
  const setupDb = createDb(dbConfig);
  const { surveyId, crewTokens, viewerTokens } = await addPeople(setupDb);
  await setupDb.destroy();
  const app = await startBuiltApp({ port, env, quiet: true });
  const url = `http://127.0.0.1:${port}`;
  const api = `${url}/api/v1/surveys/${surveyId}`;
  const auth = (t: string) => ({ authorization: `Bearer ${t}` });

  const upload = async (token: string, kind: string, body: Buffer, name: string, fields: Record<string, string>) => {
    const fd = new FormData();
    fd.append("kind", kind);
    for (const [k, v] of Object.entries(fields)) fd.append(k, v);
    fd.append("file", new Blob([new Uint8Array(body)], { type: "text/csv" }), name);
    const { res, text } = await timed(kind === "base" ? "upload base" : `upload ${ROWS}-row rover`, () => fetch(`${api}/logs`, { method: "POST", headers: auth(token), body: fd }));
    if (res?.status === 201) {
      const log = JSON.parse(text).log as { id: number; readingCount: number };
      accepted.set(log.id, log.readingCount);
    }
  };

  let stats = { uploads: 0, rowsSent: 0 };
  try {
    await upload(crewTokens[0], "base", baseLog(), "load-base.csv", { baseSiteName: "Load gate", baseLatitudeDeg: "53.6172", baseLongitudeDeg: "-1.9324" });
    const deadline = Date.now() + seconds * 1000;
    process.stdout.write(`load (${ENGINE}): ${CREWS} crews × ${ROWS}-row uploads, ${VIEWERS} viewers polling, ${seconds} s, ${url}\n`);
    const t0 = performance.now();
    const crews = crewTokens.map(async (token, crew) => {
      for (let round = 0; Date.now() < deadline; round++) {
        const body = roverLog(crew, round, ROWS);
        stats.uploads++;
        stats.rowsSent += ROWS;
        await upload(token, "rover", body, `crew${crew}-round${round}.csv`, { acceptGoodRows: "true", instrument: `ROVER-${crew}` });
      }
    });
    const views = viewerTokens.map(async (token, i) => {
      const queries = ["kind=base", "kind=rover&maxPoints=2000"];
      for (let k = i; Date.now() < deadline; k++) {
        const q = queries[k % queries.length];
        await timed(`series ${q.split("&")[0].slice(5)}`, () => fetch(`${api}/days/${DAY}/series?${q}`, { headers: auth(token) }));
        if (k % 5 === 0) await timed("day list", () => fetch(`${api}/days`, { headers: auth(token) }));
      }
    });
    await Promise.all([...crews, ...views]);
    const wallS = (performance.now() - t0) / 1000;

    // Every accepted reading is in the database: per log and in total.
    await app.stop();
    const checkDb = createDb(dbConfig);
    const { stored, integrity } = await storedReadings(checkDb);
    await checkDb.destroy();
    let acceptedTotal = 0;
    let storedTotal = 0;
    for (const [logId, n] of accepted) {
      acceptedTotal += n;
      storedTotal += stored.get(logId) ?? 0;
      if ((stored.get(logId) ?? 0) !== n) failures.push(`log ${logId}: the app accepted ${n} readings, the database holds ${stored.get(logId) ?? 0}`);
    }
    const extra = [...stored.keys()].filter((id) => !accepted.has(id));
    if (extra.length > 0) failures.push(`readings of logs no upload answer named: ${extra.join(", ")}`);
    if (ENGINE === "sqlite" && integrity !== "ok") failures.push(`integrity_check: ${integrity}`);

    process.stdout.write(`\nwall ${wallS.toFixed(1)} s; ${stats.uploads} uploads started (${stats.rowsSent} rows sent)\n`);
    process.stdout.write(`${"request".padEnd(24)} ${"n".padStart(6)} ${"failed".padStart(6)} ${"req/s".padStart(7)} ${"p50 ms".padStart(8)} ${"p95 ms".padStart(8)} ${"p99 ms".padStart(8)}\n`);
    for (const kind of [...new Set(samples.map((s) => s.kind))]) {
      const of = samples.filter((s) => s.kind === kind);
      const ms = of.map((s) => s.ms).sort((a, b) => a - b);
      process.stdout.write(
        `${kind.padEnd(24)} ${String(of.length).padStart(6)} ${String(of.filter((s) => !s.ok).length).padStart(6)} ${(of.length / wallS).toFixed(2).padStart(7)} ${pct(ms, 0.5).toFixed(0).padStart(8)} ${pct(ms, 0.95).toFixed(0).padStart(8)} ${pct(ms, 0.99).toFixed(0).padStart(8)}\n`,
      );
    }
    process.stdout.write(`readings: accepted ${acceptedTotal} in ${accepted.size} logs, stored ${storedTotal} (${(acceptedTotal / wallS).toFixed(0)} readings/s imported); lost ${acceptedTotal - storedTotal}; integrity ${integrity}\n`);
    if (failures.length > 0) {
      process.stdout.write(`\nLOAD NOT HELD: ${failures.length} problem(s)\n${failures.slice(0, 20).join("\n")}\n`);
      process.exitCode = 1;
    } else process.stdout.write("load held: no failed request, no busy/locked error, no reading lost\n");
  } finally {
    await app.stop();
    await postgres?.drop();
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

await main();
