/**
 * Bench: the day workspace against the running, built app. A day of 86 400 base readings (1 Hz)
 * and 200 000 rover readings (5 Hz, 400 lines) is uploaded through the log API into a fresh
 * database; then a correction run is timed from POST …/runs until its status is done, and the
 * series endpoint is timed for each chart request the day page makes (median and p95 over
 * `requests` calls each, the first, cold call reported apart).
 *
 * Targets (issue 5): series median < 200 ms; correction run < 10 s.
 *
 * Standalone: `npx tsx bench/series-bench.ts` (needs `next build` done; uses a port 3200–3299).
 * From a runner: `import { runSeriesBench } from "./series-bench"; const report = await runSeriesBench();`
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { runStep, startBuiltApp } from "../scripts/lib/app-process";
import { DEMO_SIGN_INS } from "../seeds/demo-users";

export const SERIES_MEDIAN_TARGET_MS = 200;
export const RUN_TARGET_S = 10;
export const BASE_READINGS = 86_400;
export const ROVER_READINGS = 200_000;
const DAY = "2026-05-04";
const LOCAL_MIDNIGHT_MS = Date.parse("2026-05-03T23:00:00Z"); // BRM-26 is Europe/London (BST, UTC+1)

export interface SeriesBenchReport {
  baseReadings: number;
  roverReadings: number;
  uploadSeconds: number;
  runSeconds: number;
  runWithinTarget: boolean;
  series: { request: string; coldMs: number; medianMs: number; p95Ms: number; points: number }[];
  seriesWithinTarget: boolean;
}

function baseText(): string {
  const rows = ["time,field_nT"];
  for (let i = 0; i < BASE_READINGS; i++) {
    const t = LOCAL_MIDNIGHT_MS + i * 1000;
    const h = i / 3600;
    rows.push(`${new Date(t).toISOString()},${(49_310 + 22 * Math.sin(((h - 6) / 24) * 2 * Math.PI) + 0.3 * Math.sin(i / 7)).toFixed(2)}`);
  }
  return rows.join("\n") + "\n";
}

function roverText(): string {
  const rows = ["timestamp,latitude,longitude,elevation_m,line,station,tmi_nT"];
  const start = Date.parse("2026-05-04T07:00:00Z");
  const perLine = ROVER_READINGS / 400;
  for (let i = 0; i < ROVER_READINGS; i++) {
    const line = Math.floor(i / perLine);
    const k = i % perLine;
    const east = line % 2 === 0 ? k : perLine - 1 - k;
    const t = start + i * 200;
    const h = (t - LOCAL_MIDNIGHT_MS) / 3_600_000;
    const anomaly = 60 * Math.exp(-(((east - 250) / 15) ** 2 + ((line - 200) / 8) ** 2));
    const field = 49_480 + 22 * Math.sin(((h - 6) / 24) * 2 * Math.PI) + anomaly;
    rows.push(`${new Date(t).toISOString()},${(53.6189 + line * 1.8e-5).toFixed(7)},${(-1.9301 + east * 0.6e-5).toFixed(7)},318.20,L${1000 + line},${east},${field.toFixed(2)}`);
  }
  return rows.join("\n") + "\n";
}

const pct = (sorted: number[], p: number) => sorted[Math.min(sorted.length - 1, Math.floor(p * sorted.length))];

export async function runSeriesBench(opts: { port?: number; requests?: number; log?: (s: string) => void } = {}): Promise<SeriesBenchReport> {
  const log = opts.log ?? ((s: string) => process.stdout.write(s + "\n"));
  const requests = opts.requests ?? 25;
  const port = opts.port ?? 3200 + Math.floor(Math.random() * 90);
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "fieldtide-series-bench-"));
  const env = { DATABASE_FILE: path.join(dir, "bench.sqlite"), UPLOAD_DIR: path.join(dir, "uploads"), APP_URL: `http://localhost:${port}` };
  await runStep("npx", ["tsx", "scripts/db.ts", "migrate"], env);
  await runStep("npx", ["tsx", "scripts/db.ts", "seed"], env);
  const app = await startBuiltApp({ port, env, quiet: true });
  const url = app.url;
  try {
    const who = DEMO_SIGN_INS.find((u) => u.email.startsWith("processor@"))!;
    const signIn = await fetch(`${url}/api/v1/auth/sign-in`, {
      method: "POST", headers: { "content-type": "application/json", origin: url }, body: JSON.stringify({ email: who.email, password: who.password }),
    });
    const cookie = (signIn.headers.get("set-cookie") ?? "").split(";")[0];
    const page = await (await fetch(`${url}/surveys`, { headers: { cookie } })).text();
    const surveyId = /href="\/surveys\/([0-9a-f-]{36})"[^>]*>(?:(?!<\/a>).)*BRM-26/s.exec(page)?.[1] ?? /\/surveys\/([0-9a-f-]{36})/.exec(page)?.[1];
    if (!surveyId) throw new Error("BRM-26 not found on /surveys");
    const upload = async (text: string, name: string, fields: Record<string, string>) => {
      const fd = new FormData();
      for (const [k, v] of Object.entries(fields)) fd.append(k, v);
      fd.append("file", new Blob([text], { type: "text/csv" }), name);
      const res = await fetch(`${url}/api/v1/surveys/${surveyId}/logs`, { method: "POST", body: fd, headers: { cookie, origin: url } });
      if (res.status !== 201) throw new Error(`upload ${name}: ${res.status} ${(await res.text()).slice(0, 300)}`);
    };
    const t0 = performance.now();
    await upload(baseText(), "bench-base.csv", { kind: "base", baseSiteName: "Bench base", baseLatitudeDeg: "53.6172", baseLongitudeDeg: "-1.9324", baseHeightM: "312", timeBasis: "utc" });
    await upload(roverText(), "bench-rover.csv", { kind: "rover", timeBasis: "utc" });
    const uploadSeconds = (performance.now() - t0) / 1000;
    log(`uploaded ${BASE_READINGS} base + ${ROVER_READINGS} rover readings in ${uploadSeconds.toFixed(1)} s`);

    const api = `${url}/api/v1/surveys/${surveyId}/days/${DAY}`;
    const r0 = performance.now();
    const post = await fetch(`${api}/runs`, { method: "POST", headers: { cookie, origin: url } });
    if (post.status !== 202) throw new Error(`run: ${post.status} ${await post.text()}`);
    const { run } = (await post.json()) as { run: { number: number } };
    let status = "queued";
    let polls = 0, pollMaxMs = 0;
    while (status === "queued" || status === "running") {
      await new Promise((r) => setTimeout(r, 100));
      const p0 = performance.now();
      const got = (await (await fetch(`${api}/runs/${run.number}`, { headers: { cookie } })).json()) as { run: { status: string; error: string | null } };
      pollMaxMs = Math.max(pollMaxMs, performance.now() - p0);
      polls++;
      status = got.run.status;
      if (status === "failed") throw new Error(`run failed: ${got.run.error}`);
    }
    const runSeconds = (performance.now() - r0) / 1000;
    log(`correction run of ${ROVER_READINGS} readings: ${runSeconds.toFixed(2)} s (${polls} polls while it ran, slowest poll answer ${pollMaxMs.toFixed(0)} ms)`);

    const lineRes = (await (await fetch(`${api}/series?kind=rover&maxPoints=10`, { headers: { cookie } })).json()) as { lines: { line: string }[] };
    const midLine = lineRes.lines[Math.floor(lineRes.lines.length / 2)].line;
    const cases = [
      "kind=base",
      "kind=rover&maxPoints=10",
      `kind=rover&line=${encodeURIComponent(midLine)}`,
      "kind=corrected",
      `kind=corrected&line=${encodeURIComponent(midLine)}`,
    ];
    const series: SeriesBenchReport["series"] = [];
    for (const q of cases) {
      const times: number[] = [];
      let points = 0;
      for (let i = 0; i <= requests; i++) {
        const s0 = performance.now();
        const res = await fetch(`${api}/series?${q}`, { headers: { cookie } });
        const body = (await res.json()) as { t?: number[]; profile?: { t: number[] }; plan?: { latDeg: number[] } };
        if (!res.ok) throw new Error(`series ${q}: ${res.status}`);
        times.push(performance.now() - s0);
        points = body.t?.length ?? body.profile?.t.length ?? body.plan?.latDeg.length ?? 0;
      }
      const [cold, ...warm] = times;
      warm.sort((a, b) => a - b);
      series.push({ request: q, coldMs: cold, medianMs: pct(warm, 0.5), p95Ms: pct(warm, 0.95), points });
      log(`series ${q.padEnd(36)} cold ${cold.toFixed(0).padStart(5)} ms  median ${pct(warm, 0.5).toFixed(1).padStart(6)} ms  p95 ${pct(warm, 0.95).toFixed(1).padStart(6)} ms  points ${points}`);
    }
    const report: SeriesBenchReport = {
      baseReadings: BASE_READINGS,
      roverReadings: ROVER_READINGS,
      uploadSeconds,
      runSeconds,
      runWithinTarget: runSeconds < RUN_TARGET_S,
      series,
      seriesWithinTarget: series.every((s) => s.medianMs < SERIES_MEDIAN_TARGET_MS),
    };
    log(JSON.stringify(report));
    return report;
  } finally {
    await app.stop();
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  runSeriesBench().then(
    (r) => process.exit(r.runWithinTarget && r.seriesWithinTarget ? 0 : 1),
    (err: unknown) => {
      process.stderr.write(`series bench failed: ${err instanceof Error ? err.message : String(err)}\n`);
      process.exit(1);
    },
  );
}
