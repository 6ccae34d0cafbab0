/**
 * The demo scenario's field days: invented sites, grids and people. Values are chosen to look
 * like real survey days (quiet mid-latitude Sq curves of a few tens of nT, one storm day, one
 * base gap, buried magnetised objects), not taken from any real survey.
 */

export interface DemoSite {
  name: string;
  latitudeDeg: number;
  longitudeDeg: number;
  heightM: number;
}

/** An induced dipole source: a buried steel object, in local metres east/north of the grid origin. */
export interface DemoSource {
  label: string;
  eastM: number;
  northM: number;
  depthM: number;
  /** Induced moment, A·m², along the main-field direction. */
  momentAm2: number;
}

export type DemoLogFormat = "csv-date-time-local" | "csv-iso-utc" | "whitespace-date-time-local" | "semicolon-gps";

export interface DemoDay {
  surveyCode: string;
  /** Local calendar date in the survey's time zone. */
  date: string;
  timeZone: string;
  disturbance: "quiet" | "storm";
  /** Local start and length of a missing stretch in the base record, if any. */
  baseGap?: { startLocal: string; minutes: number };
  base: { site: DemoSite; intervalS: number; instrument: string; sensor: "proton-precession" | "overhauser"; operator: string; format: DemoLogFormat };
  rover: {
    gridOrigin: DemoSite;
    lineCount: number;
    lineLengthM: number;
    lineSpacingM: number;
    /** The day's block of lines starts this far north of the grid origin, m. */
    gridOffsetNorthM: number;
    firstLine: number;
    walkSpeedMps: number;
    intervalS: number;
    startLocal: string;
    instrument: string;
    sensor: "proton-precession" | "overhauser";
    operator: string;
    /** Rover-minus-base instrument offset built into the rover readings, nT. */
    instrumentOffsetNt: number;
    format: DemoLogFormat;
  };
  sources: DemoSource[];
  /** Seed of the day's pseudo-random noise, so that generated files are reproducible. */
  seed: number;
}

const BRENNOCK_BASE: DemoSite = { name: "Brennock Moor base (gatehouse paddock)", latitudeDeg: 53.6172, longitudeDeg: -1.9324, heightM: 312 };
const BRENNOCK_GRID: DemoSite = { name: "Brennock Moor grid A", latitudeDeg: 53.6189, longitudeDeg: -1.9301, heightM: 318 };
const SALTWICK_BASE: DemoSite = { name: "Saltwick camp base", latitudeDeg: -32.9431, longitudeDeg: 138.6157, heightM: 241 };
const SALTWICK_GRID: DemoSite = { name: "Saltwick dyke traverse", latitudeDeg: -32.9402, longitudeDeg: 138.6203, heightM: 236 };

const brmBase = { site: BRENNOCK_BASE, intervalS: 3, instrument: "BASE-PP-07", sensor: "proton-precession" as const, operator: "Tomas Quill", format: "csv-date-time-local" as const };
const brmRover = {
  gridOrigin: BRENNOCK_GRID,
  lineCount: 40,
  lineLengthM: 160,
  lineSpacingM: 2,
  walkSpeedMps: 0.8,
  intervalS: 1,
  startLocal: "09:30:00",
  instrument: "ROVER-OV-12",
  sensor: "overhauser" as const,
  operator: "Tomas Quill",
  instrumentOffsetNt: 1.8,
  format: "csv-iso-utc" as const,
};
const brmSources: DemoSource[] = [
  { label: "buried tank", eastM: 62, northM: 24, depthM: 1.8, momentAm2: 14 },
  { label: "old pipe end", eastM: 118, northM: 101, depthM: 1.1, momentAm2: 3 },
  { label: "drum", eastM: 40, northM: 190, depthM: 1.4, momentAm2: 6 },
];

export const DEMO_DAYS: DemoDay[] = [
  { surveyCode: "BRM-26", date: "2026-05-04", timeZone: "Europe/London", disturbance: "quiet", base: brmBase, rover: { ...brmRover, firstLine: 100, gridOffsetNorthM: 0 }, sources: brmSources, seed: 1104 },
  {
    surveyCode: "BRM-26",
    date: "2026-05-05",
    timeZone: "Europe/London",
    disturbance: "quiet",
    baseGap: { startLocal: "11:10:00", minutes: 25 },
    base: brmBase,
    rover: { ...brmRover, firstLine: 140, gridOffsetNorthM: 80 },
    sources: brmSources,
    seed: 1105,
  },
  { surveyCode: "BRM-26", date: "2026-05-06", timeZone: "Europe/London", disturbance: "storm", base: brmBase, rover: { ...brmRover, firstLine: 180, gridOffsetNorthM: 160 }, sources: brmSources, seed: 1106 },
  {
    surveyCode: "SDK-26",
    date: "2026-06-15",
    timeZone: "Australia/Adelaide",
    disturbance: "quiet",
    base: { site: SALTWICK_BASE, intervalS: 5, instrument: "BASE-OV-02", sensor: "overhauser", operator: "Mara Tellwright", format: "whitespace-date-time-local" },
    rover: {
      gridOrigin: SALTWICK_GRID,
      lineCount: 12,
      lineLengthM: 600,
      lineSpacingM: 25,
      gridOffsetNorthM: 0,
      firstLine: 10,
      walkSpeedMps: 1.0,
      intervalS: 1,
      startLocal: "08:45:00",
      instrument: "ROVER-PP-21",
      sensor: "proton-precession",
      operator: "Mara Tellwright",
      instrumentOffsetNt: -0.9,
      format: "semicolon-gps",
    },
    sources: dykeSources(),
    seed: 2615,
  },
];
DEMO_DAYS.push({
  ...DEMO_DAYS[3],
  date: "2026-06-16",
  rover: { ...DEMO_DAYS[3].rover, firstLine: 22, gridOffsetNorthM: 300 },
  seed: 2616,
});

/** A steep magnetised dyke striking north, approximated by a row of induced dipoles. */
function dykeSources(): DemoSource[] {
  const sources: DemoSource[] = [];
  for (let northM = -200; northM <= 500; northM += 5) {
    sources.push({ label: "Saltwick dyke", eastM: 310, northM, depthM: 18, momentAm2: 2500 });
  }
  return sources;
}
