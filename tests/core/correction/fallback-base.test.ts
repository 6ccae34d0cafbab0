/** Second base filling the first's gaps, on series whose answer is known by construction. */
import { describe, expect, it } from "vitest";
import { mergeFallbackBase } from "@/src/core/correction/fallback-base";

const series = (fromS: number, toS: number, stepS: number, f: (s: number) => number, skip?: (s: number) => boolean) => {
  const t: number[] = [];
  const v: number[] = [];
  for (let s = fromS; s <= toS; s += stepS) if (!skip?.(s)) {
    t.push(s * 1000);
    v.push(f(s));
  }
  return { timeMs: Float64Array.from(t), fieldNt: Float64Array.from(v) };
};
const curve = (s: number) => 10 * Math.sin(s / 900);

describe("mergeFallbackBase", () => {
  it("shifts the second base by the simultaneous difference and uses it only inside the first's gap", () => {
    const primary = series(0, 7200, 5, (s) => 50_000 + curve(s), (s) => s > 3000 && s < 3600);
    const fallback = series(0, 7200, 10, (s) => 49_870 + curve(s)); // same variation, 130 nT lower
    const m = mergeFallbackBase(primary, fallback, 120);
    expect(m.shiftFrom).toBe("simultaneous");
    expect(m.levelShiftNt).toBeCloseTo(130, 6);
    expect(m.fallbackSampleCount).toBe(59); // 3010 … 3590 s every 10 s
    const inGap = Array.from(m.base.timeMs).map((t, i) => [t / 1000, m.base.fieldNt[i]] as const).filter(([s]) => s > 3000 && s < 3600);
    expect(inGap).toHaveLength(59);
    for (const [s, v] of inGap) expect(v).toBeCloseTo(50_000 + curve(s), 9);
    expect(m.base.timeMs.length).toBe(primary.timeMs.length + 59);
  });

  it("keeps the first base unchanged when it has no gap", () => {
    const primary = series(0, 3600, 5, (s) => 50_000 + curve(s));
    const m = mergeFallbackBase(primary, series(0, 3600, 10, (s) => 49_000 + curve(s)), 120);
    expect(m.fallbackSampleCount).toBe(0);
    expect(m.base.timeMs).toBe(primary.timeMs);
  });

  it("falls back to the difference of medians when the bases never overlap", () => {
    const primary = series(0, 1000, 5, () => 50_000);
    const fallback = series(2000, 3000, 5, () => 49_900);
    const m = mergeFallbackBase(primary, fallback, 120);
    expect(m.shiftFrom).toBe("medians");
    expect(m.levelShiftNt).toBeCloseTo(100, 9);
    expect(m.fallbackSampleCount).toBe(fallback.timeMs.length);
  });
});
