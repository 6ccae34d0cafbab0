import { describe, expect, it } from "vitest";
import {
  correctReadings,
  createCorrector,
  createReferenceEvaluator,
  duplicateTimeMarks,
  emptyColumns,
  flagNames,
  loopBaseFromStation,
  prepareBaseSeries,
  type ReferenceFieldEvaluator,
} from "@/src/core/correction";
import { parseLogText } from "@/src/core/logs";
import { loadReferenceModel } from "@/src/lib/reference-model";

const T0 = Date.UTC(2026, 4, 4, 8, 0, 0);
const s = (seconds: number) => T0 + seconds * 1000;

/** A made-up planar "model": 50 000 nT + 100 nT per degree of latitude + 0.03 nT/m of height (by construction). */
const planar: ReferenceFieldEvaluator = {
  label: "planar-test",
  covers: (t) => t < s(3600),
  totalNt: (lat, _lon, h) => 50_000 + 100 * lat - 0.03 * h,
};

describe("looped survey (constructed example, DOMAIN.md)", () => {
  it("corrects 48 405.0 nT at 09:15 to 48 397.5 nT with base 48 310.0 at 08:00 and 48 322.0 at 10:00", () => {
    const log = parseLogText(
      [
        "time,station,field",
        "2026-05-04T08:00:00Z,BS1,48310.0",
        "2026-05-04T09:15:00Z,P7,48405.0",
        "2026-05-04T10:00:00Z,BS1,48322.0",
      ].join("\n"),
    );
    const r = log.readings;
    const loop = loopBaseFromStation(r.timeMs, r.fieldNt, r.station!, "bs1");
    expect(loop.base.fieldNt.length).toBe(2);
    const out = correctReadings(r, loop.base, null, {
      datum: 48310.0,
      maxGapS: Infinity,
      baseOccupations: loop.occupationIndices,
    });
    expect(out.baseNt[1]).toBeCloseTo(48317.5, 9); // 75 of 120 min: 48310 + 12 × 75/120
    expect(out.correctedNt[1]).toBeCloseTo(48397.5, 9);
    expect(out.correctedNt[0]).toBeCloseTo(48310.0, 9); // an occupation corrects to the datum
    expect(flagNames(out.flags[0])).toContain("base_occupation");
    expect(flagNames(out.flags[1])).not.toContain("base_occupation");
  });
});

describe("continuous base", () => {
  const base = prepareBaseSeries([s(0), s(60), s(120), s(600), s(660)], [48300, 48312, 48306, 48320, 48330]);
  const rover = {
    timeMs: [s(-1), s(30), s(90), s(300), s(630), s(630), s(700), s(4000)],
    fieldNt: [48400, 48400, 48400, 48400, 48400, 48401, 48400, 48400],
    latDeg: [10, 10, 10, 10, NaN, 10, 10, 10],
    lonDeg: [5, 5, 5, 5, NaN, 5, 5, 5],
    heightM: [100, 100, 100, 100, 100, NaN, 100, 100],
  };

  it("computes base, diurnal, corrected, reference and residual per reading", () => {
    const out = correctReadings(rover, base, planar, { datum: 48300, instrumentOffsetNt: 1.5 });
    // t = 30 s: B = 48306, diurnal = 6, corrected = 48400 − 1.5 − 6 = 48392.5; reference = 50000 + 1000 − 3 = 50997
    expect(out.baseNt[1]).toBeCloseTo(48306, 9);
    expect(out.diurnalNt[1]).toBeCloseTo(6, 9);
    expect(out.correctedNt[1]).toBeCloseTo(48392.5, 9);
    expect(out.referenceNt[1]).toBeCloseTo(50997, 9);
    expect(out.residualNt[1]).toBeCloseTo(48392.5 - 50997, 9);
    expect(out.correctedNt[2]).toBeCloseTo(48400 - 1.5 - 9, 9);
  });

  it("keeps uncorrectable readings with empty values and flags saying why", () => {
    const out = correctReadings(rover, base, planar, { datum: 48300 });
    const flags = Array.from(out.flags, flagNames);
    expect(flags[0]).toEqual(["no_base_cover"]);
    expect(flags[3]).toEqual(["base_gap"]); // 120 → 600 s is 480 s > 120 s
    expect(flags[4]).toEqual(["duplicate_time", "no_position"]);
    expect(flags[5]).toEqual(["duplicate_time"]);
    expect(flags[6]).toEqual(["no_base_cover"]);
    expect(flags[7]).toEqual(["no_base_cover", "outside_model_validity"]);
    for (const i of [0, 3, 6, 7]) {
      expect(out.correctedNt[i]).toBeNaN();
      expect(out.residualNt[i]).toBeNaN();
    }
    expect(out.referenceNt[0]).toBeCloseTo(50997, 9); // reference still known without base cover
    expect(out.correctedNt[4]).toBeCloseTo(48400 - 25, 9); // corrected although no position
    expect(out.referenceNt[4]).toBeNaN();
    expect(out.referenceNt[5]).toBeCloseTo(51000, 9); // height missing → 0 m, with a warning
    expect(out.summary.warnings.join(" ")).toMatch(/no height/);
    expect(out.summary.flagCounts.no_base_cover).toBe(3);
    expect(out.summary.correctedCount).toBe(4);
  });

  it("takes the median or mean of the base record as datum", () => {
    expect(correctReadings(rover, base, null, { datum: "median" }).summary.datumNt).toBe(48312);
    expect(correctReadings(rover, base, null, { datum: "mean" }).summary.datumNt).toBeCloseTo(48313.6, 9);
  });

  it("with datum = reference applies A = [F − I(x)] − [F_B(t) − I_B] (USGS CMGDS 2017-686-FA)", () => {
    const basePosition = { latDeg: 9.99, lonDeg: 5, heightM: 0 };
    const out = correctReadings(rover, base, planar, { datum: "reference", basePosition });
    const iB = 50_000 + 100 * 9.99;
    const iX = 50_000 + 100 * 10 - 3;
    const expected = 48400 - iX - (48306 - iB);
    expect(out.residualNt[1]).toBeCloseTo(expected, 9);
    expect(out.diurnalNt[1]).toBeCloseTo(48306 - iB, 9);
    expect(out.summary.datumNt).toBeNull();
  });

  it("refuses datum = reference without a model or base position", () => {
    expect(() => correctReadings(rover, base, null, { datum: "reference" })).toThrow(/reference model/);
    expect(() => correctReadings(rover, base, planar, { datum: "reference" })).toThrow(/base position/);
  });

  it("batch form agrees with the whole-log form for in-order logs", () => {
    const sorted = { timeMs: [s(10), s(20), s(20), s(40)], fieldNt: [48401, 48402, 48403, 48404] };
    const whole = correctReadings(sorted, base, null, { datum: 48300 });
    const c = createCorrector(base, null, { datum: 48300 });
    const a = c.correctBatch({ timeMs: sorted.timeMs.slice(0, 2), fieldNt: sorted.fieldNt.slice(0, 2) });
    const b = c.correctBatch({ timeMs: sorted.timeMs.slice(2), fieldNt: sorted.fieldNt.slice(2) });
    expect([...a.correctedNt, ...b.correctedNt]).toEqual(Array.from(whole.correctedNt));
    expect(c.summary().count).toBe(4);
    expect(flagNames(b.flags[0])).toContain("duplicate_time");
  });

  it("batches written into one reused set of columns give the whole-log values, batch by batch", () => {
    const whole = correctReadings(rover, base, planar, { datum: "median" });
    const c = createCorrector(base, planar, { datum: "median" });
    const marks = duplicateTimeMarks(rover.timeMs);
    const into = emptyColumns(3);
    const seen: number[][] = [];
    for (let start = 0; start < rover.timeMs.length; start += 3) {
      const end = Math.min(rover.timeMs.length, start + 3);
      const part = (a: number[]) => a.slice(start, end);
      const batch = c.correctBatch(
        { timeMs: part(rover.timeMs), fieldNt: part(rover.fieldNt), latDeg: part(rover.latDeg), lonDeg: part(rover.lonDeg), heightM: part(rover.heightM) },
        marks.subarray(start, end),
        into,
      );
      expect(batch.count).toBe(end - start);
      expect(batch.baseNt.buffer).toBe(into.baseNt.buffer); // written in place
      for (let i = 0; i < batch.count; i++) seen.push([batch.baseNt[i], batch.correctedNt[i], batch.residualNt[i], batch.flags[i]]);
    }
    expect(seen).toEqual(Array.from(whole.baseNt, (b, i) => [b, whole.correctedNt[i], whole.residualNt[i], whole.flags[i]]));
    expect(() => createCorrector(base, null, { datum: 48300 }).correctBatch(rover, undefined, emptyColumns(2))).toThrow(RangeError);
  });

  it("the evaluator's batch form and its one-reading form give the same columns (WMM2025, geomagnetism package)", () => {
    const model = loadReferenceModel("wmm");
    const t = Date.UTC(2026, 4, 4, 8);
    const positioned = { ...rover, timeMs: rover.timeMs.map((ms) => ms - T0 + t) };
    const base2 = prepareBaseSeries(base.timeMs.map((ms) => ms - T0 + t), base.fieldNt);
    const withBatch = createReferenceEvaluator(model, positioned, { baseTimeMs: base2.timeMs });
    expect(withBatch.totalNtInto).toBeTypeOf("function");
    const { totalNtInto: _dropped, ...oneByOne } = withBatch;
    const a = correctReadings(positioned, base2, withBatch, { datum: "median" });
    const b = correctReadings(positioned, base2, oneByOne, { datum: "median" });
    expect(Array.from(a.referenceNt)).toEqual(Array.from(b.referenceNt));
    expect(Array.from(a.residualNt)).toEqual(Array.from(b.residualNt));
    expect(Array.from(a.flags)).toEqual(Array.from(b.flags));
    expect(a.summary).toEqual(b.summary);
    expect(a.referenceNt.filter((v) => v === v).length).toBeGreaterThan(4);
  });

  // Regression: a duplicate-time pair split across two batches flagged only its second member.
  it("batches flag both members of a duplicate-time pair split between them, as the whole-log form does", () => {
    const log = { timeMs: [s(10), s(20), s(20), s(20), s(40), s(40), s(50)], fieldNt: [48401, 48402, 48403, 48404, 48405, 48406, 48407] };
    const whole = correctReadings(log, base, null, { datum: 48300 });
    expect(Array.from(whole.flags, (f) => flagNames(f).includes("duplicate_time"))).toEqual([false, true, true, true, true, true, false]);
    // every way of cutting the log into batches (cut points as bits), empty batches included
    for (let cuts = 0; cuts < 1 << 6; cuts++) {
      const c = createCorrector(base, null, { datum: 48300 });
      const batches = [];
      let from = 0;
      for (let k = 1; k <= 7; k++) {
        if (k === 7 || cuts & (1 << (k - 1))) {
          batches.push(c.correctBatch({ timeMs: log.timeMs.slice(from, k), fieldNt: log.fieldNt.slice(from, k) }));
          if (k === 4) c.correctBatch({ timeMs: [], fieldNt: [] });
          from = k;
        }
      }
      expect(batches.flatMap((b) => Array.from(b.flags)), `cuts ${cuts.toString(2)}`).toEqual(Array.from(whole.flags));
      expect(c.summary().flagCounts).toEqual(whole.summary.flagCounts);
    }
  });
});
