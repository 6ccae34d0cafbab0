import { describe, expect, it } from "vitest";
import { createBaseInterpolator, CoverStatus, prepareBaseSeries } from "@/src/core/correction";
import { evaluateSplineInterval, lastIndexAtOrBefore, naturalSplineSecondDerivatives } from "@/src/core/series";

const T0 = Date.UTC(2026, 4, 4, 8, 0, 0);
const s = (seconds: number) => T0 + seconds * 1000;
function series(points: Array<[number, number]>) {
  return prepareBaseSeries(points.map(([t]) => s(t)), points.map(([, f]) => f));
}

describe("linear base interpolation (by construction)", () => {
  const base = series([[0, 48300], [60, 48306], [120, 48303], [400, 48310]]);
  const lin = createBaseInterpolator(base, { method: "linear", maxGapS: 120 });
  it("is exact at samples and proportional between them", () => {
    expect(lin.at(s(0))).toBe(48300);
    expect(lin.at(s(30))).toBeCloseTo(48303, 10);
    expect(lin.at(s(90))).toBeCloseTo(48304.5, 10);
    expect(lin.at(s(120))).toBe(48303);
    expect(lin.status).toBe(CoverStatus.Ok);
  });
  it("never extrapolates past either end", () => {
    expect(lin.at(s(-0.001))).toBeNaN();
    expect(lin.status).toBe(CoverStatus.NoBaseCover);
    expect(lin.at(s(400.001))).toBeNaN();
    expect(lin.status).toBe(CoverStatus.NoBaseCover);
    expect(lin.at(s(400))).toBe(48310);
  });
  it("does not bridge a gap longer than maxGapS, but a gap of exactly maxGapS is bridged", () => {
    expect(lin.at(s(200))).toBeNaN();
    expect(lin.status).toBe(CoverStatus.BaseGap);
    const wide = createBaseInterpolator(base, { method: "linear", maxGapS: 280 });
    expect(wide.at(s(260))).toBeCloseTo(48306.5, 10);
  });
  it("gives the same answers for unordered query times (search hint reset)", () => {
    const order = [350, 10, 119, 0.5, 61, 200];
    const a = order.map((t) => lin.at(s(t)));
    const b = order.map((t) => createBaseInterpolator(base, { maxGapS: 120 }).at(s(t)));
    expect(a).toEqual(b);
  });
});

describe("nearest", () => {
  const base = series([[0, 1e4 + 1], [10, 1e4 + 2]]);
  const near = createBaseInterpolator(base, { method: "nearest" });
  it("takes the nearer sample and the earlier one on a tie (documented rule)", () => {
    expect(near.at(s(4.999))).toBe(1e4 + 1);
    expect(near.at(s(5))).toBe(1e4 + 1);
    expect(near.at(s(5.001))).toBe(1e4 + 2);
  });
});

describe("duplicate and unordered base times", () => {
  it("averages readings that share a time and sorts the record", () => {
    const p = prepareBaseSeries([s(10), s(0), s(10), s(20)], [48302, 48300, 48304, 48310]);
    expect(Array.from(p.timeMs)).toEqual([s(0), s(10), s(20)]);
    expect(Array.from(p.fieldNt)).toEqual([48300, 48303, 48310]);
    expect(p.duplicateSamplesMerged).toBe(1);
    expect(p.wasUnsorted).toBe(true);
  });
  it("refuses a raw series with repeated times", () => {
    expect(() => createBaseInterpolator({ timeMs: new Float64Array([1, 1]), fieldNt: new Float64Array([2, 3]) })).toThrow(/ascending/);
  });
});

describe("natural cubic spline", () => {
  it("reproduces a straight line exactly on uneven knots", () => {
    const pts: Array<[number, number]> = [0, 3, 4, 9, 20, 21, 50].map((t) => [t, 48000 + 0.7 * t]);
    const sp = createBaseInterpolator(series(pts), { method: "spline" });
    for (const t of [0.5, 3.5, 8, 15, 20.5, 33]) expect(sp.at(s(t))).toBeCloseTo(48000 + 0.7 * t, 8);
  });

  it("matches the hand-solved three-point spline", () => {
    // (0,0),(1,1),(2,0), natural ends: 4·M1 = 6·(−1 − 1) → M1 = −3; S(0.5) = 0.5 + (0.375·3)/6 = 0.6875
    // (closed form by hand from the tridiagonal system, e.g. Press et al., Numerical Recipes §3.3).
    const x = [0, 1, 2], y = [0, 1, 0];
    const m = naturalSplineSecondDerivatives(x, y);
    expect(Array.from(m)).toEqual([0, -3, 0]);
    expect(evaluateSplineInterval(x, y, m, 0, 0.5)).toBeCloseTo(0.6875, 12);
    expect(evaluateSplineInterval(x, y, m, 1, 1.5)).toBeCloseTo(0.6875, 12);
  });

  it("interpolates sin within the h⁴ error bound and converges at fourth order", () => {
    // Bound |f − S| ≤ (5/384)·h⁴·max|f⁗| (Hall & Meyer, J. Approx. Theory 16, 1976); sin has f'' = 0 at 0
    // and π, so the natural end conditions are exact there. max|sin⁗| = 1.
    const errs: number[] = [];
    for (const n of [10, 20, 40]) {
      const h = Math.PI / n;
      const x = Float64Array.from({ length: n + 1 }, (_, i) => i * h);
      const y = x.map(Math.sin);
      const m = naturalSplineSecondDerivatives(x, y);
      let err = 0;
      for (let k = 0; k <= 2000; k++) {
        const t = (Math.PI * k) / 2000;
        const i = Math.min(lastIndexAtOrBefore(x, t), n - 1);
        err = Math.max(err, Math.abs(evaluateSplineInterval(x, y, m, i, t) - Math.sin(t)));
      }
      expect(err).toBeLessThanOrEqual((5 / 384) * h ** 4);
      errs.push(err);
    }
    expect(errs[0] / errs[1]).toBeGreaterThan(12); // 2⁴ = 16 for fourth order
    expect(errs[1] / errs[2]).toBeGreaterThan(12);
  });

  it("fits each stretch between long gaps on its own", () => {
    const left: Array<[number, number]> = [[0, 48300], [10, 48301], [20, 48302]];
    const right: Array<[number, number]> = [[500, 48800], [510, 48200], [520, 48900]];
    const joint = createBaseInterpolator(series([...left, ...right]), { method: "spline", maxGapS: 120 });
    const alone = createBaseInterpolator(series(left), { method: "spline", maxGapS: 120 });
    expect(joint.at(s(5))).toBeCloseTo(alone.at(s(5)), 12);
    expect(joint.at(s(5))).toBeCloseTo(48300.5, 10); // a straight stretch stays straight
    expect(joint.at(s(250))).toBeNaN();
    expect(joint.status).toBe(CoverStatus.BaseGap);
  });
});

describe("base interpolator, batch form", () => {
  it("fill gives at()'s values and statuses for every method: inside, on samples, across a too-long gap, before and after the record, NaN", () => {
    // constructed record: 1 s samples, a 300 s gap (over the 120 s default) after 08:01:40
    const t0 = Date.UTC(2026, 4, 4, 8);
    const times: number[] = [];
    const fields: number[] = [];
    for (let s = 0; s <= 100; s++) times.push(t0 + s * 1000), fields.push(48_300 + Math.sin(s / 9) * 4);
    for (let s = 400; s <= 500; s++) times.push(t0 + s * 1000), fields.push(48_310 + Math.cos(s / 7) * 3);
    const base = prepareBaseSeries(times, fields);
    const asked = [t0 - 1, t0, t0 + 250, t0 + 1000, t0 + 99_500, t0 + 200_000, t0 + 400_000, t0 + 450_300, t0 + 500_000, t0 + 500_001, NaN, t0 + 3_700];
    for (const method of ["linear", "spline", "nearest"] as const) {
      const one = createBaseInterpolator(base, { method });
      const expected = asked.map((t) => [one.at(t), one.status]);
      const batch = createBaseInterpolator(base, { method });
      const out = new Float64Array(asked.length);
      const status = new Uint8Array(asked.length);
      batch.fill(out, status, asked, asked.length);
      expect(asked.map((_, i) => [out[i], status[i]])).toEqual(expected);
      expect(new Set(status)).toEqual(new Set([CoverStatus.Ok, CoverStatus.NoBaseCover, CoverStatus.BaseGap]));
    }
  });
});
