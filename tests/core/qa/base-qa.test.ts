import { describe, expect, it } from "vitest";
import {
  chordDeviation,
  computeBaseQa,
  fourthDifferenceNoise,
  hampelSpikes,
  judgeDay,
  MAD_TO_SIGMA,
  mergeWindows,
} from "@/src/core/qa";

// Synthetic records whose answers are known by construction.
const T0 = Date.UTC(2026, 4, 4, 6, 0, 0);
function record(seconds: number, f: (tS: number, i: number) => number, stepS = 1, skip?: (tS: number) => boolean) {
  const t: number[] = [];
  const v: number[] = [];
  for (let i = 0; i * stepS <= seconds; i++) {
    const tS = i * stepS;
    if (skip && skip(tS)) continue;
    t.push(T0 + tS * 1000);
    v.push(f(tS, i));
  }
  return { t: Float64Array.from(t), v: Float64Array.from(v) };
}

describe("linear drift", () => {
  const { t, v } = record(3600, (s) => 48_300 + 0.005 * s); // 18 nT per hour
  const qa = computeBaseQa(t, v);
  it("has chord deviation 0, d4 = 0, no spikes, no gaps", () => {
    expect(qa.samplingIntervalS).toBe(1);
    expect(qa.chord.maxDeviationNt).toBeLessThan(1e-9);
    expect(qa.noise.maxAbsNt).toBeLessThan(1e-9);
    expect(qa.noise.count).toBe(3601 - 4);
    expect(qa.spikes.count).toBe(0);
    expect(qa.gaps.count).toBe(0);
    expect(qa.change.maxChangeNt).toBeCloseTo(0.3, 9); // 0.005 nT/s × 60 s
    expect(qa.rangeNt.rangeNt).toBeCloseTo(18, 9);
    expect(qa.windows).toEqual([]);
    expect(qa.verdict.level).toBe("quiet");
    expect(qa.noise.formula).toMatch(/\/ 16/);
  });
});

describe("fourth difference of polynomials (closed form)", () => {
  // Δ⁴ of a polynomial of degree ≤ 3 is 0; of a·t⁴ with step h it is 24·a·h⁴ (finite-difference identity).
  it.each([
    ["quadratic", (s: number) => 48_000 + 0.3 * s + 0.002 * s * s, 0],
    ["cubic", (s: number) => 48_000 + 0.3 * s - 0.002 * s * s + 1e-5 * s ** 3, 0],
    ["quartic a=0.01, h=1", (s: number) => 0.01 * s ** 4, (24 * 0.01) / 16],
  ])("%s", (_name, f, expected) => {
    const { t, v } = record(100, f as (s: number) => number);
    const noise = fourthDifferenceNoise(t, v, 1, 10);
    expect(noise.rmsNt).toBeCloseTo(expected as number, 7);
    expect(noise.maxAbsNt).toBeCloseTo(expected as number, 7);
  });
  it("scales with h⁴ for a wider step", () => {
    const { t, v } = record(400, (s) => 0.01 * s ** 4 * 1e-4, 4); // a = 1e-6, h = 4 s → 24·1e-6·256/16
    expect(fourthDifferenceNoise(t, v, 4, 10).rmsNt).toBeCloseTo((24 * 1e-6 * 256) / 16, 9);
  });
});

describe("a 200 nT step", () => {
  const stepAt = 1800;
  const { t, v } = record(3600, (s) => (s < stepAt ? 48_300 : 48_500));
  const qa = computeBaseQa(t, v);
  it("gives a 200 nT change, a large chord deviation and a storm verdict", () => {
    expect(qa.change.maxChangeNt).toBe(200);
    // chord over 60 samples across the step: worst interior sample is 200 × (1 − 1/60) from the chord
    expect(qa.chord.maxDeviationNt).toBeCloseTo(200 * (59 / 60), 6);
    expect(qa.verdict.level).toBe("storm");
    expect(qa.verdict.reasons.map((r) => r.metric)).toContain("changeNt");
  });
  it("shades one merged chord window around the step", () => {
    const chord = qa.windows.filter((w) => w.metric === "chord");
    expect(chord).toHaveLength(1);
    expect(chord[0].startMs).toBeLessThan(T0 + stepAt * 1000);
    expect(chord[0].endMs).toBeGreaterThan(T0 + stepAt * 1000);
    expect(chord[0].endMs - chord[0].startMs).toBeLessThanOrEqual(121_000);
  });
});

describe("spike train", () => {
  // slow 10 nT sine plus +50 nT on every 100th sample from index 50
  const { t, v } = record(2000, (s, i) => 48_300 + 10 * Math.sin(s / 600) + (i % 100 === 50 ? 50 : 0));
  it("finds exactly the spikes by a Hampel test", () => {
    const r = hampelSpikes(t, v, 3, 3, 1.0);
    expect(r.count).toBe(20);
    expect(r.spikes.map((sp) => (sp.timeMs - T0) / 1000)).toEqual(Array.from({ length: 20 }, (_, k) => 50 + 100 * k));
    expect(r.spikes[0].deviationNt).toBeCloseTo(50, 0);
  });
  it("uses MAD → σ scale 1/Φ⁻¹(3/4)", () => {
    // Φ⁻¹(0.75) = 0.6744897501960817 (standard normal quantile, common practice)
    expect(MAD_TO_SIGMA).toBeCloseTo(1 / 0.6744897501960817, 4);
  });
});

describe("a known gap", () => {
  const { t, v } = record(3600, (s) => 48_300 + 0.001 * s, 1, (s) => s > 1000 && s < 1300);
  const qa = computeBaseQa(t, v);
  it("counts one gap of 300 s against a 3 s threshold", () => {
    expect(qa.gaps.count).toBe(1);
    expect(qa.gaps.longestS).toBe(300);
    expect(qa.gaps.thresholdS).toBe(3);
    expect(qa.windows.filter((w) => w.metric === "gap")).toEqual([{ startMs: T0 + 1_000_000, endMs: T0 + 1_300_000, metric: "gap", value: 300 }]);
    expect(qa.verdict.level).toBe("disturbed"); // longest gap 300 s > 120 s
  });
  it("honours gapMinS", () => {
    expect(computeBaseQa(t, v, { gapMinS: 600 }).gaps.count).toBe(0);
  });
});

describe("chord window", () => {
  it("measures deviation from the chord, not from the mean", () => {
    // a triangle bump of 4 nT peak inside a 60 s window: chord from 0 to 0 → deviation 4
    const { t, v } = record(60, (s) => 48_000 + Math.max(0, 4 - Math.abs(s - 30) * 0.5));
    const r = chordDeviation(t, v, 60, 3);
    expect(r.maxDeviationNt).toBeCloseTo(4, 9);
    expect(r.atMs).toBe(T0 + 30_000);
    expect(r.windows).toHaveLength(1);
  });
});

describe("daily ranges and verdict", () => {
  it("splits ranges at UTC midnight", () => {
    const start = Date.UTC(2026, 4, 4, 23, 59, 0);
    const t = Float64Array.from([0, 30, 60, 90].map((s) => start + s * 1000));
    const v = Float64Array.from([48_300, 48_310, 48_200, 48_205]);
    const qa = computeBaseQa(t, v);
    expect(qa.dailyRanges.map((d) => [d.dayUtc, d.rangeNt])).toEqual([["2026-05-04", 10], ["2026-05-05", 5]]);
  });
  it("judges from the thresholds passed, including Kp > 5 (Hejda et al. 2006)", () => {
    const metrics = { dailyRangeNt: 40, changeNt: 2, chordDeviationNt: 0.5, noiseRmsNt: 0.1, longestGapS: 0, spikeCount: 0 };
    expect(judgeDay(metrics).level).toBe("quiet");
    expect(judgeDay({ ...metrics, kp: 6 }).level).toBe("storm");
    const custom = judgeDay(metrics, { disturbed: { dailyRangeNt: 30 } });
    expect(custom.level).toBe("disturbed");
    expect(custom.reasons[0].text).toMatch(/daily range 40 nT > 30 nT/);
  });
  it("merges overlapping windows of one metric only", () => {
    const merged = mergeWindows([
      { startMs: 0, endMs: 10, metric: "chord", value: 4 },
      { startMs: 5, endMs: 20, metric: "chord", value: 6 },
      { startMs: 30, endMs: 40, metric: "chord", value: 5 },
    ]);
    expect(merged).toEqual([
      { startMs: 0, endMs: 20, metric: "chord", value: 6 },
      { startMs: 30, endMs: 40, metric: "chord", value: 5 },
    ]);
  });
  it("refuses too few or unordered readings", () => {
    expect(() => computeBaseQa([1], [48_000])).toThrow(/two/);
    expect(() => computeBaseQa([2, 1], [48_000, 48_001])).toThrow(/ascending/);
  });
});

describe("fourth-difference noise of white noise", () => {
  it("gives RMS(d4/16) = σ·√70/16 (sum of squared binomial weights 1+16+36+16+1 = 70)", () => {
    // uniform noise on ±0.5 nT has σ = 1/√12 (closed form); deterministic generator (LCG, common practice)
    let seed = 11;
    const rnd = () => ((seed = (seed * 1_103_515_245 + 12_345) % 2_147_483_648) / 2_147_483_648);
    const { t, v } = record(40_000, () => 48_300 + (rnd() - 0.5));
    const sigma = 1 / Math.sqrt(12);
    const noise = fourthDifferenceNoise(t, v, 1, 10);
    expect(noise.rmsNt / ((sigma * Math.sqrt(70)) / 16)).toBeGreaterThan(0.97);
    expect(noise.rmsNt / ((sigma * Math.sqrt(70)) / 16)).toBeLessThan(1.03);
  });
});
