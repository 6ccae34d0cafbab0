/**
 * Base records whose QA answer is known by construction: a quiet curve (range 15 nT over the 3 h, slope below
 * 0.3 nT/min, noise a few hundredths of nT), and that curve with a 200 nT step, a 5 nT-per-minute
 * swing, a spike train or a gap. Sampling every 2 s from 08:00 to 11:00 UTC.
 */
export const INTERVAL_S = 2;
export const START_UTC = "T08:00:00Z";
const HOURS = 3;

export type Disturbance =
  | { kind: "none" }
  | { kind: "step"; atMin: number; stepNt: number }
  | { kind: "ramp"; fromMin: number; toMin: number; ratePerMinNt: number }
  | { kind: "swing"; periodMin: number; peakRatePerMinNt: number }
  | { kind: "spikes"; everyMin: number; count: number; heightNt: number }
  | { kind: "gap"; fromMin: number; minutes: number };

/** Quiet made-up diurnal: 15 nT sine of 6 h period (max rate 0.26 nT/min) plus ±0.05 nT wiggle. */
export function quietNt(sinceStartS: number, i: number): number {
  return 49_310 + 15 * Math.sin((2 * Math.PI * sinceStartS) / (6 * 3600)) + 0.05 * Math.sin(i * 1.7);
}

export function baseRecordCsv(day: string, d: Disturbance, intervalS = INTERVAL_S): string {
  const start = Date.parse(`${day}${START_UTC}`);
  const lines = ["time,field_nT"];
  const n = (HOURS * 3600) / intervalS;
  for (let i = 0; i <= n; i++) {
    const s = i * intervalS;
    const min = s / 60;
    let f = quietNt(s, i);
    if (d.kind === "step" && min >= d.atMin) f += d.stepNt;
    if (d.kind === "ramp") f += d.ratePerMinNt * (Math.min(Math.max(min, d.fromMin), d.toMin) - d.fromMin);
    if (d.kind === "swing") f += ((d.peakRatePerMinNt * d.periodMin) / (2 * Math.PI)) * Math.sin((2 * Math.PI * min) / d.periodMin);
    if (d.kind === "spikes") {
      const k = s / (d.everyMin * 60);
      if (Number.isInteger(k) && k >= 1 && k <= d.count) f += d.heightNt;
    }
    if (d.kind === "gap" && min >= d.fromMin && min < d.fromMin + d.minutes) continue;
    lines.push(`${new Date(start + s * 1000).toISOString()},${f.toFixed(3)}`);
  }
  return lines.join("\n") + "\n";
}
