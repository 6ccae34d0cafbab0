/**
 * The size hint (sizeHintBytes) only sizes the reading columns: any value, right, too small, too
 * large or nonsense, must give exactly the readings, problems and line numbers of a parse without
 * it. Synthetic logs whose answer is known by construction (the hint-free parse is the reference).
 */
import { describe, expect, it } from "vitest";
import { createLogStreamParser, ReadingColumnsBuilder, type LogParseOptions } from "@/src/core/logs";

const encoder = new TextEncoder();

/** A rover-like log of `rows` rows, with a comment, a blank line, a bad field and a bad time among them. */
function makeLog(rows: number): string {
  const lines = ["# invented test log", "time,lat,lon,height_m,line,field_nT"];
  const t0 = Date.UTC(2026, 4, 4, 5);
  for (let i = 0; i < rows; i++) {
    const time = i === 7 ? "2026-05-04T25:00:00Z" : new Date(t0 + i * 50).toISOString();
    const field = i === 11 ? "n/a" : (48_900 + ((i * 37) % 1000) / 100).toFixed(2);
    lines.push([time, (52.1 + i * 1e-6).toFixed(7), "-3.4567000", "210.00", `L${1000 + Math.floor(i / 500)}`, field].join(","));
    if (i === 20) lines.push("");
  }
  return lines.join("\n") + "\n";
}

function parse(bytes: Uint8Array, chunkBytes: number, options: LogParseOptions) {
  const parser = createLogStreamParser(options);
  for (let at = 0; at < bytes.length; at += chunkBytes) parser.push(bytes.subarray(at, at + chunkBytes));
  const r = parser.end();
  const readings = r.readings!;
  return {
    summary: { ...r, readings: null },
    count: readings.count,
    columns: [readings.timeMs, readings.fieldNt, readings.latDeg, readings.lonDeg, readings.heightM, readings.sourceLine].map((a) => Array.from(a!)),
    line: [...readings.line!],
    lineLength: readings.line!.length,
  };
}

describe("size hint", () => {
  const bytes = encoder.encode(makeLog(5000));
  const reference = parse(bytes, 1 << 20, {});

  it("the reference parse reads what the log holds", () => {
    expect(reference.count).toBe(4998);
    expect(reference.summary.rejectedCount).toBe(2);
    expect(reference.summary.rejected.map((p) => p.line)).toEqual([10, 14]);
    expect(reference.lineLength).toBe(4998);
  });

  it.each([
    ["exact", bytes.length],
    ["too small", 1000],
    ["far too small", 1],
    ["too large", bytes.length * 5],
    ["far too large", 1e12],
    ["zero", 0],
    ["negative", -5],
    ["not a number", NaN],
    ["infinite", Infinity],
  ])("%s hint gives the same readings, problems and lines, in any chunking", (_, hint) => {
    // a far too large hint reserves the most room allowed (4 Mi readings): one chunking is enough
    for (const chunk of hint > 1e9 ? [4096] : [1 << 20, 4096, 333]) {
      const r = parse(bytes, chunk, { sizeHintBytes: hint });
      expect(r).toEqual(reference);
    }
  });

  it("an exact hint sizes the columns once, close to the row count (doubling would leave 8192)", () => {
    const parser = createLogStreamParser({ sizeHintBytes: bytes.length });
    for (let at = 0; at < bytes.length; at += 4096) parser.push(bytes.subarray(at, at + 4096));
    const capacity = parser.end().readings!.timeMs.buffer.byteLength / 8;
    expect(capacity).toBeGreaterThanOrEqual(4998);
    expect(capacity).toBeLessThan(4998 * 1.1);
  });
});

describe("ReadingColumnsBuilder.reserve", () => {
  const presence = { position: true, height: true, line: true, station: true };

  it("keeps what was pushed before and after, and trims spare room on build", () => {
    const b = new ReadingColumnsBuilder(presence, 16);
    for (let i = 0; i < 20; i++) b.push(i, 48_000 + i, 50, -3, 100, `L${i}`, "S", i + 2);
    b.reserve(10_000);
    for (let i = 20; i < 30; i++) b.push(i, 48_000 + i, 50, -3, 100, `L${i}`, "S", i + 2);
    const r = b.build();
    expect(r.count).toBe(30);
    expect(Array.from(r.timeMs)).toEqual(Array.from({ length: 30 }, (_, i) => i));
    expect(Array.from(r.sourceLine)).toEqual(Array.from({ length: 30 }, (_, i) => i + 2));
    expect(r.line).toEqual(Array.from({ length: 30 }, (_, i) => `L${i}`));
    expect(r.station).toHaveLength(30);
    // far more room than used: the result does not keep the reserved buffers alive
    expect(r.timeMs.buffer.byteLength).toBe(30 * 8);
  });

  it("grows past a reserve that was too small", () => {
    const b = new ReadingColumnsBuilder(presence, 16);
    b.reserve(40);
    for (let i = 0; i < 100; i++) b.push(i, 1, 2, 3, 4, "L", "S", i + 1);
    const r = b.build();
    expect(r.count).toBe(100);
    expect(r.fieldNt[99]).toBe(1);
    expect(r.line).toHaveLength(100);
  });
});
