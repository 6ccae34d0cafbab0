/**
 * Corrected readings as CSV, the one row format shared by the CLI `correct` command and the
 * server's run export. One row per rover reading, in input order, columns CORRECTED_CSV_COLUMNS;
 * time ISO 8601 UTC with ms; nT to 0.001, degrees to 0.0000001 (~1 cm), height to 0.001 m; empty
 * cell = no value; flags joined with `|`. Pure: the bytes go to a caller's sink.
 */
import { CsvByteWriter, encodeCell, IsoTimeBytes, ISO_TIME_BYTES, MAX_FIXED_BYTES, putBytes, putFixed3At, putFixed7At, type ByteSink } from "../csv";
import type { LogReadings } from "../logs";
import type { CorrectionColumns } from "./correct-readings";
import { flagNames } from "./flags";

export const CORRECTED_CSV_COLUMNS = [
  "time", "lat", "lon", "height_m", "line", "raw_nT", "base_nT", "diurnal_nT", "corrected_nT", "reference_nT", "residual_nT", "flags",
] as const;
export type CorrectedCsvColumn = (typeof CORRECTED_CSV_COLUMNS)[number];

const COMMA = 44;
const LF = 10;
const NO_BYTES = new Uint8Array(0);
/** A row without its line and flags cells: the time, nine numbers, eleven commas and the line feed. */
const MAX_ROW_BYTES = ISO_TIME_BYTES + 9 * MAX_FIXED_BYTES + 12;

/** The rover columns the rows show. */
export type CorrectedCsvRover = Pick<LogReadings, "count" | "timeMs" | "fieldNt" | "latDeg" | "lonDeg" | "heightM" | "line">;

/**
 * Header and rows into `sink`; row i is rover reading i. Resolves once the sink has taken every
 * byte (a sink returning a promise may keep each buffer until it settles).
 */
export async function writeCorrectedCsv(sink: ByteSink, rover: CorrectedCsvRover, result: CorrectionColumns): Promise<void> {
  const csv = new CorrectedCsvStream(sink);
  await csv.write(rover, result);
  await csv.finish();
}

/**
 * The same CSV written a batch at a time, so a caller can correct and write in batches without
 * holding corrected columns for the whole log: the header first, then each batch's rows in the
 * order they are written.
 */
export class CorrectedCsvStream {
  private readonly w: CsvByteWriter;
  private readonly times = new IsoTimeBytes();
  /** Flag bits → their cell (`a|b`); at most 64 combinations. */
  private readonly flagCells = new Map<number, Uint8Array>();

  constructor(sink: ByteSink) {
    this.w = new CsvByteWriter((bytes) => sink.writeBytes(bytes));
    this.w.text(CORRECTED_CSV_COLUMNS.join(","));
    this.w.byte(LF);
  }

  /** The rows of `result`; its row i shows rover reading roverOffset + i. */
  async write(rover: CorrectedCsvRover, result: CorrectionColumns, roverOffset = 0): Promise<void> {
    if (roverOffset < 0 || roverOffset + result.count > rover.count) throw new RangeError("corrected rows reach past the rover readings");
    for (let i = 0; i < result.count; ) {
      i = this.writeUntilFull(rover, result, roverOffset, i);
      if (this.w.nearlyFull) await this.w.handOff();
    }
  }

  /** Hand off the last bytes and wait until the sink has taken them all. */
  finish(): Promise<void> {
    return this.w.finish();
  }

  private flagCell(bits: number): Uint8Array {
    let bytes = this.flagCells.get(bits);
    if (bytes === undefined) {
      bytes = encodeCell(flagNames(bits).join("|"));
      this.flagCells.set(bits, bytes);
    }
    return bytes;
  }

  /**
   * Rows from `from` on until the buffer is nearly full or the batch ends; returns the next row.
   * Synchronous: a hot loop inside an async function runs slower.
   */
  private writeUntilFull(rover: CorrectedCsvRover, result: CorrectionColumns, roverOffset: number, from: number): number {
    const { w, times } = this;
    const { timeMs, fieldNt, latDeg, lonDeg, heightM, line } = rover;
    const { count, baseNt, diurnalNt, correctedNt, referenceNt, residualNt, flags } = result;
    let i = from;
    for (; i < count && !w.nearlyFull; i++) {
      const r = roverOffset + i;
      // one row per pass, its position in a local: a call per cell through the writer costs twice as much
      const lineCell = line ? w.cellBytes(line[r]) : NO_BYTES;
      const flagCell = flags[i] ? this.flagCell(flags[i]) : NO_BYTES;
      w.reserve(MAX_ROW_BYTES + lineCell.length + flagCell.length);
      const b = w.bytes;
      const v = w.view;
      let p = times.put(v, w.pos, timeMs[r]);
      b[p++] = COMMA;
      if (latDeg) p = putFixed7At(v, p, latDeg, r);
      b[p++] = COMMA;
      if (lonDeg) p = putFixed7At(v, p, lonDeg, r);
      b[p++] = COMMA;
      if (heightM) p = putFixed3At(v, p, heightM, r);
      b[p++] = COMMA;
      p = putBytes(b, p, lineCell);
      b[p++] = COMMA;
      p = putFixed3At(v, p, fieldNt, r);
      b[p++] = COMMA;
      p = putFixed3At(v, p, baseNt, i);
      b[p++] = COMMA;
      p = putFixed3At(v, p, diurnalNt, i);
      b[p++] = COMMA;
      p = putFixed3At(v, p, correctedNt, i);
      b[p++] = COMMA;
      p = putFixed3At(v, p, referenceNt, i);
      b[p++] = COMMA;
      p = putFixed3At(v, p, residualNt, i);
      b[p++] = COMMA;
      p = putBytes(b, p, flagCell);
      b[p++] = LF;
      w.pos = p;
    }
    return i;
  }
}
