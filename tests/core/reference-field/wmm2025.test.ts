import { describe, expect, it } from "vitest";
import {
  OutsideModelValidityError,
  synthesizeField,
  synthesizeFieldAtYear,
  timeMsFromDecimalYear,
} from "@/src/core/reference-field";
import { WMM_TEST_VALUES_FILE, readCsv, wmmModel } from "./reference-files";

// Source: NOAA's official WMM test values as shipped in the npm package geomagnetism 0.2.0
// (test/values.csv). Columns: date (decimal year), alt (km above the WGS84 ellipsoid), lat, lon (deg),
// x, y, z (north, east, down, nT), h, f (nT), incl, decl (deg), gv (grid variation, deg).
// The file also holds WMM2015/WMM2020 values; the WMM2025 rows are those dated 2025.0 and later.
// WMM2025 values are given to 1e-6 nT, angles to 0.01°: tolerances 0.01 nT and 0.01°.
// gv is 0 in every WMM2025 row (not computed there), so it is not compared.
const TOLERANCE_NT = 0.01;
const TOLERANCE_DEG = 0.01;
const METRES_PER_KM = 1000;

const rows = readCsv(WMM_TEST_VALUES_FILE)
  .map((r) => Object.fromEntries(Object.entries(r).map(([k, v]) => [k, Number(v)])) as Record<string, number>)
  .filter((r) => r.date >= 2025);

describe("WMM2025 against NOAA test values", () => {
  const model = wmmModel();

  it("is named and bounded as published (epoch 2025.0, five years)", () => {
    expect(model.name).toBe("WMM2025");
    expect(model.validFromYear).toBe(2025);
    expect(model.validToYear).toBe(2030);
    expect(model.epochs[0].maxDegree).toBe(12);
  });

  it("has the 100 WMM2025 test rows", () => {
    expect(rows).toHaveLength(100);
  });

  it.each(rows.map((r, i) => [i + 1, r.date, r.lat, r.lon, r] as const))(
    "row %i (%f, %f°, %f°): X Y Z H F within 0.01 nT, I and D within 0.01°",
    (_i, _date, _lat, _lon, r) => {
      const f = synthesizeFieldAtYear(model, r.lat, r.lon, r.alt * METRES_PER_KM, r.date);
      expect(Math.abs(f.northNt - r.x)).toBeLessThanOrEqual(TOLERANCE_NT);
      expect(Math.abs(f.eastNt - r.y)).toBeLessThanOrEqual(TOLERANCE_NT);
      expect(Math.abs(f.downNt - r.z)).toBeLessThanOrEqual(TOLERANCE_NT);
      expect(Math.abs(f.horizontalNt - r.h)).toBeLessThanOrEqual(TOLERANCE_NT);
      expect(Math.abs(f.totalNt - r.f)).toBeLessThanOrEqual(TOLERANCE_NT);
      expect(Math.abs(f.inclinationDeg - r.incl)).toBeLessThanOrEqual(TOLERANCE_DEG);
      expect(Math.abs(f.declinationDeg - r.decl)).toBeLessThanOrEqual(TOLERANCE_DEG);
    },
  );

  it("gives the same field through the UTC-instant entry point", () => {
    for (const r of rows.slice(0, 20)) {
      const f = synthesizeField(model, {
        latitudeDeg: r.lat,
        longitudeDeg: r.lon,
        heightM: r.alt * METRES_PER_KM,
        timeMs: timeMsFromDecimalYear(r.date),
      });
      expect(Math.abs(f.totalNt - r.f)).toBeLessThanOrEqual(TOLERANCE_NT);
    }
  });

  it("refuses dates before 2025.0 and after 2030.0 instead of extrapolating", () => {
    const at = (iso: string) => ({ latitudeDeg: 10, longitudeDeg: 20, heightM: 0, timeMs: Date.parse(iso) });
    expect(() => synthesizeField(model, at("2024-12-31T23:59:59Z"))).toThrow(OutsideModelValidityError);
    expect(() => synthesizeField(model, at("2030-01-01T00:00:01Z"))).toThrow(OutsideModelValidityError);
    expect(() => synthesizeField(model, at("2025-01-01T00:00:00Z"))).not.toThrow();
    expect(() => synthesizeField(model, at("2030-01-01T00:00:00Z"))).not.toThrow();
  });
});
