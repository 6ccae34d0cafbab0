/**
 * Largest-triangle-three-buckets thinning of the log chart (the core's src/core/series/lttb.ts),
 * checked against the `downsample` package's LTTB (an independent implementation of Steinarsson
 * 2013, from the npm registry).
 */
import { LTTB } from "downsample";
import { describe, expect, it } from "vitest";
import { lttbIndices as coreLttbIndices } from "@/src/core/series/lttb";
import { headerSignature, previewHead } from "@/src/server/logs/header-signature";

const lttbIndices = (xs: ArrayLike<number>, ys: ArrayLike<number>, threshold: number) => Array.from(coreLttbIndices(xs, ys, threshold));

function series(n: number, seed: number) {
  let s = seed;
  const rnd = () => (s = (s * 16807) % 2147483647) / 2147483647;
  const xs: number[] = [];
  const ys: number[] = [];
  for (let i = 0; i < n; i++) {
    xs.push(i * 1000 + Math.floor(rnd() * 300)); // uneven sampling
    ys.push(48_000 + Math.sin(i / 300) * 20 + rnd() * 3);
  }
  return { xs, ys };
}

describe("lttbIndices", () => {
  it("selects exactly the points the downsample package's LTTB selects", () => {
    for (const [n, threshold, seed] of [[10_007, 2000, 7], [50_000, 2000, 11], [2_345, 100, 3]] as const) {
      const { xs, ys } = series(n, seed);
      const ref = LTTB(xs.map((x, i) => [x, ys[i]] as [number, number]), threshold) as [number, number][];
      const mine = lttbIndices(xs, ys, threshold).map((i) => [xs[i], ys[i]]);
      expect(mine).toEqual(ref);
    }
  });

  it("keeps the first and last points and an isolated spike that striding would drop", () => {
    const { xs, ys } = series(100_000, 5);
    ys[43_217] += 400; // a passing car at the base
    const kept = lttbIndices(xs, ys, 2000);
    expect(kept).toHaveLength(2000);
    expect(kept[0]).toBe(0);
    expect(kept[kept.length - 1]).toBe(99_999);
    expect(kept).toContain(43_217);
    const strided = Array.from({ length: 2000 }, (_, k) => Math.floor((k * 100_000) / 2000));
    expect(strided).not.toContain(43_217);
    for (let k = 1; k < kept.length; k++) expect(kept[k]).toBeGreaterThan(kept[k - 1]);
  });

  it("returns every index when there are fewer points than the threshold", () => {
    expect(lttbIndices([1, 2, 3], [5, 6, 7], 2000)).toEqual([0, 1, 2]);
  });
});

describe("header preview and signature", () => {
  it("skips comments and blank lines, reads a BOM and CRLF, and normalises case and blanks", () => {
    const p = previewHead("\uFEFF# exported 2026-05-04\r\n\r\nDate ; Time ; Field  (nT)\r\n2026-05-04;07:00:00;48310.0\r\n", { maxRows: 5 });
    expect(p).toMatchObject({ delimiter: ";", header: ["Date", "Time", "Field  (nT)"], rows: [["2026-05-04", "07:00:00", "48310.0"]], headerLine: 3 });
    expect(headerSignature(p!.header)).toBe("date|time|field (nt)");
    expect(headerSignature(["DATE", " time", "Field (nT)"])).toBe(headerSignature(p!.header));
  });
});
