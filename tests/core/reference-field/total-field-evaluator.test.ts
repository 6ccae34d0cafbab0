import { describe, expect, it } from "vitest";
import {
  OutsideModelValidityError,
  createTotalFieldEvaluator,
  synthesizeField,
  type FieldModel,
} from "@/src/core/reference-field";
import { createTotalFieldGrid } from "@/src/core/reference-field/total-field-evaluator";
import { igrfModel, wmmModel } from "./reference-files";

// The batch evaluator is checked against direct synthesis (same model, known answer by construction).
// Requirement: within 0.01 nT anywhere in a 5 km × 5 km survey box over a whole day.
const TOLERANCE_NT = 0.01;
const DAY_MS = 86_400_000;
const KM_PER_DEG_LAT = 111.2;

/** Deterministic uniform numbers in [0, 1) (LCG, Numerical Recipes constants). */
function sequence(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0;
    return state / 2 ** 32;
  };
}

function box(latDeg: number, lonDeg: number, sizeKm: number, dayMs: number, days = 1) {
  const dLat = sizeKm / KM_PER_DEG_LAT;
  const dLon = sizeKm / (KM_PER_DEG_LAT * Math.cos((latDeg * Math.PI) / 180));
  return {
    minTimeMs: dayMs,
    maxTimeMs: dayMs + days * DAY_MS,
    minLatDeg: latDeg,
    maxLatDeg: latDeg + dLat,
    minLonDeg: lonDeg,
    maxLonDeg: lonDeg + dLon,
    minHeightM: -50,
    maxHeightM: 1200,
  };
}

function worstDifference(model: FieldModel, opts: ReturnType<typeof box>, samples: number, seed: number): number {
  const evaluate = createTotalFieldEvaluator(model, opts);
  const random = sequence(seed);
  let worst = 0;
  for (let i = 0; i < samples; i++) {
    const latitudeDeg = opts.minLatDeg + random() * (opts.maxLatDeg - opts.minLatDeg);
    const longitudeDeg = opts.minLonDeg + random() * (opts.maxLonDeg - opts.minLonDeg);
    const heightM = opts.minHeightM + random() * (opts.maxHeightM - opts.minHeightM);
    const timeMs = Math.round(opts.minTimeMs + random() * (opts.maxTimeMs - opts.minTimeMs));
    const direct = synthesizeField(model, { latitudeDeg, longitudeDeg, heightM, timeMs }).totalNt;
    worst = Math.max(worst, Math.abs(evaluate(latitudeDeg, longitudeDeg, heightM, timeMs) - direct));
  }
  return worst;
}

describe("total-field evaluator against direct synthesis", () => {
  const igrf = igrfModel();
  const sites: Array<[string, number, number]> = [
    ["South Atlantic anomaly, Brazil", -23.5, -43.7],
    ["equator, Borneo", 0.2, 114.5],
    ["mid-latitude, central Europe", 50.9, 7.1],
    ["high latitude, Svalbard", 78.2, 15.6],
    ["near the south magnetic pole region", -66.5, 140.0],
    ["close to the geographic north pole", 88.5, -40.0],
  ];

  it.each(sites)("%s (%f°, %f°): 5 km box, one day in 2026, within 0.01 nT", (_name, lat, lon) => {
    const opts = box(lat, lon, 5, Date.UTC(2026, 4, 11));
    expect(createTotalFieldGrid(igrf, opts).usesGrid).toBe(true);
    expect(worstDifference(igrf, opts, 1500, 7)).toBeLessThanOrEqual(TOLERANCE_NT);
  });

  it("holds for a day inside an epoch interval, across New Year's midnight (1 January kink)", () => {
    const opts = box(44.5, -110.5, 5, Date.UTC(2013, 11, 31, 12));
    expect(worstDifference(igrf, opts, 1500, 11)).toBeLessThanOrEqual(TOLERANCE_NT);
  });

  it("holds for a 3-month campaign and for a day in 1996 (degree 10 → 13 interval)", () => {
    expect(worstDifference(igrf, box(-31.9, 115.9, 5, Date.UTC(2024, 10, 1), 92), 1500, 3)).toBeLessThanOrEqual(TOLERANCE_NT);
    expect(worstDifference(igrf, box(60.2, 24.9, 5, Date.UTC(1996, 5, 1)), 1000, 5)).toBeLessThanOrEqual(TOLERANCE_NT);
  });

  it("holds with WMM2025", () => {
    expect(worstDifference(wmmModel(), box(35.0, 139.5, 5, Date.UTC(2027, 1, 20)), 1500, 13)).toBeLessThanOrEqual(TOLERANCE_NT);
  });

  it("wraps longitudes into a box past 180° (survey across the antimeridian, readings on both sides)", () => {
    const day = Date.UTC(2026, 7, 3);
    const opts = { ...box(-17.0, 179.97, 5, day) }; // 179.97° to ~180.02°
    const grid = createTotalFieldGrid(igrf, opts);
    expect(grid.usesGrid).toBe(true);
    const random = sequence(17);
    let worst = 0;
    for (let i = 0; i < 800; i++) {
      const latitudeDeg = opts.minLatDeg + random() * (opts.maxLatDeg - opts.minLatDeg);
      const east = opts.minLonDeg + random() * (opts.maxLonDeg - opts.minLonDeg);
      const longitudeDeg = east > 180 ? east - 360 : east; // as a GPS writes it
      const timeMs = day + random() * DAY_MS;
      const direct = synthesizeField(igrf, { latitudeDeg, longitudeDeg, heightM: 100, timeMs }).totalNt;
      worst = Math.max(worst, Math.abs(grid.evaluate(latitudeDeg, longitudeDeg, 100, timeMs) - direct));
    }
    expect(worst).toBeLessThanOrEqual(TOLERANCE_NT);
    // −179.99° is read from the grid at 180.01° (a direct synthesis would differ by the ~1e-4 nT grid error).
    const lat = opts.minLatDeg + 0.013;
    const t = day + 0.3 * DAY_MS;
    expect(Math.abs(grid.evaluate(lat, -179.99, 100, t) - grid.evaluate(lat, 180.01, 100, t))).toBeLessThan(1e-9);
  });

  it("falls back to exact synthesis for readings outside the box or time range", () => {
    const opts = box(50.9, 7.1, 5, Date.UTC(2026, 4, 11));
    const evaluate = createTotalFieldEvaluator(igrf, opts);
    const outside = { latitudeDeg: 52, longitudeDeg: 9, heightM: 0, timeMs: Date.UTC(2026, 6, 1) };
    expect(evaluate(outside.latitudeDeg, outside.longitudeDeg, outside.heightM, outside.timeMs)).toBe(
      synthesizeField(igrf, outside).totalNt,
    );
  });

  it("throws OutsideModelValidityError for a reading outside the model's validity", () => {
    const evaluate = createTotalFieldEvaluator(igrf, box(50.9, 7.1, 5, Date.UTC(2029, 11, 31), 3));
    expect(() => evaluate(50.91, 7.11, 100, Date.UTC(2029, 11, 31, 12))).not.toThrow();
    expect(() => evaluate(50.91, 7.11, 100, Date.UTC(2030, 0, 1, 12))).toThrow(OutsideModelValidityError);
  });

  it("gives a single-point box and a single instant exactly the direct value", () => {
    const t = Date.UTC(2025, 8, 3, 9, 30);
    const evaluate = createTotalFieldEvaluator(igrf, {
      minTimeMs: t, maxTimeMs: t, minLatDeg: -12.3, maxLatDeg: -12.3, minLonDeg: 45, maxLonDeg: 45, minHeightM: 10, maxHeightM: 10,
    });
    expect(evaluate(-12.3, 45, 10, t)).toBeCloseTo(synthesizeField(igrf, { latitudeDeg: -12.3, longitudeDeg: 45, heightM: 10, timeMs: t }).totalNt, 9);
  });

  it("handles a one-point box at the north pole (no node beyond 90°)", () => {
    const t = Date.UTC(2026, 0, 5);
    const opts = { minTimeMs: t, maxTimeMs: t, minLatDeg: 90, maxLatDeg: 90, minLonDeg: 0, maxLonDeg: 0, minHeightM: 0, maxHeightM: 0 };
    expect(createTotalFieldGrid(igrf, opts).usesGrid).toBe(true);
    expect(createTotalFieldEvaluator(igrf, opts)(90, 0, 0, t)).toBeCloseTo(
      synthesizeField(igrf, { latitudeDeg: 90, longitudeDeg: 0, heightM: 0, timeMs: t }).totalNt,
      6,
    );
  });

  it("rejects a box with its minimum above its maximum", () => {
    const opts = { ...box(10, 10, 5, Date.UTC(2026, 0, 1)), minLatDeg: 11 };
    expect(() => createTotalFieldEvaluator(igrf, opts)).toThrow(RangeError);
  });
});

describe("batch form of the total-field evaluator", () => {
  it("gives the one-reading evaluator's values bit for bit, NaN where a reading has no position or lies outside validity, the default height where it has none", () => {
    // WMM2025 (geomagnetism package) is valid 2025.0–2030.0; the box is one day in 2026
    const model = wmmModel();
    const opts = box(52.1, -3.45, 5, Date.UTC(2026, 4, 4));
    const grid = createTotalFieldGrid(model, opts);
    expect(grid.usesGrid).toBe(true);
    const random = sequence(7);
    const n = 5_000;
    const lat = new Float64Array(n), lon = new Float64Array(n), height = new Float64Array(n), time = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      // mostly inside the box, some outside it (direct synthesis), a few without position or height
      const outside = i % 50 === 7;
      lat[i] = i % 97 === 3 ? NaN : opts.minLatDeg + (outside ? 0.5 : random()) * (opts.maxLatDeg - opts.minLatDeg) * (outside ? 3 : 1);
      lon[i] = opts.minLonDeg + random() * (opts.maxLonDeg - opts.minLonDeg) + (i % 61 === 0 ? 360 : 0);
      height[i] = i % 89 === 5 ? NaN : opts.minHeightM + random() * (opts.maxHeightM - opts.minHeightM);
      time[i] = i % 71 === 9 ? Date.UTC(2031, 0, 1) : Math.round(opts.minTimeMs + random() * (opts.maxTimeMs - opts.minTimeMs) + (i % 43 === 2 ? 3 * DAY_MS : 0));
    }
    const out = new Float64Array(n);
    grid.evaluateInto(out, lat, lon, height, time, n, 123);
    let checked = 0;
    for (let i = 0; i < n; i++) {
      if (lat[i] !== lat[i] || time[i] > Date.UTC(2030, 0, 1)) {
        expect(out[i]).toBeNaN();
        continue;
      }
      const h = height[i] === height[i] ? height[i] : 123;
      expect(out[i]).toBe(grid.evaluate(lat[i], lon[i], h, time[i]));
      if (i % 50 === 7) {
        // outside the box: direct synthesis, exactly
        expect(out[i]).toBe(synthesizeField(model, { latitudeDeg: lat[i], longitudeDeg: lon[i], heightM: h, timeMs: time[i] }).totalNt);
      } else {
        expect(Math.abs(out[i] - synthesizeField(model, { latitudeDeg: lat[i], longitudeDeg: lon[i], heightM: h, timeMs: time[i] }).totalNt)).toBeLessThan(TOLERANCE_NT);
      }
      checked++;
    }
    expect(checked).toBeGreaterThan(4_700);
    expect(() => grid.evaluate(52.1, -3.45, 0, Date.UTC(2031, 0, 1))).toThrow(OutsideModelValidityError);
  });
});
