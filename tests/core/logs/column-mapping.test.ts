import { describe, expect, it } from "vitest";
import { guessColumnMapping, headerKey, LogFormatError, resolveColumnMapping } from "@/src/core/logs";

describe("header names", () => {
  it.each([
    ["Field (nT)", "field"],
    ["height_m", "height"],
    ["Lat[deg]", "lat"],
    ["Total Field", "totalfield"],
    ["TOTAL_FIELD_nT", "totalfield"],
    ["nT", "nt"],
    ["Time (UTC)", "time"],
    ["time_utc", "time"],
    ["UTC", "utc"],
    ["\uFEFFDate", "date"],
    ["Elev. (m a.s.l.)", "elev"],
  ])("%s → %s", (name, key) => {
    expect(headerKey(name)).toBe(key);
  });

  it("maps unusual headers to roles", () => {
    const headers = ["Date", "Time", "Mag", "Latitude (deg)", "Long", "Altitude [m]", "Line", "Stn"];
    const { indices } = guessColumnMapping(headers);
    expect(indices).toEqual({ date: 0, time: 1, field: 2, lat: 3, lon: 4, height: 5, line: 6, station: 7 });
  });

  it("prefers a full timestamp column over date + time", () => {
    const { indices } = guessColumnMapping(["date", "time", "timestamp", "f"]);
    expect(indices.time).toBe(2);
    expect(indices.date).toBeUndefined();
  });

  it("warns when a time column says GPS", () => {
    const { warnings } = guessColumnMapping(["GPS Time", "TMI"]);
    expect(warnings.join(" ")).toMatch(/GPS/);
  });

  it("lets an explicit mapping win, by name or by index", () => {
    const headers = ["t", "reading", "mag"];
    const r = resolveColumnMapping(headers, { time: "T", field: 1 });
    expect(r.indices.time).toBe(0);
    expect(r.indices.field).toBe(1);
    expect(() => resolveColumnMapping(headers, { field: "nope", time: 0 })).toThrow(/no column "nope"/);
  });

  it("names what was expected when no field column exists", () => {
    expect(() => resolveColumnMapping(["time", "lat", "lon"])).toThrow(LogFormatError);
    expect(() => resolveColumnMapping(["time", "lat", "lon"])).toThrow(/total field.*tmi/);
    expect(() => resolveColumnMapping(["field"])).toThrow(/no time column/);
  });
});
