import { describe, expect, it } from "vitest";
import { createLogStreamParser, LogFormatError, parseLogText, type LogReadings } from "@/src/core/logs";

const iso = (ms: number) => new Date(ms).toISOString();

describe("delimited logs", () => {
  it("reads a comma log with BOM, CRLF and trailing blank lines", () => {
    const text = "\uFEFFTime,Field (nT),Lat[deg],Lon[deg],height_m,Line\r\n" +
      "2026-05-04T09:15:00Z,48405.0,51.5,-0.12,35.2,L10\r\n" +
      "2026-05-04T09:15:01Z,48406.25,51.50001,-0.12001,,L10\r\n\r\n\r\n";
    const r = parseLogText(text);
    expect(r.delimiter).toBe(",");
    expect(r.readings.count).toBe(2);
    expect(Array.from(r.readings.fieldNt)).toEqual([48405.0, 48406.25]);
    expect(iso(r.readings.timeMs[1])).toBe("2026-05-04T09:15:01.000Z");
    expect(r.readings.heightM![0]).toBe(35.2);
    expect(Number.isNaN(r.readings.heightM![1])).toBe(true);
    expect(r.readings.line).toEqual(["L10", "L10"]);
    expect(Array.from(r.readings.sourceLine)).toEqual([2, 3]);
    expect(r.rejected).toEqual([]);
  });

  it("reads tab, semicolon (decimal comma) and whitespace logs alike", () => {
    const tab = "time\ttmi\n2026-05-04 09:15:00\t48405.5\n";
    const semi = "Datum;Zeit;F\n".replace("Datum", "date").replace("Zeit", "time") + "2026-05-04;09:15:00;48405,5\n";
    const ws = "  time      field    lat   lon\n 2026-05-04T09:15:00   48405.5   51.5  -0.1\n";
    for (const [text, delim] of [[tab, "\t"], [semi, ";"], [ws, "whitespace"]] as const) {
      const r = parseLogText(text);
      expect(r.delimiter).toBe(delim);
      expect(r.readings.count).toBe(1);
      expect(r.readings.fieldNt[0]).toBe(48405.5);
      expect(iso(r.readings.timeMs[0])).toBe("2026-05-04T09:15:00.000Z");
    }
  });

  it("reads quoted fields, including a quoted newline, and keeps file line numbers", () => {
    const text = 'time,field,station\n2026-05-04T09:00:00Z,48310,"A, north"\n2026-05-04T09:00:01Z,48311,"two\nlines"\n2026-05-04T09:00:02Z,bad,x\n';
    const r = parseLogText(text);
    expect(r.readings.station).toEqual(["A, north", "two\nlines"]);
    expect(r.rejected).toHaveLength(1);
    expect(r.rejected[0].line).toBe(5);
  });

  it("reads naive times in a zone with a clock offset, and GPS basis", () => {
    const text = "date,time,field\n2026-07-15,10:00:00,48400\n";
    const berlin = parseLogText(text, { timeZone: "Europe/Berlin", clockOffsetS: 3 });
    expect(iso(berlin.readings.timeMs[0])).toBe("2026-07-15T08:00:03.000Z");
    const gps = parseLogText(text, { timeBasis: "gps" });
    expect(iso(gps.readings.timeMs[0])).toBe("2026-07-15T09:59:42.000Z"); // GPS − UTC = 18 s (IERS Bulletin C)
  });
});

describe("rejected rows and issues", () => {
  const text = [
    "time,field,lat,lon", // line 1
    "2026-05-04T09:00:00Z,48310.0,51.5,-0.1", // 2 ok
    "2026-02-30T09:00:01Z,48310.0,51.5,-0.1", // 3 impossible date
    "2026-05-04T09:00:02Z,48x10,51.5,-0.1", // 4 non-numeric
    "2026-05-04T09:00:03Z,5000,51.5,-0.1", // 5 too small
    "2026-05-04T09:00:04Z,48310.0,95,-0.1", // 6 lat
    "2026-05-04T09:00:05Z,48310.0,51.5,200", // 7 lon
    "2026-05-04T09:00:06Z,,51.5,-0.1", // 8 missing field
    "2026-05-04T25:00:00Z,48310.0,51.5,-0.1", // 9 25:00
    "2026-05-04T08:59:59Z,48311.0,51.5,-0.1", // 10 backwards (kept)
    "2026-05-04T08:59:59Z,48312.0,51.5,-0.1", // 11 duplicate (kept)
    "2026-05-04T09:00:10Z,48313.0,,", // 12 no position (kept)
    "",
  ].join("\n");

  it("reports every rejected row with its file line, column and reason", () => {
    const r = parseLogText(text);
    expect(r.rejected.map((p) => [p.line, p.column, p.reason])).toEqual([
      [3, "time", "impossible_timestamp"],
      [4, "field", "non_numeric_field"],
      [5, "field", "field_out_of_range"],
      [6, "lat", "latitude_out_of_range"],
      [7, "lon", "longitude_out_of_range"],
      [8, "field", "missing_field"],
      [9, "time", "impossible_timestamp"],
    ]);
    expect(r.rejected[2].value).toBe("5000");
    expect(r.rowCount).toBe(11);
    expect(r.acceptedCount).toBe(4);
    expect(Array.from(r.readings.sourceLine)).toEqual([2, 10, 11, 12]);
    expect(r.issues.map((p) => [p.line, p.reason])).toEqual([
      [10, "time_backwards"],
      [11, "duplicate_time"],
    ]);
    expect(Number.isNaN(r.readings.latDeg![3])).toBe(true);
  });

  it("takes the plausible field range as an option", () => {
    const r = parseLogText(text, { fieldRangeNt: { minNt: 1000, maxNt: 48311.5 } });
    expect(r.rejected.filter((p) => p.reason === "field_out_of_range").map((p) => p.line)).toEqual([11, 12]); // 48312, 48313 > 48311.5; 5000 now inside
  });

  it("caps the detailed list but keeps exact counts", () => {
    const rows = ["time,field"];
    for (let i = 0; i < 50; i++) rows.push(`2026-05-04T09:00:${String(i).padStart(2, "0")}Z,bad`);
    const r = parseLogText(rows.join("\n"), { maxReportedRows: 10 });
    expect(r.rejectedCount).toBe(50);
    expect(r.rejected).toHaveLength(10);
  });
});

describe("empty and malformed logs", () => {
  it("refuses an empty file and a blank one", () => {
    expect(() => parseLogText("")).toThrow(LogFormatError);
    expect(() => parseLogText("\n\n  \n")).toThrow(/empty/);
  });
  it("accepts a header only, with a warning", () => {
    const r = parseLogText("time,field\r\n");
    expect(r.readings.count).toBe(0);
    expect(r.warnings.join(" ")).toMatch(/no readings/);
  });
  it("refuses a file whose first line is data", () => {
    expect(() => parseLogText("2026-05-04T09:00:00Z,48310\n")).toThrow(/looks like data/);
  });
  it("keeps a line or station name that returns after a blank cell", () => {
    // synthetic, answer by construction: the name cache must not take the value before the blank as still current
    const r = parseLogText("time,field,line,station\n2026-05-04T09:00:00Z,48300,L1,B\n2026-05-04T09:00:01Z,48301,,\n2026-05-04T09:00:02Z,48302,L1,B\n");
    expect(r.readings.line).toEqual(["L1", "", "L1"]);
    expect(r.readings.station).toEqual(["B", "", "B"]);
  });
  it("skips comment lines before the header", () => {
    const r = parseLogText("# site: invented\n# units nT\ntime;field\n2026-05-04T09:00:00Z;48310\n");
    expect(r.readings.count).toBe(1);
    expect(r.readings.sourceLine[0]).toBe(4);
  });
});

describe("streaming", () => {
  function makeLog(rows: number): string {
    const out = ["Time (UTC),Total Field [nT],Latitude,Longitude,Elevation (m),Line"];
    const t0 = Date.UTC(2026, 4, 4, 8);
    for (let i = 0; i < rows; i++) {
      const field = i % 97 === 5 ? "oops" : (48300 + Math.sin(i / 50) * 20).toFixed(2);
      out.push(`${new Date(t0 + i * 500).toISOString()},${field},${(51.5 + i * 1e-6).toFixed(7)},${(-0.1 - i * 1e-6).toFixed(7)},${(30 + (i % 7)).toFixed(1)},"L${Math.floor(i / 100)}"`);
    }
    return out.join("\r\n") + "\r\n";
  }

  it("gives the same result for any split of the text", () => {
    const text = makeLog(3000);
    const whole = parseLogText(text);
    for (const size of [1, 7, 64, 4096]) {
      const p = createLogStreamParser();
      for (let i = 0; i < text.length; i += size) p.push(text.slice(i, i + size));
      const r = p.end();
      expect(r.readings!.count).toBe(whole.readings.count);
      expect(Array.from(r.readings!.fieldNt)).toEqual(Array.from(whole.readings.fieldNt));
      expect(Array.from(r.readings!.sourceLine)).toEqual(Array.from(whole.readings.sourceLine));
      expect(r.rejected).toEqual(whole.rejected);
    }
    expect(whole.rejected.length).toBe(31);
    expect(whole.rejected[0].line).toBe(7); // row index 5 is file line 7
  });

  it("hands batches to a sink instead of accumulating", () => {
    const text = makeLog(2000);
    const batches: LogReadings[] = [];
    const p = createLogStreamParser({}, { onBatch: (b) => batches.push(b) });
    for (let i = 0; i < text.length; i += 10_000) p.push(text.slice(i, i + 10_000));
    const r = p.end();
    expect(r.readings).toBeNull();
    expect(batches.length).toBeGreaterThan(1);
    expect(batches.reduce((n, b) => n + b.count, 0)).toBe(r.acceptedCount);
    expect(r.acceptedCount).toBe(2000 - 21);
  });
});

describe("fast scanner against papaparse", () => {
  it("reads unquoted rows (own scanner) exactly as the same rows quoted (papaparse path)", () => {
    let seed = 7;
    const rnd = () => ((seed = (seed * 1_103_515_245 + 12_345) % 2_147_483_648) / 2_147_483_648);
    const rows: string[][] = [];
    const t0 = Date.UTC(2026, 4, 4);
    for (let i = 0; i < 3000; i++) {
      const field = rnd() < 0.02 ? "n/a" : (20_000 + rnd() * 60_000).toFixed(Math.floor(rnd() * 5));
      const lat = (rnd() * 180 - 90).toFixed(7);
      const lon = rnd() < 0.01 ? "" : (rnd() * 360 - 180).toFixed(6);
      const h = rnd() < 0.05 ? "1e2" : (rnd() * 3000 - 100).toFixed(2);
      rows.push([new Date(t0 + i * 137).toISOString(), field, lat, lon, h, ` L${Math.floor(i / 400)} `]);
    }
    const head = "time,field,lat,lon,height,line";
    const plain = parseLogText([head, ...rows.map((r) => r.join(","))].join("\n"));
    const quoted = parseLogText([head, ...rows.map((r) => r.map((c) => `"${c}"`).join(","))].join("\n"));
    expect(plain.readings.count).toBeGreaterThan(2900);
    for (const key of ["timeMs", "fieldNt", "latDeg", "lonDeg", "heightM", "sourceLine"] as const) {
      expect(Array.from(plain.readings[key]!)).toEqual(Array.from(quoted.readings[key]!));
    }
    expect(plain.readings.line).toEqual(quoted.readings.line);
    expect(plain.rejected).toEqual(quoted.rejected);
    // every number equals JavaScript's own Number() of its text
    const kept = rows.filter((r) => r[1] !== "n/a" && r[3] !== "");
    expect(Array.from(plain.readings.fieldNt)).toEqual(kept.map((r) => Number(r[1])));
    expect(Array.from(plain.readings.heightM!)).toEqual(kept.map((r) => Number(r[4])));
  });
});

describe("byte chunks", () => {
  it("reads UTF-8 bytes split anywhere, even inside a character, with a BOM", () => {
    const text = "\uFEFFtime,field,line\n2026-05-04T09:00:00Z,48310.5,Línea Süd\n2026-05-04T09:00:01Z,48311.5,Línea Süd\n2026-05-04T09:00:02Z,4831x,Ост\n";
    const bytes = new TextEncoder().encode(text);
    for (const size of [1, 2, 3, 5, 1000]) {
      const p = createLogStreamParser();
      for (let i = 0; i < bytes.length; i += size) p.push(bytes.subarray(i, i + size));
      const r = p.end();
      expect(r.header).toEqual(["time", "field", "line"]);
      expect(r.readings!.line).toEqual(["Línea Süd", "Línea Süd"]);
      expect(Array.from(r.readings!.fieldNt)).toEqual([48310.5, 48311.5]);
      expect(r.rejected[0]).toMatchObject({ line: 4, column: "field", value: "4831x" });
    }
  });
});

describe("regressions", () => {
  function parseIn(text: string, size: number, as: "text" | "bytes") {
    const p = createLogStreamParser();
    const src = as === "text" ? text : new TextEncoder().encode(text);
    for (let i = 0; i < src.length; i += size) p.push(src.slice(i, i + size));
    const r = p.end();
    return { ...r, readings: r.readings! };
  }

  // A CRLF row ending in a quoted cell (a Windows spreadsheet export) kept the closing quote of its
  // last cell when it was the last line of a block: the number was rejected, a text kept `"`.
  it("CRLF row ending in a quoted number: one reading of 10000 nT, no rejects", () => {
    const text = 'time,field\r\n"2000-01-01T00:00:00.000Z","10000"\r\n';
    for (const r of [parseLogText(text), parseIn(text, 5, "text"), parseIn(text, 5, "bytes"), parseIn(text, text.length, "bytes")]) {
      expect(r.rejected).toEqual([]);
      expect(r.readings.count).toBe(1);
      expect(r.readings.fieldNt[0]).toBe(10_000);
      expect(r.readings.timeMs[0]).toBe(Date.UTC(2000, 0, 1));
    }
  });

  it("CRLF rows ending in a quoted text cell keep the text without its quote, whatever the chunks", () => {
    const rows = Array.from({ length: 1000 }, (_, i) => `"${new Date(Date.UTC(2026, 4, 4, 9) + i * 1000).toISOString()}","${48_000 + i}","S${i}"`);
    const text = "time,field,station\r\n" + rows.join("\r\n") + "\r\n";
    const want = Array.from({ length: 1000 }, (_, i) => `S${i}`);
    for (const r of [parseLogText(text), parseIn(text, 4096, "text"), parseIn(text, 4096, "bytes"), parseIn(text, 65_536, "bytes")]) {
      expect(r.rejectedCount).toBe(0);
      expect(r.readings.station).toEqual(want);
    }
  });

  it("a quoted last cell followed by blanks at the end of the file is read without its quote", () => {
    const r = parseLogText('time,field,station\n2026-05-04T09:00:00Z,48000,"S1"  ');
    expect(r.readings.station).toEqual(["S1"]);
  });

  // A text chunk cut between the two halves of a surrogate pair turned the character into two U+FFFD.
  it("text chunks cut inside a surrogate pair give the character itself", () => {
    const p = createLogStreamParser();
    p.push("time,field,station\n2026-05-04T09:00:00Z,48000,\uD83D");
    p.push("\uDEF0A\n");
    expect(p.end().readings!.station).toEqual(["\u{1F6F0}A"]);
    const q = createLogStreamParser();
    q.push("\uD800");
    q.push("\uDC00time,field\n");
    expect(q.end().header).toEqual(["\u{10000}time", "field"]);
  });

  it("a lone high surrogate at the end of a text chunk followed by bytes or the end is U+FFFD, as in the whole text", () => {
    const p = createLogStreamParser();
    p.push("time,field,station\n2026-05-04T09:00:00Z,48000,A\uD800");
    p.push(new TextEncoder().encode("B\n2026-05-04T09:00:01Z,48001,C"));
    p.push("\uD800");
    const r = p.end();
    expect(r.readings!.station).toEqual(["A\uFFFDB", "C\uFFFD"]);
    expect(r.readings!.station).toEqual(parseLogText("time,field,station\n2026-05-04T09:00:00Z,48000,A\uD800B\n2026-05-04T09:00:01Z,48001,C\uD800").readings.station);
  });
});
