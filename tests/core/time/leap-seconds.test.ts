import { describe, expect, it } from "vitest";
import { GPS_EPOCH_MS, gpsMinusUtcSecondsAtUtc, gpsToUtcMs, utcToGpsMs } from "@/src/core/time";

// Source for every offset below: IERS leap-second list (Bulletin C, Leap_Second.dat), TAI − UTC,
// with GPS − UTC = (TAI − UTC) − 19 s (GPS epoch 1980-01-06, TAI − UTC = 19 s then).
describe("GPS − UTC from the IERS leap-second list", () => {
  const cases: Array<[string, number]> = [
    ["1980-01-06T00:00:00Z", 0], // TAI−UTC 19 s
    ["1981-06-30T23:59:59Z", 0],
    ["1981-07-01T00:00:00Z", 1], // TAI−UTC 20 s
    ["1988-01-01T00:00:00Z", 5], // TAI−UTC 24 s
    ["1999-01-01T00:00:00Z", 13], // TAI−UTC 32 s
    ["2005-12-31T23:59:59Z", 13],
    ["2006-01-01T00:00:00Z", 14], // TAI−UTC 33 s
    ["2012-07-01T00:00:00Z", 16], // TAI−UTC 35 s
    ["2016-12-31T23:59:59Z", 17], // TAI−UTC 36 s
    ["2017-01-01T00:00:00Z", 18], // TAI−UTC 37 s (Bulletin C: no leap second since)
    ["2026-05-04T09:15:00Z", 18],
  ];
  it.each(cases)("at %s GPS − UTC = %i s", (iso, seconds) => {
    expect(gpsMinusUtcSecondsAtUtc(Date.parse(iso))).toBe(seconds);
  });

  it("converts GPS week rollovers to their published UTC instants", () => {
    // US Coast Guard Navigation Center rollover notices (from memory): GPS week 1024 began
    // 1999-08-21T23:59:47Z and week 2048 began 2019-04-06T23:59:42Z.
    const week = 7 * 86_400_000;
    expect(new Date(gpsToUtcMs(GPS_EPOCH_MS + 1024 * week)).toISOString()).toBe("1999-08-21T23:59:47.000Z");
    expect(new Date(gpsToUtcMs(GPS_EPOCH_MS + 2048 * week)).toISOString()).toBe("2019-04-06T23:59:42.000Z");
  });

  it("round-trips UTC → GPS → UTC away from leap instants", () => {
    for (const iso of ["1985-03-01T12:00:00Z", "2010-06-15T00:00:00Z", "2017-01-01T00:00:00Z", "2030-01-01T00:00:00Z"]) {
      const utc = Date.parse(iso);
      expect(gpsToUtcMs(utcToGpsMs(utc))).toBe(utc);
    }
  });

  it("subtracts the offset in force at the GPS label next to a leap second", () => {
    // 2017-01-01T00:00:17 GPS is the leap second 2016-12-31T23:59:60 UTC; 00:00:18 GPS is 00:00:00 UTC.
    expect(new Date(gpsToUtcMs(Date.parse("2017-01-01T00:00:18Z"))).toISOString()).toBe("2017-01-01T00:00:00.000Z");
    expect(new Date(gpsToUtcMs(Date.parse("2017-01-01T00:00:16Z"))).toISOString()).toBe("2016-12-31T23:59:59.000Z");
  });

  it("refuses GPS times before the GPS epoch", () => {
    expect(() => gpsToUtcMs(Date.parse("1979-12-31T00:00:00Z"))).toThrow(/GPS epoch/);
  });
});
