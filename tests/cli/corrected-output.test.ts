/**
 * The `correct` command's output written a batch at a time, on one thread or two: the bytes must
 * equal the whole-log writer's (writeCorrectedCsv of correctReadings) whichever thread formats a
 * batch, and whatever the second thread does (answers, refuses every job, dies mid-run, never
 * starts). Values are constructed (invented readings); the reference is WMM2025, shipped with the
 * geomagnetism package.
 */
import { afterEach, describe, expect, it } from "vitest";
import {
  correctReadings,
  createCorrector,
  createReferenceEvaluator,
  prepareBaseSeries,
  writeCorrectedCsv,
  type CorrectionColumns,
  type CorrectedCsvRover,
} from "@/src/core/correction";
import type { LogReadings } from "@/src/core/logs";
import { writeCorrectedOutput, type RowFormatter } from "@/src/cli/corrected-output";
import { FormatThread } from "@/src/cli/format-thread";
import { loadReferenceModel } from "@/src/lib/reference-model";

const T0 = Date.UTC(2026, 4, 4, 8);

function roverLog(n: number): LogReadings {
  const r: LogReadings = {
    count: n,
    timeMs: new Float64Array(n),
    fieldNt: new Float64Array(n),
    latDeg: new Float64Array(n),
    lonDeg: new Float64Array(n),
    heightM: new Float64Array(n),
    line: [],
    station: null,
    sourceLine: new Uint32Array(n),
  };
  for (let i = 0; i < n; i++) {
    // 0.2 s apart, a repeated time every 997 readings, lines of 1 500 readings, some without height or position
    r.timeMs[i] = T0 + 200 * i - (i % 997 === 1 ? 200 : 0);
    r.fieldNt[i] = 48_900 + 40 * Math.sin(i / 300) + (i % 13) * 0.01;
    r.latDeg![i] = i % 2111 === 5 ? NaN : 52.1 + i * 1e-7;
    r.lonDeg![i] = i % 2111 === 5 ? NaN : -3.45 - i * 2e-7;
    r.heightM![i] = i % 701 === 3 ? NaN : 210 + (i % 50) * 0.1;
    r.line!.push(`L${100 + Math.floor(i / 1500)}${i % 4000 === 9 ? ', "quoted"' : ""}`);
    r.sourceLine[i] = i + 2;
  }
  return r;
}

/** Base every 5 s from just after the rover starts, with a 200 s gap (over the 120 s limit) in the middle. */
function baseSeries(n: number) {
  const times: number[] = [];
  const fields: number[] = [];
  for (let t = T0 + 3_000; t <= T0 + 200 * n + 5_000; t += 5_000) {
    if (t > T0 + 100 * n && t < T0 + 100 * n + 200_000) continue;
    times.push(t);
    fields.push(48_880 + 12 * Math.cos((t - T0) / 9e5));
  }
  return prepareBaseSeries(times, fields);
}

const model = loadReferenceModel("wmm");
const N = 9_000;
const rover = roverLog(N);
const base = baseSeries(N);
const options = { datum: "median" as const, method: "linear" as const };
const reference = () => createReferenceEvaluator(model, rover, { baseTimeMs: base.timeMs });

async function bytesOf(write: (sink: { writeBytes: (b: Uint8Array) => Promise<void> }) => Promise<void>): Promise<string> {
  const pieces: Uint8Array[] = [];
  await write({ writeBytes: async (b) => void pieces.push(b.slice()) });
  return new TextDecoder().decode(Buffer.concat(pieces));
}

const expected = await bytesOf((sink) => writeCorrectedCsv(sink, rover, correctReadings(rover, base, reference(), options)));

function output(formatter: RowFormatter | null, batchReadings = 700): Promise<string> {
  return bytesOf((sink) => writeCorrectedOutput(sink, rover, createCorrector(base, reference(), options), { formatter, batchReadings }));
}

let thread: FormatThread | null = null;
afterEach(async () => {
  await thread?.stop();
  thread = null;
});

describe("writeCorrectedOutput", () => {
  it("the constructed log exercises gaps, duplicate times, missing positions and quoted lines", () => {
    expect(expected).toContain("base_gap");
    expect(expected).toContain("no_base_cover");
    expect(expected).toContain("duplicate_time");
    expect(expected).toContain("no_position");
    expect(expected).toContain('"L102, ""quoted"""');
    expect(expected.trimEnd().split("\n")).toHaveLength(N + 1);
  });

  it("one thread, in batches of any size, writes the whole-log bytes", async () => {
    for (const batch of [1, 700, 8_999, 9_000, 65_536]) expect(await output(null, batch)).toBe(expected);
  });

  it("with the second thread formatting batches from the back, writes the same bytes", async () => {
    thread = FormatThread.start();
    expect(thread).not.toBeNull();
    let delivered = 0;
    const counting: RowFormatter = {
      get failed() {
        return thread!.failed;
      },
      format: (r, start, result) => thread!.format(r, start, result).then((c) => (delivered++, c)),
    };
    expect(await output(counting)).toBe(expected);
    expect(delivered).toBeGreaterThan(0); // the thread did part of the work
  });

  it("a formatter that refuses every job, or dies after its first, changes nothing", async () => {
    const refusing: RowFormatter = { failed: false, format: () => Promise.reject(new Error("no")) };
    expect(await output(refusing)).toBe(expected);
    let jobs = 0;
    const dying: RowFormatter = {
      failed: false,
      format(r: CorrectedCsvRover, start: number, result: CorrectionColumns) {
        jobs++;
        if (jobs === 1) return thread!.format(r, start, result);
        this.failed = true;
        return Promise.reject(new Error("died"));
      },
    };
    thread = FormatThread.start();
    expect(await output(dying)).toBe(expected);
    expect(jobs).toBeGreaterThan(1);
  });

  it("a thread stopped before the run (all jobs reject at once) changes nothing", async () => {
    thread = FormatThread.start();
    await thread!.stop();
    expect(thread!.failed).toBe(true);
    expect(await output(thread)).toBe(expected);
  });
});
