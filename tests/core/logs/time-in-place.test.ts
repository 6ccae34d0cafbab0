/**
 * The log scanner reads the time cell in place when it has the fixed layout and the same length
 * as the previous row's; every row must still get exactly the time the timestamp reader gives for
 * its cell text (the reader's own tests hold it to ISO 8601 and the zone rules), and the same
 * refusals, whatever mix of lengths, spellings, padding and line ends the log has.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { parseLogText } from "@/src/core/logs";
import { createTimestampReader, type TimeReadOptions } from "@/src/core/time";

const timeCellArb = fc
  .tuple(
    fc.integer({ min: 0, max: 59 }),
    fc.integer({ min: 0, max: 59 }),
    fc.constantFrom("", ".5", ".05", ".123", ".1234", ".99951", "."),
    fc.constantFrom("Z", "", "+02:00", " UTC"),
    fc.constantFrom("T", " ", "t"),
    fc.constantFrom("-", "/"),
    fc.constantFrom("", " "),
  )
  .map(([mi, s, frac, zone, sep, dash, pad]) => {
    const two = (v: number) => String(v).padStart(2, "0");
    return `${pad}2026${dash}05${dash}04${sep}09:${two(mi)}:${two(s)}${frac}${zone}${pad}`;
  });
const oddCellArb = fc.constantFrom("", "2026-05-04T25:00:00Z", "2026-02-30T00:00:00Z", "09:15:00", "garbage", "20260504T091500Z", "2026-05-04T09:15:60Z");
const cellArb = fc.oneof({ weight: 6, arbitrary: timeCellArb }, { weight: 1, arbitrary: oddCellArb });

function expectedTime(cell: string, options: TimeReadOptions): number {
  const text = cell.trim();
  if (text.length === 0) return NaN;
  try {
    return createTimestampReader(options).parse(text);
  } catch {
    return NaN;
  }
}

describe("time read while the line is cut", () => {
  it.each([
    ["\n", {}],
    ["\r\n", {}],
    ["\n", { timeZone: "Europe/Berlin", clockOffsetS: 1.5 }],
    ["\r\n", { timeBasis: "gps" as const }],
  ])("line end %j, options %j: every row has the reader's time for its cell", (eol, options) => {
    fc.assert(
      fc.property(fc.array(cellArb, { minLength: 1, maxLength: 40 }), fc.boolean(), (cells, timeLast) => {
        const rows = cells.map((t, i) => (timeLast ? `${48_000 + i},${t}` : `${t},${48_000 + i}`));
        const head = timeLast ? "field,time" : "time,field";
        const r = parseLogText(head + eol + rows.join(eol) + eol, options);
        const expected = cells.map((t) => expectedTime(t, options));
        const keptTimes = expected.filter((v) => !Number.isNaN(v));
        expect(Array.from(r.readings.timeMs)).toEqual(keptTimes);
        expect(Array.from(r.readings.fieldNt)).toEqual(expected.flatMap((v, i) => (Number.isNaN(v) ? [] : [48_000 + i])));
        expect(r.rejected.map((p) => p.line)).toEqual(expected.flatMap((v, i) => (Number.isNaN(v) ? [i + 2] : [])));
      }),
      { numRuns: 150 },
    );
  });
});
