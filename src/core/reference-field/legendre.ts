/**
 * Schmidt semi-normalised associated Legendre functions P(n, m)(cos θ) and their θ-derivatives.
 *
 * Recursion (no Condon–Shortley phase), with θ the colatitude:
 *   P(0,0) = 1, P(1,1) = sin θ, P(m,m) = √((2m − 1) / 2m) · sin θ · P(m−1,m−1) for m ≥ 2,
 *   P(n,m) = [(2n − 1) cos θ P(n−1,m) − √((n−1)² − m²) P(n−2,m)] / √(n² − m²) for n > m,
 * differentiated term by term for dP/dθ, so nothing is divided by sin θ.
 * Values are stored in triangular order, index n(n+1)/2 + m.
 */
import { coefficientCount, coefficientIndex } from "./model";

export interface LegendreTable {
  maxDegree: number;
  /** P(n, m) in triangular order. */
  p: Float64Array;
  /** dP(n, m)/dθ in triangular order. */
  dp: Float64Array;
}

/** Square-root factors of the recursion, computed once per degree. */
interface RecursionFactors {
  diagonal: Float64Array; // √((2m−1)/2m) for m ≥ 2 (index m)
  first: Float64Array; // (2n−1)/√(n²−m²), triangular
  second: Float64Array; // √((n−1)²−m²)/√(n²−m²), triangular
}

const factorCache = new Map<number, RecursionFactors>();

function recursionFactors(maxDegree: number): RecursionFactors {
  const cached = factorCache.get(maxDegree);
  if (cached) return cached;
  const size = coefficientCount(maxDegree);
  const diagonal = new Float64Array(maxDegree + 1);
  const first = new Float64Array(size);
  const second = new Float64Array(size);
  for (let m = 2; m <= maxDegree; m++) diagonal[m] = Math.sqrt((2 * m - 1) / (2 * m));
  for (let m = 0; m <= maxDegree; m++) {
    for (let n = m + 1; n <= maxDegree; n++) {
      const k = coefficientIndex(n, m);
      const norm = Math.sqrt(n * n - m * m);
      first[k] = (2 * n - 1) / norm;
      second[k] = n - 1 > m ? Math.sqrt((n - 1) * (n - 1) - m * m) / norm : 0;
    }
  }
  const factors = { diagonal, first, second };
  factorCache.set(maxDegree, factors);
  return factors;
}

/** Allocate a table for degrees 0..maxDegree (reuse it across calls to avoid garbage). */
export function createLegendreTable(maxDegree: number): LegendreTable {
  const size = coefficientCount(maxDegree);
  return { maxDegree, p: new Float64Array(size), dp: new Float64Array(size) };
}

/** Fill `table` with P(n,m)(cos θ) and dP/dθ for the given cos θ and sin θ (sin θ ≥ 0). */
export function fillSchmidtLegendre(table: LegendreTable, cosTheta: number, sinTheta: number): LegendreTable {
  const { maxDegree, p, dp } = table;
  const { diagonal, first, second } = recursionFactors(maxDegree);
  p[0] = 1;
  dp[0] = 0;
  for (let m = 0; m <= maxDegree; m++) {
    const mm = coefficientIndex(m, m);
    if (m === 1) {
      p[mm] = sinTheta;
      dp[mm] = cosTheta;
    } else if (m >= 2) {
      const prev = coefficientIndex(m - 1, m - 1);
      p[mm] = diagonal[m] * sinTheta * p[prev];
      dp[mm] = diagonal[m] * (cosTheta * p[prev] + sinTheta * dp[prev]);
    }
    for (let n = m + 1; n <= maxDegree; n++) {
      const k = coefficientIndex(n, m);
      const k1 = coefficientIndex(n - 1, m);
      if (n - 1 > m) {
        const k2 = coefficientIndex(n - 2, m);
        p[k] = first[k] * cosTheta * p[k1] - second[k] * p[k2];
        dp[k] = first[k] * (cosTheta * dp[k1] - sinTheta * p[k1]) - second[k] * dp[k2];
      } else {
        p[k] = first[k] * cosTheta * p[k1];
        dp[k] = first[k] * (cosTheta * dp[k1] - sinTheta * p[k1]);
      }
    }
  }
  return table;
}

/** Convenience: a fresh table of P(n,m) and dP/dθ at colatitude θ (radians). */
export function schmidtLegendre(maxDegree: number, colatitudeRad: number): LegendreTable {
  return fillSchmidtLegendre(createLegendreTable(maxDegree), Math.cos(colatitudeRad), Math.sin(colatitudeRad));
}
