/**
 * QA metrics of a base-station record (times in UTC ms, ascending; field in nT). Each function is
 * pure and returns the windows that break its threshold.
 */
import { median, medianAbsoluteDeviation } from "../series";
import { WindowCollector, type QaWindow } from "./windows";

/** Median spacing between consecutive samples, s; NaN for fewer than two samples. */
export function samplingIntervalS(timeMs: ArrayLike<number>): number {
  const n = timeMs.length;
  if (n < 2) return NaN;
  const d = new Float64Array(n - 1);
  for (let i = 1; i < n; i++) d[i - 1] = (timeMs[i] - timeMs[i - 1]) / 1000;
  return median(d);
}

export interface GapReport {
  /** A spacing longer than this is a gap: max(gapFactor × interval, gapMinS). */
  thresholdS: number;
  count: number;
  longestS: number;
  totalS: number;
  windows: QaWindow[];
}

export function findGaps(timeMs: ArrayLike<number>, intervalS: number, gapFactor: number, gapMinS: number): GapReport {
  const thresholdS = Math.max(gapFactor * intervalS, gapMinS);
  const collector = new WindowCollector("gap");
  let count = 0, longestS = 0, totalS = 0;
  for (let i = 1; i < timeMs.length; i++) {
    const dS = (timeMs[i] - timeMs[i - 1]) / 1000;
    if (dS > thresholdS) {
      count++;
      totalS += dS;
      if (dS > longestS) longestS = dS;
      collector.add(timeMs[i - 1], timeMs[i], dS);
    }
  }
  return { thresholdS, count, longestS, totalS, windows: collector.windows };
}

export interface DailyRange {
  /** UTC day, yyyy-mm-dd. */
  dayUtc: string;
  sampleCount: number;
  minNt: number;
  maxNt: number;
  rangeNt: number;
}

export function dailyRanges(timeMs: ArrayLike<number>, fieldNt: ArrayLike<number>): DailyRange[] {
  const out: DailyRange[] = [];
  let day = NaN;
  let cur: DailyRange | null = null;
  for (let i = 0; i < timeMs.length; i++) {
    const d = Math.floor(timeMs[i] / 86_400_000);
    const v = fieldNt[i];
    if (d !== day || !cur) {
      day = d;
      cur = { dayUtc: new Date(d * 86_400_000).toISOString().slice(0, 10), sampleCount: 0, minNt: v, maxNt: v, rangeNt: 0 };
      out.push(cur);
    }
    cur.sampleCount++;
    if (v < cur.minNt) cur.minNt = v;
    if (v > cur.maxNt) cur.maxNt = v;
    cur.rangeNt = cur.maxNt - cur.minNt;
  }
  return out;
}

export interface ChangeReport {
  windowS: number;
  /** Largest max − min inside any window of windowS. */
  maxChangeNt: number;
  atStartMs: number;
  atEndMs: number;
  thresholdNt: number;
  windows: QaWindow[];
}

/** Largest change (max − min) inside any window of `windowS` seconds, by monotonic deques in O(n). */
export function largestChange(timeMs: ArrayLike<number>, fieldNt: ArrayLike<number>, windowS: number, thresholdNt: number): ChangeReport {
  const n = timeMs.length;
  const w = windowS * 1000;
  const maxQ = new Int32Array(n);
  const minQ = new Int32Array(n);
  let maxHead = 0, maxTail = 0, minHead = 0, minTail = 0;
  let left = 0;
  let best = n > 0 ? 0 : NaN, bestStart = NaN, bestEnd = NaN;
  const collector = new WindowCollector("change");
  for (let r = 0; r < n; r++) {
    const v = fieldNt[r];
    while (maxTail > maxHead && fieldNt[maxQ[maxTail - 1]] <= v) maxTail--;
    maxQ[maxTail++] = r;
    while (minTail > minHead && fieldNt[minQ[minTail - 1]] >= v) minTail--;
    minQ[minTail++] = r;
    while (timeMs[r] - timeMs[left] > w) left++;
    while (maxQ[maxHead] < left) maxHead++;
    while (minQ[minHead] < left) minHead++;
    const change = fieldNt[maxQ[maxHead]] - fieldNt[minQ[minHead]];
    if (change > best) {
      best = change;
      bestStart = timeMs[left];
      bestEnd = timeMs[r];
    }
    if (change > thresholdNt) collector.add(timeMs[left], timeMs[r], change);
  }
  return { windowS, maxChangeNt: best, atStartMs: bestStart, atEndMs: bestEnd, thresholdNt, windows: collector.windows };
}

export interface ChordReport {
  windowS: number;
  thresholdNt: number;
  /** Largest |value − chord| over all windows. */
  maxDeviationNt: number;
  atMs: number;
  windows: QaWindow[];
}

/**
 * Chord deviation: for each window start i, the chord runs from sample i to the last sample j with
 * t_j ≤ t_i + windowS; the deviation is max |M_k − chord(t_k)| over i < k < j.
 */
export function chordDeviation(timeMs: ArrayLike<number>, fieldNt: ArrayLike<number>, windowS: number, thresholdNt: number): ChordReport {
  const n = timeMs.length;
  const w = windowS * 1000;
  let best = n > 0 ? 0 : NaN, bestAt = NaN;
  const collector = new WindowCollector("chord");
  let j = 0;
  for (let i = 0; i < n; i++) {
    if (j < i) j = i;
    while (j + 1 < n && timeMs[j + 1] - timeMs[i] <= w) j++;
    if (j - i < 2) continue;
    const t0 = timeMs[i], v0 = fieldNt[i];
    const slope = (fieldNt[j] - v0) / (timeMs[j] - t0);
    let worst = 0, worstAt = t0;
    for (let k = i + 1; k < j; k++) {
      const dev = Math.abs(fieldNt[k] - (v0 + slope * (timeMs[k] - t0)));
      if (dev > worst) {
        worst = dev;
        worstAt = timeMs[k];
      }
    }
    if (worst > best) {
      best = worst;
      bestAt = worstAt;
    }
    if (worst > thresholdNt) collector.add(t0, timeMs[j], worst);
  }
  return { windowS, thresholdNt, maxDeviationNt: best, atMs: bestAt, windows: collector.windows };
}

/** Divisor applied to the fourth difference (some practice divides by 16; with it white noise of σ gives RMS ≈ 0.52 σ). */
export const D4_DIVISOR = 16;
export const D4_FORMULA = "d4 = (M[i-2] - 4*M[i-1] + 6*M[i] - 4*M[i+1] + M[i+2]) / 16";

export interface NoiseReport {
  formula: string;
  divisor: number;
  /** RMS and largest |d4| over points whose five samples are evenly spaced (no gap). */
  rmsNt: number;
  maxAbsNt: number;
  count: number;
  thresholdNt: number;
  windows: QaWindow[];
}

/**
 * Fourth-difference noise. Only points whose four spacings are each within 10 % of the sampling
 * interval count, since the difference assumes even sampling.
 */
export function fourthDifferenceNoise(timeMs: ArrayLike<number>, fieldNt: ArrayLike<number>, intervalS: number, thresholdNt: number): NoiseReport {
  const n = timeMs.length;
  const stepMs = intervalS * 1000;
  const tol = 0.1 * stepMs;
  let sumSq = 0, maxAbs = 0, count = 0;
  const collector = new WindowCollector("noise");
  for (let i = 2; i < n - 2; i++) {
    let even = true;
    for (let k = i - 1; k <= i + 2; k++) {
      if (Math.abs(timeMs[k] - timeMs[k - 1] - stepMs) > tol) {
        even = false;
        break;
      }
    }
    if (!even) continue;
    const d4 = (fieldNt[i - 2] - 4 * fieldNt[i - 1] + 6 * fieldNt[i] - 4 * fieldNt[i + 1] + fieldNt[i + 2]) / D4_DIVISOR;
    const a = Math.abs(d4);
    sumSq += d4 * d4;
    count++;
    if (a > maxAbs) maxAbs = a;
    if (a > thresholdNt) collector.add(timeMs[i - 2], timeMs[i + 2], a);
  }
  return {
    formula: D4_FORMULA,
    divisor: D4_DIVISOR,
    rmsNt: count > 0 ? Math.sqrt(sumSq / count) : NaN,
    maxAbsNt: count > 0 ? maxAbs : NaN,
    count,
    thresholdNt,
    windows: collector.windows,
  };
}

/** Scale from MAD to σ for Gaussian data: 1 / Φ⁻¹(3/4) ≈ 1.4826 (Hampel 1974; common practice). */
export const MAD_TO_SIGMA = 1.4826;

export interface Spike {
  timeMs: number;
  valueNt: number;
  medianNt: number;
  deviationNt: number;
}

export interface SpikeReport {
  method: "hampel";
  /** Samples either side of each point. */
  halfWidth: number;
  nSigma: number;
  madScale: number;
  /** Deviations at or below this are never spikes (guards quantised, flat records where MAD = 0). */
  minDeviationNt: number;
  count: number;
  spikes: Spike[];
  windows: QaWindow[];
}

/** Hampel identifier: |M_i − median| > max(nSigma × 1.4826 × MAD, minDeviationNt) over i ± halfWidth samples (clipped at the ends). */
export function hampelSpikes(
  timeMs: ArrayLike<number>,
  fieldNt: ArrayLike<number>,
  halfWidth: number,
  nSigma: number,
  minDeviationNt: number,
  maxListed = 1000,
): SpikeReport {
  const n = timeMs.length;
  const spikes: Spike[] = [];
  let count = 0;
  const collector = new WindowCollector("spike");
  const win = new Float64Array(2 * halfWidth + 1);
  for (let i = 0; i < n; i++) {
    const lo = Math.max(0, i - halfWidth);
    const hi = Math.min(n - 1, i + halfWidth);
    const m = hi - lo + 1;
    const view = win.subarray(0, m);
    for (let k = 0; k < m; k++) view[k] = fieldNt[lo + k];
    const med = median(view);
    const mad = medianAbsoluteDeviation(view, med);
    const dev = Math.abs(fieldNt[i] - med);
    if (dev > Math.max(nSigma * MAD_TO_SIGMA * mad, minDeviationNt)) {
      count++;
      if (spikes.length < maxListed) spikes.push({ timeMs: timeMs[i], valueNt: fieldNt[i], medianNt: med, deviationNt: dev });
      collector.add(timeMs[Math.max(0, i - 1)], timeMs[Math.min(n - 1, i + 1)], dev);
    }
  }
  return { method: "hampel", halfWidth, nSigma, madScale: MAD_TO_SIGMA, minDeviationNt, count, spikes, windows: collector.windows };
}
