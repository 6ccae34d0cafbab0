/**
 * Generates the demo scenario's base and rover log files (invented data) from DEMO_DAYS:
 * the main field from the reference model, a diurnal curve shared by base and rover, a storm
 * on the disturbed day, instrument noise and resolution, and the anomalies of buried sources.
 */
import { TZDate } from "@date-fns/tz";
import { format } from "date-fns";
import { synthesizeField, type FieldModel } from "../../src/core/reference-field";
import type { DemoDay, DemoLogFormat, DemoSite, DemoSource } from "./scenario";
import { seededRandom as random, gaussian } from "../../src/lib/seeded-random";

const METRES_PER_DEGREE_LAT = 111_320;
const DIPOLE_CONSTANT_NT_M3_PER_AM2 = 100; // μ0/4π = 1e-7 T·m/A = 100 nT·m³/(A·m²)
const GPS_MINUS_UTC_MS_2026 = 18_000; // IERS Bulletin C: TAI−UTC 37 s since 2017-01-01; GPS = TAI − 19 s

function localToUtcMs(date: string, time: string, timeZone: string): number {
  const [y, m, d] = date.split("-").map(Number);
  const [hh, mm, ss] = time.split(":").map(Number);
  return new TZDate(y, m - 1, d, hh, mm, ss, timeZone).getTime();
}

/**
 * External field change at time t, nT, common to base and rover over a few km: a quiet-day
 * (Sq) dip around local solar noon, slow pulsations and, on a storm day, a sudden
 * commencement followed by a main-phase decrease with minute-scale fluctuations.
 */
function diurnalModel(day: DemoDay): (timeMs: number) => number {
  const rand = random(day.seed * 7 + 3);
  const sqAmplitudeNt = 18 + rand() * 14;
  const lonHours = day.base.site.longitudeDeg / 15;
  const phases = [rand(), rand(), rand()].map((p) => p * 2 * Math.PI);
  const stormOnsetMs = localToUtcMs(day.date, "11:40:00", day.timeZone);
  // Storm fluctuations: a smoothed random walk sampled once a minute.
  const walk: number[] = [];
  let level = 0;
  for (let i = 0; i < 24 * 60; i++) {
    level = 0.9 * level + gaussian(rand) * 9;
    walk.push(level);
  }
  return (timeMs) => {
    const utcHours = (timeMs / 3_600_000) % 24;
    const solarHour = (utcHours + lonHours + 24) % 24;
    let valueNt = -sqAmplitudeNt * Math.exp(-(((solarHour - 12.3) / 3.2) ** 2)) + 4 * Math.sin(((solarHour - 6) / 24) * 2 * Math.PI);
    valueNt += 0.6 * Math.sin(timeMs / 47_000 + phases[0]) + 0.4 * Math.sin(timeMs / 190_000 + phases[1]) + 1.2 * Math.sin(timeMs / 1_300_000 + phases[2]);
    if (day.disturbance === "storm" && timeMs >= stormOnsetMs) {
      const sinceS = (timeMs - stormOnsetMs) / 1000;
      const commencementNt = 38 * (1 - Math.exp(-sinceS / 90)) * Math.exp(-sinceS / 2400);
      const mainPhaseNt = -330 * (1 - Math.exp(-sinceS / 5400)); // a strong storm: the day ranges ~400 nT
      const minute = Math.floor(sinceS / 60);
      const frac = sinceS / 60 - minute;
      const fluctuation = (walk[minute % walk.length] ?? 0) * (1 - frac) + (walk[(minute + 1) % walk.length] ?? 0) * frac;
      valueNt += commencementNt + mainPhaseNt + fluctuation * Math.min(1, sinceS / 600);
    }
    return valueNt;
  };
}

function toLatLon(origin: DemoSite, eastM: number, northM: number): { latitudeDeg: number; longitudeDeg: number } {
  const latitudeDeg = origin.latitudeDeg + northM / METRES_PER_DEGREE_LAT;
  const longitudeDeg = origin.longitudeDeg + eastM / (METRES_PER_DEGREE_LAT * Math.cos((origin.latitudeDeg * Math.PI) / 180));
  return { latitudeDeg, longitudeDeg };
}

/** Total-field anomaly of induced dipoles (moment along the main field), nT, at a sensor height above ground. */
function anomalyNt(sources: DemoSource[], eastM: number, northM: number, sensorHeightM: number, fieldDir: [number, number, number]): number {
  let sum = 0;
  for (const s of sources) {
    const rx = eastM - s.eastM;
    const ry = northM - s.northM;
    const rz = -(sensorHeightM + s.depthM); // z down
    const r2 = rx * rx + ry * ry + rz * rz;
    const r = Math.sqrt(r2);
    // field direction in (east, north, down)
    const [fe, fn, fd] = fieldDir;
    const mDotR = (fe * rx + fn * ry + fd * rz) / r;
    const bAlongF = (DIPOLE_CONSTANT_NT_M3_PER_AM2 * s.momentAm2 * (3 * mDotR * mDotR - 1)) / (r2 * r);
    sum += bAlongF;
  }
  return sum;
}

function quantise(valueNt: number, sensor: "proton-precession" | "overhauser"): number {
  const step = sensor === "proton-precession" ? 0.1 : 0.01;
  return Math.round(valueNt / step) * step;
}

function formatTime(timeMs: number, fmt: DemoLogFormat, timeZone: string): string[] {
  switch (fmt) {
    case "csv-iso-utc":
      return [new Date(timeMs).toISOString()];
    case "semicolon-gps":
      return [new Date(timeMs + GPS_MINUS_UTC_MS_2026).toISOString().replace("T", " ").replace("Z", "")];
    case "csv-date-time-local":
    case "whitespace-date-time-local": {
      const local = new TZDate(timeMs, timeZone);
      return [format(local, "yyyy-MM-dd"), format(local, "HH:mm:ss")];
    }
  }
}

export interface GeneratedLog {
  fileName: string;
  kind: "base" | "rover";
  text: string;
  rows: number;
  timeBasis: "utc" | "gps" | "local";
}

export function generateBaseLog(day: DemoDay, model: FieldModel): GeneratedLog {
  const rand = random(day.seed);
  const diurnal = diurnalModel(day);
  const startMs = localToUtcMs(day.date, "07:00:00", day.timeZone);
  const endMs = localToUtcMs(day.date, "18:30:00", day.timeZone);
  const site = day.base.site;
  const mainNt = synthesizeField(model, { latitudeDeg: site.latitudeDeg, longitudeDeg: site.longitudeDeg, heightM: site.heightM, timeMs: startMs }).totalNt;
  const gapStart = day.baseGap ? localToUtcMs(day.date, day.baseGap.startLocal, day.timeZone) : Infinity;
  const gapEnd = day.baseGap ? gapStart + day.baseGap.minutes * 60_000 : -Infinity;
  const whitespace = day.base.format === "whitespace-date-time-local";
  const lines = [whitespace ? "DATE        TIME      FIELD_NT" : "Date,Time,Field (nT)"];
  let rows = 0;
  for (let t = startMs; t <= endMs; t += day.base.intervalS * 1000) {
    if (t >= gapStart && t < gapEnd) continue;
    const noise = gaussian(rand) * (day.base.sensor === "proton-precession" ? 0.15 : 0.04);
    const fieldNt = quantise(mainNt + diurnal(t) + noise, day.base.sensor);
    const [d, time] = formatTime(t, day.base.format, day.timeZone);
    lines.push(whitespace ? `${d}  ${time}  ${fieldNt.toFixed(2)}` : `${d},${time},${fieldNt.toFixed(day.base.sensor === "proton-precession" ? 1 : 2)}`);
    rows++;
  }
  return { fileName: `${day.surveyCode}_${day.date}_base_${day.base.instrument}.${whitespace ? "txt" : "csv"}`, kind: "base", text: lines.join("\n") + "\n", rows, timeBasis: "local" };
}

export function generateRoverLog(day: DemoDay, model: FieldModel): GeneratedLog {
  const rand = random(day.seed + 1);
  const diurnal = diurnalModel(day);
  const r = day.rover;
  const startMs = localToUtcMs(day.date, r.startLocal, day.timeZone);
  const origin = r.gridOrigin;
  const sensorHeightM = 1.2;
  const ref = synthesizeField(model, { latitudeDeg: origin.latitudeDeg, longitudeDeg: origin.longitudeDeg, heightM: origin.heightM, timeMs: startMs });
  const incl = (ref.inclinationDeg * Math.PI) / 180;
  const decl = (ref.declinationDeg * Math.PI) / 180;
  const fieldDir: [number, number, number] = [Math.cos(incl) * Math.sin(decl), Math.cos(incl) * Math.cos(decl), Math.sin(incl)];
  const semicolon = r.format === "semicolon-gps";
  const lines = [semicolon ? "UTC;Lat;Lon;Alt (m);Line;Mag" : "timestamp,latitude,longitude,elevation_m,line,station,tmi_nT"];
  let t = startMs;
  let rows = 0;
  const stepM = r.walkSpeedMps * r.intervalS;
  for (let i = 0; i < r.lineCount; i++) {
    const lineNumber = r.firstLine + i;
    const northM = r.gridOffsetNorthM + i * r.lineSpacingM;
    const eastward = i % 2 === 0;
    for (let along = 0; along <= r.lineLengthM; along += stepM) {
      const eastM = eastward ? along : r.lineLengthM - along;
      const jitterE = gaussian(rand) * 0.3;
      const jitterN = gaussian(rand) * 0.3;
      const { latitudeDeg, longitudeDeg } = toLatLon(origin, eastM + jitterE, northM + jitterN);
      const groundM = origin.heightM + 0.01 * eastM - 0.02 * northM;
      const heightM = groundM + sensorHeightM;
      const mainNt = synthesizeField(model, { latitudeDeg, longitudeDeg, heightM, timeMs: t }).totalNt;
      const noise = gaussian(rand) * (r.sensor === "proton-precession" ? 0.2 : 0.05);
      const fieldNt = quantise(mainNt + diurnal(t) + anomalyNt(day.sources, eastM, northM, sensorHeightM, fieldDir) + r.instrumentOffsetNt + noise, r.sensor);
      const [time] = formatTime(t, r.format, day.timeZone);
      const station = Math.round(along);
      lines.push(
        semicolon
          ? `${time};${latitudeDeg.toFixed(7)};${longitudeDeg.toFixed(7)};${heightM.toFixed(2)};${lineNumber};${fieldNt.toFixed(1)}`
          : `${time},${latitudeDeg.toFixed(7)},${longitudeDeg.toFixed(7)},${heightM.toFixed(2)},${lineNumber},${station},${fieldNt.toFixed(2)}`,
      );
      rows++;
      t += r.intervalS * 1000;
    }
    t += 40_000; // turn at the end of the line
  }
  return { fileName: `${day.surveyCode}_${day.date}_rover_${r.instrument}.csv`, kind: "rover", text: lines.join("\n") + "\n", rows, timeBasis: semicolon ? "gps" : "utc" };
}
