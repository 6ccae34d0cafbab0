/** Chart thinning with breaks, and distance along a line, on data whose answer is known by construction. */
import { describe, expect, it } from "vitest";
import { distanceAlongM } from "@/src/server/days/line-distance";
import { thinWithBreaks } from "@/src/server/days/thin-series";

describe("thinWithBreaks", () => {
  it("stays within the budget, keeps a spike and draws a null row at a time gap", () => {
    const n = 86_400;
    const x = Float64Array.from({ length: n }, (_, i) => i * 1000 + (i >= 40_000 ? 600_000 : 0)); // 10 min gap after reading 39 999
    const y = Float64Array.from({ length: n }, (_, i) => 49_000 + Math.sin(i / 3000) * 20 + (i === 70_000 ? 150 : 0));
    const out = thinWithBreaks(x, [y], 2000, (i) => x[i] - x[i - 1] > 60_000);
    expect(out.x.length).toBeLessThanOrEqual(2001);
    expect(out.x.length).toBeGreaterThan(1500);
    expect(out.ys[0]).toContain(49_000 + Math.round(Math.sin(70_000 / 3000) * 20 * 1000) / 1000 + 150);
    const nullAt = out.ys[0].indexOf(null);
    expect(nullAt).toBeGreaterThan(0);
    expect(out.x[nullAt]).toBeGreaterThan(39_999 * 1000);
    expect(out.x[nullAt]).toBeLessThan(40_000 * 1000 + 600_000);
  });

  it("breaks a series where its values are missing while another series continues", () => {
    const x = Float64Array.from({ length: 100 }, (_, i) => i);
    const raw = Float64Array.from(x, (i) => 10 + i);
    const corrected = Float64Array.from(x, (i) => (i >= 40 && i < 50 ? NaN : i));
    const out = thinWithBreaks(x, [raw, corrected], 1000, () => false);
    expect(out.x).toHaveLength(100);
    expect(out.ys[0].every((v) => v !== null)).toBe(true);
    expect(out.ys[1].slice(40, 50).every((v) => v === null)).toBe(true);
  });
});

describe("distanceAlongM", () => {
  it("adds up 1 m steps east and skips readings without a position", () => {
    const latDeg = 53.6;
    const mPerDegLon = 6_371_008.8 * (Math.PI / 180) * Math.cos((latDeg * Math.PI) / 180);
    const lon = Float64Array.from({ length: 11 }, (_, i) => (i === 5 ? NaN : -1.93 + i / mPerDegLon));
    const lat = Float64Array.from(lon, (v) => (v !== v ? NaN : latDeg));
    const d = distanceAlongM(lat, lon);
    expect(d[10]).toBeCloseTo(10, 9);
    expect(Number.isNaN(d[5])).toBe(true);
    expect(d[6]).toBeCloseTo(6, 9);
  });
});
