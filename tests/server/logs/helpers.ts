/** Shared pieces of the log-ingest tests: row counts, storage listing, small log texts. */
import { Readable } from "node:stream";
import { getDb } from "@/src/server/db/client";
import { listStorage } from "@/src/server/storage/original-files";

export const LOG_TABLES = ["field_logs", "log_readings", "log_problems", "log_days", "import_profiles"] as const;

export type Snapshot = Record<(typeof LOG_TABLES)[number], number> & { tempFiles: number; originals: number };

/** Row counts of every log table and the files in UPLOAD_DIR (temp and originals). */
export async function snapshot(): Promise<Snapshot> {
  const out = {} as Snapshot;
  for (const t of LOG_TABLES) {
    const row = await getDb()(t).count<{ n: number }[]>({ n: "*" });
    out[t] = Number(row[0].n);
  }
  const files = await listStorage();
  out.tempFiles = files.temp.length;
  out.originals = files.originals.length;
  return out;
}

export function streamOf(text: string | Buffer): Readable {
  return Readable.from([typeof text === "string" ? Buffer.from(text, "utf8") : text]);
}

/** A rover CSV with ISO UTC times one second apart from `startIso`, fields from `fieldAt`. */
export function roverCsv(rows: number, opts: { startIso?: string; fieldAt?: (i: number) => number; eol?: string } = {}): string {
  const start = Date.parse(opts.startIso ?? "2026-05-04T09:00:00Z");
  const eol = opts.eol ?? "\n";
  const lines = ["timestamp,latitude,longitude,elevation_m,line,station,tmi_nT"];
  for (let i = 0; i < rows; i++) {
    const t = new Date(start + i * 1000).toISOString();
    const f = (opts.fieldAt ?? ((k) => 49_500 + (k % 97) * 0.25))(i);
    lines.push(`${t},${(53.6 + i * 1e-6).toFixed(7)},${(-1.93 + i * 1e-6).toFixed(7)},318.20,100,${i},${f.toFixed(2)}`);
  }
  return lines.join(eol) + eol;
}
