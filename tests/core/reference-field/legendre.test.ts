import { describe, expect, it } from "vitest";
import { schmidtLegendre } from "@/src/core/reference-field/legendre";
import { coefficientIndex } from "@/src/core/reference-field/model";

// Closed forms of the Schmidt semi-normalised associated Legendre functions (no Condon–Shortley
// phase), source: Schmidt semi-normalisation, e.g. Winch et al. 2005 / standard texts — written
// here from memory and cross-checked below by the addition theorem and by finite differences.
const closedForms: Array<[n: number, m: number, p: (c: number, s: number) => number, dp: (c: number, s: number) => number]> = [
  [1, 0, (c) => c, (_c, s) => -s],
  [1, 1, (_c, s) => s, (c) => c],
  [2, 0, (c) => (3 * c * c - 1) / 2, (c, s) => -3 * c * s],
  [2, 1, (c, s) => Math.sqrt(3) * c * s, (c, s) => Math.sqrt(3) * (c * c - s * s)],
  [2, 2, (_c, s) => (Math.sqrt(3) / 2) * s * s, (c, s) => Math.sqrt(3) * s * c],
  [3, 0, (c) => (5 * c ** 3 - 3 * c) / 2, (c, s) => (-s * (15 * c * c - 3)) / 2],
  [3, 1, (c, s) => Math.sqrt(3 / 8) * s * (5 * c * c - 1), (c, s) => Math.sqrt(3 / 8) * (c * (5 * c * c - 1) - 10 * c * s * s)],
  [3, 2, (c, s) => (Math.sqrt(15) / 2) * c * s * s, (c, s) => (Math.sqrt(15) / 2) * (2 * s * c * c - s ** 3)],
  [3, 3, (_c, s) => Math.sqrt(5 / 8) * s ** 3, (c, s) => 3 * Math.sqrt(5 / 8) * s * s * c],
];

const colatitudesRad = [0, 0.013, 0.4, 1.0, Math.PI / 2, 2.2, 3.0, Math.PI];

describe("Schmidt semi-normalised Legendre functions", () => {
  for (const theta of colatitudesRad) {
    it(`match closed forms for n ≤ 3 at θ = ${theta.toFixed(3)} rad`, () => {
      const table = schmidtLegendre(3, theta);
      const c = Math.cos(theta);
      const s = Math.sin(theta);
      for (const [n, m, p, dp] of closedForms) {
        const k = coefficientIndex(n, m);
        expect(table.p[k], `P${n}${m}`).toBeCloseTo(p(c, s), 13);
        expect(table.dp[k], `dP${n}${m}/dθ`).toBeCloseTo(dp(c, s), 13);
      }
    });
  }

  it("obey the addition theorem Σm P(n,m)² = 1 for every degree to 13 (standard texts, from memory)", () => {
    for (const theta of colatitudesRad) {
      const table = schmidtLegendre(13, theta);
      for (let n = 0; n <= 13; n++) {
        let sum = 0;
        for (let m = 0; m <= n; m++) sum += table.p[coefficientIndex(n, m)] ** 2;
        expect(sum, `n = ${n}, θ = ${theta}`).toBeCloseTo(1, 12);
      }
    }
  });

  it("have θ-derivatives equal to central finite differences of the values, to degree 13", () => {
    const step = 1e-6;
    for (const theta of [0.3, 1.1, 1.9, 2.8]) {
      const here = schmidtLegendre(13, theta);
      const up = schmidtLegendre(13, theta + step);
      const down = schmidtLegendre(13, theta - step);
      for (let k = 0; k < here.p.length; k++) {
        expect(here.dp[k]).toBeCloseTo((up.p[k] - down.p[k]) / (2 * step), 7);
      }
    }
  });
});
