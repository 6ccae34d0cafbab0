import { describe, expect, it } from "vitest";
import { correctReadings, createReferenceEvaluator, prepareBaseSeries } from "@/src/core/correction";
import { synthesizeField } from "@/src/core/reference-field";
import { loadReferenceModel } from "@/src/lib/reference-model";

// IGRF-14 (IAGA 2024, doi:10.5281/zenodo.14012302) read from the shared table at run time.
const model = loadReferenceModel("igrf");
const t0 = Date.UTC(2026, 4, 4, 8);

describe("reference evaluator adapter", () => {
  const n = 500;
  const rover = {
    timeMs: Float64Array.from({ length: n }, (_, i) => t0 + i * 30_000),
    fieldNt: new Float64Array(n).fill(49_000),
    latDeg: Float64Array.from({ length: n }, (_, i) => 52.1 + (i % 50) * 4e-4),
    lonDeg: Float64Array.from({ length: n }, (_, i) => -3.45 + Math.floor(i / 50) * 6e-4),
    heightM: Float64Array.from({ length: n }, (_, i) => 200 + (i % 7) * 10),
  };
  const basePosition = { latDeg: 52.095, lonDeg: -3.46, heightM: 190 };
  const ref = createReferenceEvaluator(model, rover, { basePosition, baseTimeMs: [t0 - 3_600_000, t0 + 8 * 3_600_000] });

  it("agrees with direct synthesis within 0.01 nT over the survey and at the base", () => {
    for (let i = 0; i < n; i += 13) {
      const direct = synthesizeField(model, { latitudeDeg: rover.latDeg[i], longitudeDeg: rover.lonDeg[i], heightM: rover.heightM[i], timeMs: rover.timeMs[i] }).totalNt;
      expect(Math.abs(ref.totalNt(rover.latDeg[i], rover.lonDeg[i], rover.heightM[i], rover.timeMs[i]) - direct)).toBeLessThan(0.01);
    }
    const atBase = synthesizeField(model, { latitudeDeg: 52.095, longitudeDeg: -3.46, heightM: 190, timeMs: t0 - 1_800_000 }).totalNt;
    expect(Math.abs(ref.totalNt(52.095, -3.46, 190, t0 - 1_800_000) - atBase)).toBeLessThan(0.01);
  });

  it("reports the model's validity and label", () => {
    expect(ref.label).toBe(model.name);
    expect(ref.covers(t0)).toBe(true);
    expect(ref.covers(Date.UTC(2031, 0, 1))).toBe(false); // IGRF-14 ends at 2030.0
    expect(ref.covers(Date.UTC(1899, 0, 1))).toBe(false); // and starts at 1900.0
  });

  it("feeds the correction: residual = corrected − IGRF at each reading", () => {
    const base = prepareBaseSeries([t0 - 3_600_000, t0 + 8 * 3_600_000], [48_950, 48_970]);
    const out = correctReadings(rover, base, ref, { datum: 48_950, maxGapS: Infinity });
    expect(out.summary.correctedCount).toBe(n);
    for (let i = 0; i < n; i += 41) {
      expect(out.residualNt[i]).toBeCloseTo(out.correctedNt[i] - out.referenceNt[i], 9);
      expect(out.referenceNt[i]).toBeGreaterThan(45_000); // mid-latitude Europe: ~49 000 nT (memory)
      expect(out.referenceNt[i]).toBeLessThan(52_000);
    }
  });
});
