/**
 * Synthetic base and rover logs for the day-workspace tests. Known by construction: the base
 * follows a smooth made-up diurnal curve, the rover walks east–west lines over a flat field plus
 * the same diurnal, so a correction against the base leaves the rover's own level.
 */
import { Readable } from "node:stream";

export const DAY = "2026-05-04";
const START_MS = Date.parse("2026-05-04T08:00:00Z");

export const diurnalAt = (ms: number) => 12 * Math.sin(((ms - START_MS) / 3_600_000) * 0.7) + 3 * Math.cos((ms - START_MS) / 1_700_000);

/** Base: every 3 s from 08:00 to 12:00 UTC, optional gap (minutes after 08:00). */
export function baseCsv(opts: { levelNt?: number; gap?: { fromMin: number; toMin: number }; startMs?: number; endMs?: number } = {}): string {
  const level = opts.levelNt ?? 49_310;
  const lines = ["time,field_nT"];
  const start = opts.startMs ?? START_MS;
  const end = opts.endMs ?? START_MS + 4 * 3_600_000;
  for (let t = start; t <= end; t += 3000) {
    const min = (t - START_MS) / 60_000;
    if (opts.gap && min > opts.gap.fromMin && min < opts.gap.toMin) continue;
    lines.push(`${new Date(t).toISOString()},${(level + diurnalAt(t)).toFixed(2)}`);
  }
  return lines.join("\n") + "\n";
}

/** Rover: 1 s readings from 08:30, `lines` lines of `perLine` readings, a duplicate time on line 2. */
export function roverCsv(opts: { lines?: number; perLine?: number; anomalyNt?: number; withBaseStation?: boolean } = {}): string {
  const nLines = opts.lines ?? 4;
  const perLine = opts.perLine ?? 600;
  const rows = ["timestamp,latitude,longitude,elevation_m,line,station,tmi_nT"];
  let t = START_MS + 30 * 60_000;
  for (let l = 0; l < nLines; l++) {
    for (let i = 0; i < perLine; i++) {
      const east = l % 2 === 0 ? i : perLine - 1 - i;
      const lat = 53.6189 + l * 2e-5;
      const lon = -1.9301 + east * 1.5e-5;
      const anomaly = (opts.anomalyNt ?? 40) * Math.exp(-(((east - perLine / 2) / 20) ** 2)) * (l === 1 ? 1 : 0.3);
      const field = 49_480 + anomaly + diurnalAt(t);
      const station = opts.withBaseStation && i === 0 ? "BASE" : String(east);
      rows.push(`${new Date(t).toISOString()},${lat.toFixed(7)},${lon.toFixed(7)},318.2,L${100 + l},${station},${field.toFixed(2)}`);
      if (!(l === 1 && i === 10)) t += 1000; // one repeated time
    }
    t += 45_000;
  }
  return rows.join("\n") + "\n";
}

export function streamOf(text: string): Readable {
  return Readable.from([Buffer.from(text, "utf8")]);
}

export const BASE_POSITION = { latDeg: 53.6172, lonDeg: -1.9324, heightM: 312 };
