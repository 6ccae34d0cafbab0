/**
 * LTTB against properties stated by its author (Steinarsson 2013, ch. 4.2): the first and last
 * points are always kept, one point comes from each of threshold − 2 equal buckets, and a lone
 * spike wins its bucket because it makes the largest triangle.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { lttbIndices } from "@/src/core/series/lttb";

const range = (n: number) => Float64Array.from({ length: n }, (_, i) => i);

describe("lttbIndices", () => {
  it("keeps first and last, returns exactly threshold ascending indices, one per bucket", () => {
    fc.assert(
      fc.property(fc.integer({ min: 5, max: 3000 }), fc.integer({ min: 3, max: 400 }), fc.integer(), (n, threshold, seed) => {
        const x = range(n);
        let s = seed;
        const y = Float64Array.from({ length: n }, () => ((s = (s * 1103515245 + 12345) | 0) % 1000) / 10);
        const kept = lttbIndices(x, y, threshold);
        if (threshold >= n) {
          expect(kept.length).toBe(n);
          return;
        }
        expect(kept.length).toBe(threshold);
        expect(kept[0]).toBe(0);
        expect(kept[threshold - 1]).toBe(n - 1);
        const every = (n - 2) / (threshold - 2);
        for (let b = 0; b < threshold - 2; b++) {
          const idx = kept[b + 1];
          expect(idx).toBeGreaterThanOrEqual(Math.floor(b * every) + 1);
          expect(idx).toBeLessThan(Math.floor((b + 1) * every) + 1);
        }
      }),
      { numRuns: 200 },
    );
  });

  it("keeps the peak of a spike on a flat line", () => {
    const n = 10_000;
    const y = new Float64Array(n).fill(50_000);
    y[6_543] = 50_250;
    const kept = lttbIndices(range(n), y, 100);
    expect(Array.from(kept)).toContain(6_543);
  });

  it("keeps both extremes of a dipole anomaly (peak and trough)", () => {
    const n = 20_000;
    const x = range(n);
    const y = Float64Array.from(x, (i) => 100 * Math.exp(-(((i - 9_000) / 40) ** 2)) - 60 * Math.exp(-(((i - 9_200) / 40) ** 2)));
    const kept = Array.from(lttbIndices(x, y, 500));
    const maxKept = Math.max(...kept.map((i) => y[i]));
    const minKept = Math.min(...kept.map((i) => y[i]));
    // Buckets here are 40 samples wide, as wide as the anomaly: LTTB keeps a point near each
    // extreme (not necessarily the sample itself); striding at the same budget can miss both.
    expect(maxKept).toBeGreaterThan(0.95 * Math.max(...y));
    expect(minKept).toBeLessThan(0.95 * Math.min(...y));
  });

  it("returns everything when the threshold is not below the count, the ends for threshold 2", () => {
    expect(Array.from(lttbIndices(range(4), range(4), 10))).toEqual([0, 1, 2, 3]);
    expect(Array.from(lttbIndices(range(50), range(50), 2))).toEqual([0, 49]);
    expect(() => lttbIndices(range(3), range(2), 2)).toThrow(RangeError);
  });
});
