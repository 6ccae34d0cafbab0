/**
 * Property tests of the delimited-log parser (src/core/logs): random valid logs must give exactly
 * the readings they were built from, any split into chunks must give the same result as the whole
 * text, and random or damaged input must give a parse that keeps the parser's own accounting
 * rules, or a LogFormatError; never another exception, never a slow call.
 * Synthetic data whose answer is known by construction (see ./log-generator.ts).
 */
import fc from "fast-check";
import { afterAll, describe, expect, it } from "vitest";
import {
  createLogStreamParser,
  DEFAULT_FIELD_RANGE_NT,
  LogFormatError,
  parseLogText,
  type LogParseOptions,
  type LogReadings,
} from "@/src/core/logs";
import {
  applyDamages,
  bytesAsTextArb,
  damagesArb,
  outcomeOf,
  printRunLog,
  runProperty,
  splitArb,
  splitBytes,
  splitText,
  withinTime,
  type Damage,
  type Outcome,
} from "./fuzz-support";
import { validLogArb, type ExpectedReading, type GeneratedLog } from "./log-generator";

afterAll(() => printRunLog("log-parser"));

const BUDGET = { numRuns: 300, timeLimitMs: 2500 };

function readingAt(r: LogReadings, i: number): ExpectedReading {
  return {
    timeMs: r.timeMs[i],
    fieldNt: r.fieldNt[i],
    latDeg: r.latDeg ? r.latDeg[i] : NaN,
    lonDeg: r.lonDeg ? r.lonDeg[i] : NaN,
    heightM: r.heightM ? r.heightM[i] : NaN,
    line: r.line ? r.line[i] : "",
    station: r.station ? r.station[i] : "",
    sourceLine: r.sourceLine[i],
  };
}

function allReadings(r: LogReadings): ExpectedReading[] {
  return Array.from({ length: r.count }, (_, i) => readingAt(r, i));
}

/** Plain data of a parse (typed arrays as arrays, NaN kept by toEqual) or of its error, to compare two runs. */
function comparable(o: Outcome<ReturnType<typeof parseLogText>>): unknown {
  if (!o.ok) return { error: o.error instanceof Error ? `${o.error.name}: ${o.error.message}` : String(o.error) };
  const { readings, ...summary } = o.value;
  return { summary, readings: allReadings(readings), columns: [!!readings.latDeg, !!readings.heightM, !!readings.line, !!readings.station] };
}

function parseWhole(text: string, options?: LogParseOptions) {
  return outcomeOf(() => withinTime(() => parseLogText(text, options)));
}

function parseChunks(chunks: readonly (string | Uint8Array)[], options?: LogParseOptions) {
  return outcomeOf(() =>
    withinTime(() => {
      const p = createLogStreamParser(options);
      for (const c of chunks) p.push(c);
      const r = p.end();
      return { ...r, readings: r.readings! };
    }),
  );
}

/** Chunked with an onBatch sink: the batches joined must equal the accumulated readings. */
function parseBatches(chunks: readonly string[]) {
  return outcomeOf(() =>
    withinTime(() => {
      const batches: ExpectedReading[][] = [];
      const p = createLogStreamParser({}, { onBatch: (b) => batches.push(allReadings(b)) });
      for (const c of chunks) p.push(c);
      const r = p.end();
      expect(r.readings).toBeNull();
      return batches.flat();
    }),
  );
}

/** What must hold for any parse that did not throw, whatever the input. */
function expectConsistent(text: string, r: ReturnType<typeof parseLogText>): void {
  const lineCount = text.split("\n").length;
  const n = r.readings.count;
  expect(r.acceptedCount + r.rejectedCount).toBe(r.rowCount);
  expect(n).toBe(r.acceptedCount);
  expect(r.rejected.length).toBe(Math.min(r.rejectedCount, 10_000));
  expect(r.issues.length).toBe(Math.min(r.issueCount, 10_000));
  let issues = 0;
  for (let i = 0; i < n; i++) {
    const t = r.readings.timeMs[i];
    expect(Number.isInteger(t)).toBe(true);
    const f = r.readings.fieldNt[i];
    expect(f >= DEFAULT_FIELD_RANGE_NT.minNt && f <= DEFAULT_FIELD_RANGE_NT.maxNt, `field ${f}`).toBe(true);
    if (r.readings.latDeg) {
      const lat = r.readings.latDeg[i], lon = r.readings.lonDeg![i];
      expect(Number.isNaN(lat) || (lat >= -90 && lat <= 90)).toBe(true);
      expect(Number.isNaN(lon) || (lon >= -180 && lon <= 180)).toBe(true);
      expect(Number.isNaN(lat)).toBe(Number.isNaN(lon));
    }
    if (r.readings.heightM) expect(Number.isNaN(r.readings.heightM[i]) || Number.isFinite(r.readings.heightM[i])).toBe(true);
    const line = r.readings.sourceLine[i];
    expect(line >= 2 && line <= lineCount, `source line ${line} of ${lineCount}`).toBe(true);
    if (i > 0) {
      expect(line).toBeGreaterThan(r.readings.sourceLine[i - 1]);
      if (t <= r.readings.timeMs[i - 1]) issues++;
    }
  }
  expect(r.issueCount).toBe(issues);
  for (const p of [...r.rejected, ...r.issues]) {
    expect(p.line >= 2 && p.line <= lineCount, `problem line ${p.line} of ${lineCount}`).toBe(true);
    expect(p.message.length).toBeGreaterThan(0);
  }
  for (let i = 1; i < r.rejected.length; i++) expect(r.rejected[i].line).toBeGreaterThan(r.rejected[i - 1].line);
}

/** A parse that is consistent, or a LogFormatError with a message; anything else fails the property. */
function expectParseOrFormatError(text: string, o: Outcome<ReturnType<typeof parseLogText>>): void {
  if (o.ok) expectConsistent(text, o.value);
  else {
    if (!(o.error instanceof LogFormatError)) throw o.error;
    expect(o.error.message.length).toBeGreaterThan(0);
  }
}

function expectExactly(log: GeneratedLog, r: ReturnType<typeof parseLogText>): void {
  expect(r.delimiter).toBe(log.delimiter);
  expect(r.header).toEqual(log.header);
  expect(r.rejected).toEqual([]);
  expect(r.rowCount).toBe(log.readings.length);
  expect(r.issueCount).toBe(log.expectedIssues);
  expect(!!r.readings.latDeg).toBe(log.present.position);
  expect(!!r.readings.heightM).toBe(log.present.height);
  expect(!!r.readings.line).toBe(log.present.line);
  expect(!!r.readings.station).toBe(log.present.station);
  expect(allReadings(r.readings)).toEqual(log.readings);
}

describe("random valid logs", () => {
  it("parse to exactly the generated readings, file lines and issues", () => {
    runProperty(
      "valid exact",
      fc.property(validLogArb(), (log) => {
        const o = parseWhole(log.text);
        if (!o.ok) throw o.error;
        expectExactly(log, o.value);
      }),
      BUDGET,
    );
  });

  it("any split into chunks gives the same result as the whole text, and batches join to the same readings", () => {
    runProperty(
      "valid chunked",
      fc.property(validLogArb(), splitArb, (log, cuts) => {
        const chunks = splitText(log.text, cuts);
        const whole = parseWhole(log.text);
        expect(comparable(parseChunks(chunks))).toEqual(comparable(whole));
        const batches = parseBatches(chunks);
        if (!batches.ok) throw batches.error;
        expect(batches.value).toEqual(log.readings);
      }),
      BUDGET,
    );
  });

  it("its UTF-8 bytes, split anywhere (inside a character too), give the same result as the whole text", () => {
    runProperty(
      "valid byte chunks",
      fc.property(validLogArb(), splitArb, (log, cuts) => {
        const chunks = splitBytes(new TextEncoder().encode(log.text), cuts);
        expect(comparable(parseChunks(chunks))).toEqual(comparable(parseWhole(log.text)));
      }),
      BUDGET,
    );
  });

  it("one character per chunk gives the same result as the whole text", () => {
    runProperty(
      "valid char by char",
      fc.property(validLogArb(), (log) => {
        expect(comparable(parseChunks([...log.text.slice(0, 1500)]))).toEqual(comparable(parseWhole(log.text.slice(0, 1500))));
      }),
      { numRuns: 100, timeLimitMs: 2000 },
    );
  });
});

/** Damage that moves whole lines only: every line left is an original line. */
const lineDamagesArb = fc.array(
  fc.oneof(
    fc.double({ min: 0, max: 1, maxExcluded: true, noNaN: true }).map((line) => ({ op: "deleteLine", line }) as Damage),
    fc.double({ min: 0, max: 1, maxExcluded: true, noNaN: true }).map((line) => ({ op: "duplicateLine", line }) as Damage),
    fc
      .tuple(fc.double({ min: 0, max: 1, maxExcluded: true, noNaN: true }), fc.double({ min: 0, max: 1, maxExcluded: true, noNaN: true }))
      .map(([a, b]) => ({ op: "swapLines", a, b }) as Damage),
  ),
  { minLength: 1, maxLength: 3 },
);

describe("per-log clock offset", () => {
  it("shifts every reading by exactly the offset (rounded to the ms) and changes nothing else", () => {
    runProperty(
      "clock offset",
      fc.property(validLogArb(), fc.double({ min: -86_400, max: 86_400, noNaN: true }), (log, clockOffsetS) => {
        const o = parseWhole(log.text, { clockOffsetS });
        if (!o.ok) throw o.error;
        const shiftMs = Math.round(clockOffsetS * 1000);
        expectExactly({ ...log, readings: log.readings.map((r) => ({ ...r, timeMs: r.timeMs + shiftMs })) }, o.value);
      }),
      { numRuns: 200, timeLimitMs: 2000 },
    );
  });
});

describe("CRLF logs with quoted cells", () => {
  // Once found here: when a row ending in a quoted cell and CRLF was the last complete line of a
  // block handed to papaparse (always true for the file's last row), its last cell kept the
  // closing quote (a number rejected as non_numeric_field, a station stored as `S999"`), one row
  // per pushed chunk. Windows spreadsheet exports look exactly like this.
  it("parse to exactly the generated readings, whole and in any chunks", () => {
    runProperty(
      "crlf quoted",
      fc.property(validLogArb({ crlfQuoted: true }), splitArb, (log, cuts) => {
        const whole = parseWhole(log.text);
        if (!whole.ok) throw whole.error;
        expectExactly(log, whole.value);
        expect(comparable(parseChunks(splitText(log.text, cuts)))).toEqual(comparable(whole));
        expect(comparable(parseChunks(splitBytes(new TextEncoder().encode(log.text), cuts)))).toEqual(comparable(whole));
      }),
      { numRuns: 200, timeLimitMs: 2000 },
    );
  });
});

describe("text chunks cut inside a surrogate pair", () => {
  // Once found here: push(string) encoded each chunk to UTF-8 on its own, so a chunk ending
  // between the two halves of a surrogate pair (e.g. "𐀀" cut after one code unit) turned both
  // halves into U+FFFD. The parser now holds a trailing high surrogate back for the next chunk.
  it("give the same result as the whole text", () => {
    runProperty(
      "surrogate split",
      fc.property(fc.constantFrom("time,field,station\n2026-05-04T09:00:00Z,48000,\u{1F6F0}A\n", "\u{10000}time,field\n"), (text) => {
        const cut = text.search(/[\uD800-\uDBFF]/) + 1;
        expect(comparable(parseChunks([text.slice(0, cut), text.slice(cut)]))).toEqual(comparable(parseWhole(text)));
      }),
      { numRuns: 10, timeLimitMs: 1000, minRuns: 1 },
    );
  });

  it("random logs with characters beyond the BMP (and lone halves) put in anywhere, cut at any code unit, give the same result as the whole text", () => {
    const fraction = fc.double({ min: 0, max: 1, maxExcluded: true, noNaN: true });
    const wideArb = fc.constantFrom("\u{1F6F0}", "\u{10000}", "\u{10FFFF}", "\uD800", "\uDC00", "\uD83D\uDE00\uD83D");
    runProperty(
      "surrogate splits anywhere",
      fc.property(validLogArb(), fc.array(fc.tuple(fraction, wideArb), { minLength: 1, maxLength: 6 }), splitArb, (log, inserts, cuts) => {
        let text = log.text;
        for (const [at, piece] of inserts) {
          const i = Math.floor(at * (text.length + 1));
          text = text.slice(0, i) + piece + text.slice(i);
        }
        // random cuts, and a cut right after every high surrogate (inside each pair)
        const chunks: string[] = [];
        for (const piece of splitText(text, cuts, { anyCodeUnit: true })) {
          let at = 0;
          for (let k = 0; k < piece.length; k++) {
            const c = piece.charCodeAt(k);
            if (c >= 0xd800 && c <= 0xdbff) {
              chunks.push(piece.slice(at, k + 1));
              at = k + 1;
            }
          }
          chunks.push(piece.slice(at));
        }
        expect(comparable(parseChunks(chunks))).toEqual(comparable(parseWhole(text)));
      }),
      BUDGET,
    );
  });
});

describe("damaged valid logs", () => {
  it("deleted, duplicated or swapped lines: every accepted reading is the row written on its line", () => {
    runProperty(
      "line damage",
      fc.property(validLogArb(), lineDamagesArb, (log, damages) => {
        const text = applyDamages(log.text, damages);
        const o = parseWhole(text);
        expectParseOrFormatError(text, o);
        if (!o.ok) return;
        const lines = text.split("\n");
        for (const got of allReadings(o.value.readings)) {
          const written = lines[got.sourceLine - 1].replace(/\r$/, "").replace(/^\uFEFF/, "");
          const want = log.rowLines.get(written);
          expect(want, `line ${got.sourceLine} ${JSON.stringify(written)} is not a data row`).toBeDefined();
          expect({ ...got, sourceLine: 0 }).toEqual({ ...want!, sourceLine: 0 });
        }
      }),
      BUDGET,
    );
  });

  it("any damage (truncate, flip, inject NUL/BOM/CR/quotes, move lines): a consistent parse or a LogFormatError", () => {
    runProperty(
      "any damage",
      fc.property(validLogArb(), damagesArb, (log, damages) => {
        const text = applyDamages(log.text, damages);
        expectParseOrFormatError(text, parseWhole(text));
      }),
      { numRuns: 500, timeLimitMs: 3000 },
    );
  });

  it("damaged logs give the same result whole and in any text or byte chunks", () => {
    runProperty(
      "damage chunked",
      fc.property(validLogArb(), damagesArb, splitArb, (log, damages, cuts) => {
        const text = applyDamages(log.text, damages);
        const whole = comparable(parseWhole(text));
        expect(comparable(parseChunks(splitText(text, cuts, { anyCodeUnit: true })))).toEqual(whole);
        expect(comparable(parseChunks(splitBytes(new TextEncoder().encode(text), cuts)))).toEqual(whole);
      }),
      { numRuns: 400, timeLimitMs: 3000 },
    );
  });
});

/** Text made of the pieces logs are made of, so random lines often get past the header. */
const logishArb = fc
  .array(
    fc.oneof(
      fc.constantFrom("time", "field", "lat", "lon", "date", "Field (nT)", "station", "2026-05-04T09:15:00Z", "2026-05-04", "09:15:00", "48405.5", "48405,5", "-0.12", "51.5", "L10"),
      fc.constantFrom(",", ";", "\t", "|", " ", "\n", "\r\n", "\r", '"', "#", "\uFEFF", "\u0000", ""),
      fc.string({ maxLength: 4, unit: "binary" }),
    ),
    { maxLength: 120 },
  )
  .map((parts) => parts.join(""));

describe("random text and bytes", () => {
  it("raw random bytes pushed as bytes give a consistent parse or a LogFormatError, in one piece and split anywhere alike", () => {
    runProperty(
      "raw bytes",
      fc.property(fc.uint8Array({ maxLength: 2048 }), splitArb, (bytes, cuts) => {
        const whole = parseChunks([bytes]);
        expectParseOrFormatError(new TextDecoder().decode(bytes), whole);
        expect(comparable(parseChunks(splitBytes(bytes, cuts)))).toEqual(comparable(whole));
      }),
      { numRuns: 300, timeLimitMs: 2500 },
    );
  });

  it("random bytes (as UTF-8 and as Latin-1) give a consistent parse or a LogFormatError, whole and chunked alike", () => {
    runProperty(
      "random bytes",
      fc.property(bytesAsTextArb, splitArb, (text, cuts) => {
        const whole = parseWhole(text);
        expectParseOrFormatError(text, whole);
        expect(comparable(parseChunks(splitText(text, cuts)))).toEqual(comparable(whole));
      }),
      { numRuns: 300, timeLimitMs: 2500 },
    );
  });

  it("random log-like text gives a consistent parse or a LogFormatError, whole and chunked alike", () => {
    runProperty(
      "log-like text",
      fc.property(logishArb, splitArb, (text, cuts) => {
        const whole = parseWhole(text);
        expectParseOrFormatError(text, whole);
        expect(comparable(parseChunks(splitText(text, cuts)))).toEqual(comparable(whole));
      }),
      { numRuns: 500, timeLimitMs: 3000 },
    );
  });
});
