/**
 * Invented bench data in bench/out/ (git-ignored): one day of 1 Hz base readings and 1 000 000
 * rover readings at 20 Hz walking lines over a ~2 km block (invented site), with positions.
 */
import fs from "node:fs";
import path from "node:path";
import { seededRandom as random } from "../src/lib/seeded-random";

export const BASE_ROWS = 86_400;
export const ROVER_ROWS = 1_000_000;
const DAY_MS = Date.UTC(2026, 4, 4);
const ROVER_START_MS = DAY_MS + 5 * 3_600_000;
const ROVER_STEP_MS = 50;
const SITE_LAT_DEG = 52.1234;
const SITE_LON_DEG = -3.4567;

function diurnalNt(timeMs: number): number {
  const hours = (timeMs - DAY_MS) / 3_600_000;
  return 48_900 + 25 * Math.sin(((hours - 6) / 24) * 2 * Math.PI) + 3 * Math.sin(hours * 5.1);
}

function writeLines(file: string, header: string, rows: number, row: (i: number) => string): void {
  const fd = fs.openSync(file, "w");
  let chunk = header + "\n";
  for (let i = 0; i < rows; i++) {
    chunk += row(i) + "\n";
    if (chunk.length > 1 << 20) {
      fs.writeSync(fd, chunk);
      chunk = "";
    }
  }
  fs.writeSync(fd, chunk);
  fs.closeSync(fd);
}

export function generateBenchData(outDir: string): { baseFile: string; roverFile: string } {
  fs.mkdirSync(outDir, { recursive: true });
  const baseFile = path.join(outDir, "base-1hz-day.csv");
  const roverFile = path.join(outDir, "rover-1m.csv");
  if (!fs.existsSync(baseFile)) {
    const rnd = random(1);
    writeLines(baseFile, "time,field_nT", BASE_ROWS, (i) => {
      const t = DAY_MS + i * 1000;
      return `${new Date(t).toISOString()},${(diurnalNt(t) + (rnd() - 0.5) * 0.2).toFixed(2)}`;
    });
  }
  if (!fs.existsSync(roverFile)) {
    const rnd = random(2);
    const rowsPerLine = 2000; // 100 s per 2 km-ish line at 20 Hz
    writeLines(roverFile, "time,lat,lon,height_m,line,field_nT", ROVER_ROWS, (i) => {
      const t = ROVER_START_MS + i * ROVER_STEP_MS;
      const line = Math.floor(i / rowsPerLine);
      const along = (i % rowsPerLine) / rowsPerLine;
      const latDeg = SITE_LAT_DEG + (line % 2 === 0 ? along : 1 - along) * 0.018;
      const lonDeg = SITE_LON_DEG + line * 0.00006;
      const anomaly = 40 * Math.exp(-(((along - 0.5) * 20) ** 2));
      const field = diurnalNt(t) + 60 + anomaly + (rnd() - 0.5) * 0.5;
      return `${new Date(t).toISOString()},${latDeg.toFixed(7)},${lonDeg.toFixed(7)},${(210 + 5 * along).toFixed(2)},L${1000 + line},${field.toFixed(2)}`;
    });
  }
  return { baseFile, roverFile };
}
