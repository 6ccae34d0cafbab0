import { describe, expect, it } from "vitest";
import {
  OutsideModelValidityError,
  REFERENCE_RADIUS_KM,
  WGS84_FLATTENING,
  WGS84_SEMI_MAJOR_AXIS_KM,
  decimalYear,
  isWithinValidity,
  synthesizeField,
  timeMsFromDecimalYear,
  type FieldModel,
} from "@/src/core/reference-field";
import { coefficientCount, coefficientIndex } from "@/src/core/reference-field/model";
import { igrfModel } from "./reference-files";

/** A one-epoch model with the given coefficients, valid 2000–2010: answers known by construction. */
function syntheticModel(terms: Array<[kind: "g" | "h", n: number, m: number, valueNt: number]>): FieldModel {
  const g = new Float64Array(coefficientCount(2));
  const h = new Float64Array(coefficientCount(2));
  for (const [kind, n, m, value] of terms) (kind === "g" ? g : h)[coefficientIndex(n, m)] = value;
  return {
    name: "synthetic",
    version: "1",
    validFromYear: 2000,
    validToYear: 2010,
    arrayDegree: 2,
    epochs: [{ year: 2000, g, h, maxDegree: 2 }],
    secularVariation: { g: new Float64Array(g.length), h: new Float64Array(h.length), maxDegree: 0 },
    degreeConvention: "full",
  };
}

const T2005 = Date.UTC(2005, 0, 1);
const G10 = -30000;
const polarRadiusKm = WGS84_SEMI_MAJOR_AXIS_KM * (1 - WGS84_FLATTENING);

describe("synthesis by construction (dipole fields)", () => {
  const axial = syntheticModel([["g", 1, 0, G10]]);

  it("axial dipole on the equator: X = −g10 (a/r)³, Y = Z = 0, r = WGS84 a + h", () => {
    const f = synthesizeField(axial, { latitudeDeg: 0, longitudeDeg: 37, heightM: 1500, timeMs: T2005 });
    const ratio = REFERENCE_RADIUS_KM / (WGS84_SEMI_MAJOR_AXIS_KM + 1.5);
    expect(f.northNt).toBeCloseTo(-G10 * ratio ** 3, 8);
    expect(f.eastNt).toBeCloseTo(0, 10);
    expect(f.downNt).toBeCloseTo(0, 8);
    expect(f.declinationDeg).toBeCloseTo(0, 10);
  });

  it("axial dipole at the north pole: Z = −2 g10 (a/r)³ with r = WGS84 b + h, no horizontal field", () => {
    const f = synthesizeField(axial, { latitudeDeg: 90, longitudeDeg: 0, heightM: 0, timeMs: T2005 });
    expect(f.downNt).toBeCloseTo(-2 * G10 * (REFERENCE_RADIUS_KM / polarRadiusKm) ** 3, 6);
    expect(f.horizontalNt).toBeLessThan(1e-6);
    expect(f.inclinationDeg).toBeCloseTo(90, 8);
  });

  it("axial dipole at 45° geodetic: the geocentric field rotated by the geodetic−geocentric angle", () => {
    const latRad = Math.PI / 4;
    const e2 = WGS84_FLATTENING * (2 - WGS84_FLATTENING);
    const nKm = WGS84_SEMI_MAJOR_AXIS_KM / Math.sqrt(1 - e2 * Math.sin(latRad) ** 2);
    const p = nKm * Math.cos(latRad);
    const z = nKm * (1 - e2) * Math.sin(latRad);
    const r = Math.hypot(p, z);
    const geocentricLat = Math.atan2(z, p);
    const ratio3 = (REFERENCE_RADIUS_KM / r) ** 3;
    // Geocentric dipole field: X' = −g10 (a/r)³ sin θ = −g10 (a/r)³ cos φc, Z' = −2 g10 (a/r)³ sin φc.
    const xc = -G10 * ratio3 * Math.cos(geocentricLat);
    const zc = -2 * G10 * ratio3 * Math.sin(geocentricLat);
    const psi = latRad - geocentricLat;
    const f = synthesizeField(axial, { latitudeDeg: 45, longitudeDeg: 0, heightM: 0, timeMs: T2005 });
    expect(psi).toBeGreaterThan(0.003); // about 0.19° at 45°: the rotation matters at the nT level
    expect(f.northNt).toBeCloseTo(xc * Math.cos(psi) + zc * Math.sin(psi), 7);
    expect(f.downNt).toBeCloseTo(zc * Math.cos(psi) - xc * Math.sin(psi), 7);
    expect(f.totalNt).toBeCloseTo(Math.hypot(xc, zc), 7); // rotation keeps the magnitude
  });

  it("equatorial dipoles: g11 gives east field g11 (a/r)³ at 90°E, h11 gives −h11 (a/r)³ at 0°", () => {
    const ratio3 = (REFERENCE_RADIUS_KM / WGS84_SEMI_MAJOR_AXIS_KM) ** 3;
    const fg = synthesizeField(syntheticModel([["g", 1, 1, 2000]]), { latitudeDeg: 0, longitudeDeg: 90, heightM: 0, timeMs: T2005 });
    expect(fg.eastNt).toBeCloseTo(2000 * ratio3, 8);
    const fh = synthesizeField(syntheticModel([["h", 1, 1, 2000]]), { latitudeDeg: 0, longitudeDeg: 0, heightM: 0, timeMs: T2005 });
    expect(fh.eastNt).toBeCloseTo(-2000 * ratio3, 8);
  });

  it("field is linear in time between epochs (halfway in time = mean of the epochs)", () => {
    const model = igrfModel();
    const at = (timeMs: number) => synthesizeField(model, { latitudeDeg: 51.2, longitudeDeg: -1.3, heightM: 90, timeMs });
    const a = at(timeMsFromDecimalYear(2010));
    const b = at(timeMsFromDecimalYear(2015));
    const mid = at(timeMsFromDecimalYear(2012.5));
    expect(mid.northNt).toBeCloseTo((a.northNt + b.northNt) / 2, 8);
    expect(mid.downNt).toBeCloseTo((a.downNt + b.downNt) / 2, 8);
  });

  it("rejects impossible positions", () => {
    const model = igrfModel();
    expect(() => synthesizeField(model, { latitudeDeg: 91, longitudeDeg: 0, heightM: 0, timeMs: T2005 })).toThrow(RangeError);
    expect(() => synthesizeField(model, { latitudeDeg: 0, longitudeDeg: NaN, heightM: 0, timeMs: T2005 })).toThrow(RangeError);
  });
});

describe("decimal year (definition: year + elapsed / length of that UTC year)", () => {
  it.each([
    ["2024-01-01T00:00:00Z", 2024],
    ["2024-07-02T00:00:00Z", 2024 + 183 / 366], // leap year, 183 days elapsed (by construction)
    ["2023-07-02T12:00:00Z", 2023 + 182.5 / 365],
    ["2025-12-31T23:59:59.999Z", 2025 + (365 * 86_400_000 - 1) / (365 * 86_400_000)],
  ])("%s → %f", (iso, expected) => {
    expect(decimalYear(Date.parse(iso))).toBeCloseTo(expected, 12);
    // Round trip to well under 1 ms (a double holds a decimal year to ~1e-13 year ≈ 3 µs).
    expect(timeMsFromDecimalYear(expected)).toBeCloseTo(Date.parse(iso), 1);
  });
});

describe("IGRF-14 validity 1900.0–2030.0", () => {
  const model = igrfModel();
  const at = (iso: string) => ({ latitudeDeg: 0, longitudeDeg: 0, heightM: 0, timeMs: Date.parse(iso) });

  it("accepts both ends and refuses anything outside with a typed error", () => {
    expect(isWithinValidity(model, Date.parse("1900-01-01T00:00:00Z"))).toBe(true);
    expect(isWithinValidity(model, Date.parse("2030-01-01T00:00:00Z"))).toBe(true);
    expect(isWithinValidity(model, Date.parse("1899-12-31T23:59:59Z"))).toBe(false);
    expect(isWithinValidity(model, Date.parse("2030-01-01T00:00:00.001Z"))).toBe(false);
    expect(() => synthesizeField(model, at("1899-12-31T00:00:00Z"))).toThrow(OutsideModelValidityError);
    expect(() => synthesizeField(model, at("2031-06-01T00:00:00Z"))).toThrow(/outside the validity of IGRF-14/);
  });

  it("uses the secular variation after 2025.0 (2027.5 = 2025 coefficients + 2.5 years × SV)", () => {
    // With only the SV known in closed form, compare against the 2025 epoch field moved by the SV field.
    const p = { latitudeDeg: -33.9, longitudeDeg: 18.4, heightM: 10 };
    const f2025 = synthesizeField(model, { ...p, timeMs: timeMsFromDecimalYear(2025) });
    const f2026 = synthesizeField(model, { ...p, timeMs: timeMsFromDecimalYear(2026) });
    const f2027 = synthesizeField(model, { ...p, timeMs: timeMsFromDecimalYear(2027) });
    expect(f2027.downNt - f2026.downNt).toBeCloseTo(f2026.downNt - f2025.downNt, 8);
    expect(Math.abs(f2026.downNt - f2025.downNt)).toBeGreaterThan(1); // the SV really moves the field
  });
});
