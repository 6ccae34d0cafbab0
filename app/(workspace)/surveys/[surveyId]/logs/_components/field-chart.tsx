"use client";
/**
 * Quick look at a log: total field against time in the survey's local time. The series arrives
 * thinned on the server (largest-triangle-three-buckets); gaps longer than `gapMs` are drawn as breaks.
 */
import { CartesianGrid, Line, LineChart, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";

const nf = new Intl.NumberFormat("en-GB", { maximumFractionDigits: 1 });

function timeLabel(ms: number, timeZone: string, withDate = false): string {
  const parts = new Intl.DateTimeFormat("en-GB", {
    timeZone,
    hourCycle: "h23",
    hour: "2-digit",
    minute: "2-digit",
    ...(withDate ? { year: "numeric", month: "2-digit", day: "2-digit", second: "2-digit" } : {}),
  }).formatToParts(new Date(ms));
  const get = (t: string) => parts.find((p) => p.type === t)?.value ?? "";
  return withDate ? `${get("year")}-${get("month")}-${get("day")} ${get("hour")}:${get("minute")}:${get("second")}` : `${get("hour")}:${get("minute")}`;
}

export function FieldChart({ timeMs, fieldNt, timeZone, gapMs, kind }: { timeMs: number[]; fieldNt: number[]; timeZone: string; gapMs: number; kind: "base" | "rover" }) {
  const data: { t: number; f: number | null }[] = [];
  for (let i = 0; i < timeMs.length; i++) {
    if (i > 0 && timeMs[i] - timeMs[i - 1] > gapMs) data.push({ t: (timeMs[i] + timeMs[i - 1]) / 2, f: null });
    data.push({ t: timeMs[i], f: fieldNt[i] });
  }
  const min = Math.min(...fieldNt);
  const max = Math.max(...fieldNt);
  const summary =
    timeMs.length === 0
      ? "No readings to plot."
      : `Total field from ${nf.format(min)} to ${nf.format(max)} nT between ${timeLabel(timeMs[0], timeZone, true)} and ${timeLabel(timeMs[timeMs.length - 1], timeZone, true)} (${timeZone}), ${timeMs.length} points shown.`;
  return (
    <figure>
      <div className="h-72 w-full" aria-hidden="true">
        <ResponsiveContainer width="100%" height="100%">
          <LineChart data={data} margin={{ top: 8, right: 16, bottom: 24, left: 16 }}>
            <CartesianGrid stroke="#e2e7ee" />
            <XAxis
              dataKey="t"
              type="number"
              scale="time"
              domain={["dataMin", "dataMax"]}
              tickFormatter={(v: number) => timeLabel(v, timeZone)}
              label={{ value: `Time (${timeZone})`, position: "insideBottom", offset: -12, fill: "#3b4b61", fontSize: 12 }}
              tick={{ fontSize: 11 }}
            />
            <YAxis
              domain={["auto", "auto"]}
              tickFormatter={(v: number) => nf.format(v)}
              width={72}
              label={{ value: "Total field (nT)", angle: -90, position: "insideLeft", offset: -4, fill: "#3b4b61", fontSize: 12 }}
              tick={{ fontSize: 11 }}
            />
            <Tooltip
              labelFormatter={(v) => `${timeLabel(Number(v), timeZone, true)} (${timeZone}) · ${new Date(Number(v)).toISOString().slice(11, 19)} UTC`}
              formatter={(v) => [`${nf.format(Number(v))} nT`, "Total field"]}
            />
            <Line type="linear" dataKey="f" stroke={kind === "base" ? "#161d27" : "#0f665d"} dot={false} strokeWidth={1.25} connectNulls={false} isAnimationActive={false} />
          </LineChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="mt-1 text-xs text-ink-600">{summary}</figcaption>
    </figure>
  );
}
