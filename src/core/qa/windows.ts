/** Time windows that break a QA threshold, for shading charts; overlapping windows are merged. */
export type QaMetric = "gap" | "change" | "chord" | "noise" | "spike";

export interface QaWindow {
  startMs: number;
  endMs: number;
  metric: QaMetric;
  /** Worst value inside the merged window (nT, or s for gaps). */
  value: number;
}

/** Merge windows of one metric that overlap or touch; keeps the worst value. Input order does not matter. */
export function mergeWindows(windows: readonly QaWindow[]): QaWindow[] {
  const sorted = [...windows].sort((a, b) => a.startMs - b.startMs || a.endMs - b.endMs);
  const out: QaWindow[] = [];
  for (const w of sorted) {
    const last = out[out.length - 1];
    if (last && last.metric === w.metric && w.startMs <= last.endMs) {
      if (w.endMs > last.endMs) last.endMs = w.endMs;
      if (w.value > last.value) last.value = w.value;
    } else {
      out.push({ ...w });
    }
  }
  return out;
}

/** Collects windows of one metric in increasing start order and merges as it goes (constant memory per run). */
export class WindowCollector {
  readonly windows: QaWindow[] = [];
  constructor(private readonly metric: QaMetric) {}

  add(startMs: number, endMs: number, value: number): void {
    const last = this.windows[this.windows.length - 1];
    if (last && startMs <= last.endMs) {
      if (endMs > last.endMs) last.endMs = endMs;
      if (value > last.value) last.value = value;
    } else {
      this.windows.push({ startMs, endMs, metric: this.metric, value });
    }
  }
}
