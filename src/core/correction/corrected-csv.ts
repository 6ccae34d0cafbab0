/**
 * Corrected readings as CSV, the one row format shared by the CLI `correct` command and the
 * server's run export. One row per rover reading, in input order, columns CORRECTED_CSV_COLUMNS;
 * time ISO 8601 UTC with ms; nT to 0.001, degrees to 0.0000001 (~1 cm), height to 0.001 m; empty
 * cell = no value; flags joined with `|`. Pure: the bytes go to a caller's sink.
 */
import { CsvByteWriter, type ByteSink } from "../csv";
import type { LogReadings } from "../logs";
import type { CorrectionColumns } from "./correct-readings";
import { createFlagJoiner } from "./flags";

export const CORRECTED_CSV_COLUMNS = [
  "time", "lat", "lon", "height_m", "line", "raw_nT", "base_nT", "diurnal_nT", "corrected_nT", "reference_nT", "residual_nT", "flags",
] as const;
export type CorrectedCsvColumn = (typeof CORRECTED_CSV_COLUMNS)[number];

const NT_DECIMALS = 3;
const DEG_DECIMALS = 7;
const HEIGHT_DECIMALS = 3;
const COMMA = 44;
const LF = 10;

/** The rover columns the rows show. */
export type CorrectedCsvRover = Pick<LogReadings, "count" | "timeMs" | "fieldNt" | "latDeg" | "lonDeg" | "heightM" | "line">;

/**
 * Header and rows into `sink`; row i is rover reading i. Resolves once the sink has taken every
 * byte (a sink returning a promise may keep each buffer until it settles).
 */
export async function writeCorrectedCsv(sink: ByteSink, rover: CorrectedCsvRover, result: CorrectionColumns): Promise<void> {
  const w = new CsvByteWriter((bytes) => sink.writeBytes(bytes));
  const joinFlags = createFlagJoiner("|");
  const { timeMs, fieldNt, latDeg, lonDeg, heightM, line } = rover;
  const { baseNt, diurnalNt, correctedNt, referenceNt, residualNt, flags } = result;
  w.text(CORRECTED_CSV_COLUMNS.join(","));
  w.byte(LF);
  for (let i = 0; i < rover.count; i++) {
    w.isoTime(timeMs[i]);
    w.byte(COMMA);
    if (latDeg) w.fixed(latDeg[i], DEG_DECIMALS);
    w.byte(COMMA);
    if (lonDeg) w.fixed(lonDeg[i], DEG_DECIMALS);
    w.byte(COMMA);
    if (heightM) w.fixed(heightM[i], HEIGHT_DECIMALS);
    w.byte(COMMA);
    if (line) w.cell(line[i]);
    w.byte(COMMA);
    w.fixed(fieldNt[i], NT_DECIMALS);
    w.byte(COMMA);
    w.fixed(baseNt[i], NT_DECIMALS);
    w.byte(COMMA);
    w.fixed(diurnalNt[i], NT_DECIMALS);
    w.byte(COMMA);
    w.fixed(correctedNt[i], NT_DECIMALS);
    w.byte(COMMA);
    w.fixed(referenceNt[i], NT_DECIMALS);
    w.byte(COMMA);
    w.fixed(residualNt[i], NT_DECIMALS);
    w.byte(COMMA);
    if (flags[i]) w.cell(joinFlags(flags[i]));
    w.byte(LF);
    if (w.nearlyFull) await w.handOff();
  }
  await w.finish();
}
