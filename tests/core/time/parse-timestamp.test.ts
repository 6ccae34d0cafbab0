import { describe, expect, it } from "vitest";
import { createIsoUtcFormatter, createTimestampReader, daysFromCivil, parseTimestamp, TimestampError, type TimeReadOptions } from "@/src/core/time";

const iso = (ms: number) => new Date(ms).toISOString();

describe("timestamp forms", () => {
  // J2000.0 as UTC: 2000-01-01T12:00:00Z = Unix 946 728 000 s (common practice, widely tabulated).
  it.each([
    ["2000-01-01T12:00:00Z"],
    ["2000-01-01 12:00:00"],
    ["2000/01/01 12:00:00"],
    ["2000-1-1T12:00"],
    ["2000-01-01T13:00:00+01:00"],
    ["2000-01-01T13:00:00+0100"],
    ["2000-01-01T07:00:00-05"],
    ["2000-01-01T12:00:00 UTC"],
    ["20000101T120000Z"],
    ["  2000-01-01T12:00:00.000Z  "],
  ])("%s is J2000.0", (text) => {
    expect(parseTimestamp(text)).toBe(946_728_000_000);
  });

  it("keeps milliseconds and rounds finer digits half up", () => {
    expect(iso(parseTimestamp("2026-05-04T09:15:00.1Z"))).toBe("2026-05-04T09:15:00.100Z");
    expect(iso(parseTimestamp("2026-05-04T09:15:00.123Z"))).toBe("2026-05-04T09:15:00.123Z");
    expect(iso(parseTimestamp("2026-05-04T09:15:00.1234Z"))).toBe("2026-05-04T09:15:00.123Z");
    expect(iso(parseTimestamp("2026-05-04T09:15:00.1235Z"))).toBe("2026-05-04T09:15:00.124Z");
    expect(iso(parseTimestamp("2026-05-04T09:15:59.9996Z"))).toBe("2026-05-04T09:16:00.000Z");
    expect(iso(parseTimestamp("2026-05-04T09:15:00,5Z"))).toBe("2026-05-04T09:15:00.500Z");
  });

  it("reads separate date and time columns", () => {
    const r = createTimestampReader();
    expect(iso(r.parseDateAndTime("2026/05/04", "09:15:00.250"))).toBe("2026-05-04T09:15:00.250Z");
  });

  it("reads a time of day alone only with a default date", () => {
    expect(() => parseTimestamp("09:15:00")).toThrow(/time of day without a date/);
    expect(iso(parseTimestamp("09:15:00", { defaultDate: "2026-05-04" }))).toBe("2026-05-04T09:15:00.000Z");
  });
});

describe("impossible timestamps", () => {
  it.each([
    ["2026-13-01T00:00:00Z", "impossible_date"],
    ["2026-02-30T00:00:00Z", "impossible_date"],
    ["2100-02-29T00:00:00Z", "impossible_date"], // Gregorian rule: 2100 is no leap year
    ["2026-04-31T00:00:00Z", "impossible_date"],
    ["2026-05-04T25:00:00Z", "impossible_time"],
    ["2026-05-04T09:61:00Z", "impossible_time"],
    ["2026-05-04T09:15:60Z", "leap_second_label"],
    ["2026-05-04T09:15:00+25:00", "bad_offset"],
    ["yesterday", "unrecognised_format"],
    ["", "unrecognised_format"],
  ])("%s → %s", (text, reason) => {
    try {
      parseTimestamp(text);
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(TimestampError);
      expect((e as TimestampError).reason).toBe(reason);
    }
  });

  it("accepts 29 February in a leap year", () => {
    expect(iso(parseTimestamp("2024-02-29T00:00:00Z"))).toBe("2024-02-29T00:00:00.000Z");
  });

  // Regression: a long run of blanks inside a cell made the patterns backtrack quadratically
  // (40 000 blanks took seconds per cell); such text is now trimmed once and refused by length.
  it.each([
    ["2026-05-04", {}],
    ["2026-05-04T09:00:00", {}],
    ["09:00", { defaultDate: "2026-05-04" }],
  ] as const)("%s, 40 000 blanks and a letter → unrecognised_format naming the length", (prefix, options) => {
    const reader = createTimestampReader(options);
    const text = prefix + " ".repeat(40_000) + "x";
    expect(() => reader.parse(text)).toThrow(TimestampError);
    expect(() => reader.parse(text)).toThrow(`(${prefix.length + 40_001} characters; a timestamp has at most 64)`);
    try {
      reader.parse(text);
    } catch (e) {
      expect((e as TimestampError).reason).toBe("unrecognised_format");
    }
    expect(() => reader.parseDateAndTime("2026-05-04", "09:00" + " ".repeat(40_000) + "x")).toThrow(TimestampError);
  });

  it("still reads a timestamp padded with blanks of any kind, and a 64-character one", () => {
    expect(parseTimestamp(" \t 2000-01-01T12:00:00Z \r\n")).toBe(946_728_000_000);
    expect(parseTimestamp("2000-01-01T12:00:00." + "0".repeat(43) + "Z")).toBe(946_728_000_000); // 64 characters
    expect(() => parseTimestamp("2000-01-01T12:00:00." + "0".repeat(44) + "Z")).toThrow(/65 characters/);
  });
});

describe("time zones (naive times)", () => {
  // EU summer time (Directive 2000/84/EC): starts/ends at 01:00 UTC on the last Sunday of March/October.
  // 2026: 29 March and 25 October.
  const berlin = createTimestampReader({ timeZone: "Europe/Berlin" });
  it("reads winter and summer time", () => {
    expect(iso(berlin.parse("2026-01-15 10:00:00"))).toBe("2026-01-15T09:00:00.000Z");
    expect(iso(berlin.parse("2026-07-15 10:00:00"))).toBe("2026-07-15T08:00:00.000Z");
  });
  it("reads a wall time in the spring gap with the offset in force before it", () => {
    expect(iso(berlin.parse("2026-03-29 01:59:59"))).toBe("2026-03-29T00:59:59.000Z");
    expect(iso(berlin.parse("2026-03-29 02:30:00"))).toBe("2026-03-29T01:30:00.000Z"); // = 03:30 CEST
    expect(iso(berlin.parse("2026-03-29 03:00:00"))).toBe("2026-03-29T01:00:00.000Z");
  });
  it("reads a repeated wall time in the autumn overlap as the earlier instant", () => {
    expect(iso(berlin.parse("2026-10-25 02:30:00"))).toBe("2026-10-25T00:30:00.000Z"); // CEST reading
    expect(iso(berlin.parse("2026-10-25 03:00:00"))).toBe("2026-10-25T02:00:00.000Z");
  });
  it("lets a written offset win over the zone", () => {
    expect(iso(berlin.parse("2026-07-15T10:00:00Z"))).toBe("2026-07-15T10:00:00.000Z");
  });
  it("handles a zone with a 30-minute offset and US rules", () => {
    // Asia/Kolkata is UTC+05:30 all year; US DST (Energy Policy Act 2005) began 2026-03-08 02:00 local.
    expect(iso(parseTimestamp("2026-05-04 14:45:00", { timeZone: "Asia/Kolkata" }))).toBe("2026-05-04T09:15:00.000Z");
    expect(iso(parseTimestamp("2026-03-08 01:59:00", { timeZone: "America/New_York" }))).toBe("2026-03-08T06:59:00.000Z");
    expect(iso(parseTimestamp("2026-03-08 03:00:00", { timeZone: "America/New_York" }))).toBe("2026-03-08T07:00:00.000Z");
  });
  it("rejects unknown zones and GPS basis with a zone", () => {
    expect(() => createTimestampReader({ timeZone: "Mars/Olympus" })).toThrow(/unknown time zone/);
    expect(() => createTimestampReader({ timeZone: "Europe/Berlin", timeBasis: "gps" })).toThrow(/GPS/);
  });
});

describe("time basis and clock offset", () => {
  it("subtracts GPS − UTC (18 s since 2017, IERS Bulletin C) from a GPS-basis reading", () => {
    expect(iso(parseTimestamp("2026-05-04T09:15:18", { timeBasis: "gps" }))).toBe("2026-05-04T09:15:00.000Z");
    // 2010: GPS − UTC = 15 s (TAI − UTC 34 s, IERS leap-second list).
    expect(iso(parseTimestamp("2010-06-01T00:00:15", { timeBasis: "gps" }))).toBe("2010-06-01T00:00:00.000Z");
  });
  it("adds the clock offset: corrected = logged + offset", () => {
    expect(iso(parseTimestamp("2026-05-04T09:15:00Z", { clockOffsetS: 2.5 }))).toBe("2026-05-04T09:15:02.500Z");
    expect(iso(parseTimestamp("2026-05-04T09:15:00Z", { clockOffsetS: -60 }))).toBe("2026-05-04T09:14:00.000Z");
  });
});

describe("many rows and formatting", () => {
  // Speed is measured by `npm run bench`, not here: a clock in a unit test flakes on a shared machine.
  it("reads 200 000 naive zoned timestamps in a row exactly, and formats UTC ms as toISOString does", () => {
    const reader = createTimestampReader({ timeZone: "Europe/Berlin" });
    const fmt = createIsoUtcFormatter();
    const base = Date.UTC(2026, 4, 4, 6, 0, 0);
    let ok = 0;
    for (let i = 0; i < 200_000; i++) {
      const d = new Date(base + i * 250 + 7200_000); // wall time = UTC + 2 h in May (CEST)
      if (reader.parse(d.toISOString().slice(0, 23).replace("T", " ")) === base + i * 250) ok++;
    }
    expect(ok).toBe(200_000);
    for (let i = 0; i < 2000; i++) {
      const t = base + i * 123_457;
      expect(fmt(t)).toBe(new Date(t).toISOString());
    }
  });
});

describe("daysFromCivil", () => {
  it("agrees with the runtime's Date.UTC (ECMA-262 proleptic Gregorian) over four centuries", () => {
    for (let y = 1800; y <= 2200; y += 7) {
      for (const [m, d] of [[1, 1], [2, 28], [3, 1], [12, 31]]) {
        expect(daysFromCivil(y, m, d) * 86_400_000).toBe(Date.UTC(y, m - 1, d));
      }
    }
  });
});

describe("minute cache of the fast path", () => {
  it("gives the same instants as a cold reader across DST changes and a leap second", () => {
    const cases: Array<[TimeReadOptions, string, number]> = [
      [{ timeZone: "Europe/Berlin" }, "2026-03-29T00:00:00", 4 * 3600],
      [{ timeZone: "Europe/Berlin" }, "2026-10-25T00:00:00", 4 * 3600],
      [{ timeZone: "America/St_Johns" }, "2026-03-08T01:00:00", 3 * 3600], // −03:30 / −02:30 zone
      [{ timeBasis: "gps" }, "2016-12-31T23:59:00", 120],
      [{ clockOffsetS: -1.5 }, "2026-05-04T23:59:00", 120],
    ];
    for (const [opts, startText, spanS] of cases) {
      const warm = createTimestampReader(opts);
      const start = Date.parse(startText + "Z");
      for (let s = 0; s <= spanS; s += 7) {
        const text = new Date(start + s * 1000).toISOString().slice(0, 23);
        expect(warm.parse(text)).toBe(createTimestampReader(opts).parse(text));
        expect(warm.parseBytes(new TextEncoder().encode(`x,${text},y`), 2, 2 + text.length)).toBe(warm.parse(text));
      }
    }
  });
});

describe("dates written day or month first", () => {
  it("reads them only with a stated order", () => {
    expect(iso(parseTimestamp("04.05.2026 09:15:00", { dateOrder: "dmy" }))).toBe("2026-05-04T09:15:00.000Z");
    expect(iso(parseTimestamp("05/04/2026 09:15:00.5Z", { dateOrder: "mdy" }))).toBe("2026-05-04T09:15:00.500Z");
    expect(iso(createTimestampReader({ dateOrder: "dmy" }).parseDateAndTime("4-5-2026", "09:15"))).toBe("2026-05-04T09:15:00.000Z");
    try {
      parseTimestamp("04/05/2026 09:15:00");
      expect.unreachable();
    } catch (e) {
      expect((e as TimestampError).reason).toBe("ambiguous_date_order");
    }
    expect(() => parseTimestamp("31.02.2026", { dateOrder: "dmy" })).toThrow(/impossible day 31/);
    expect(() => parseTimestamp("13/25/2026", { dateOrder: "mdy" })).toThrow(/impossible month 13/);
  });
});
