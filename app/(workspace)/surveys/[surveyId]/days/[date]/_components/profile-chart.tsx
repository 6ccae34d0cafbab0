"use client";
/** One line's raw, corrected and residual profiles against distance along the line or time. */
import { useState } from "react";
import { CartesianGrid, Line, LineChart, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import type { CorrectedSeriesResponse, LineInfo, RoverSeriesResponse } from "@/src/server/days/series";
import { axisDigits, formatNt, localHourTicks, localTime, utcTime } from "../../_components/day-format";
import { ChartFrame } from "./chart-frame";
import { SERIES } from "./chart-style";

export type ProfileData =
  | { source: "corrected"; data: NonNullable<CorrectedSeriesResponse["profile"]> }
  | { source: "rover"; data: RoverSeriesResponse };

type Row = { x: number; raw: number | null; corrected: number | null; residual: number | null };

function extent(values: (number | null)[]): [number, number] | null {
  let lo = Infinity, hi = -Infinity;
  for (const v of values) if (v !== null) {
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return lo <= hi ? [lo, hi] : null;
}

export function ProfileChart({
  profile,
  loading,
  lines,
  line,
  onLine,
  timeZone,
}: {
  profile: ProfileData | null;
  loading: boolean;
  lines: LineInfo[];
  line: string | null;
  onLine: (line: string) => void;
  timeZone: string;
}) {
  const [axis, setAxis] = useState<"distance" | "time">("distance");
  const [show, setShow] = useState({ raw: true, corrected: true, residual: true });
  const p = profile?.data;
  const hasDistance = p ? p.distanceM.some((d) => d !== null) : false;
  const xMode = axis === "distance" && hasDistance ? "distance" : "time";
  const rows: Row[] = [];
  if (p) {
    for (let i = 0; i < p.t.length; i++) {
      const x = xMode === "distance" ? p.distanceM[i] : p.t[i];
      if (x === null) continue;
      rows.push({
        x,
        raw: p.rawNt[i],
        corrected: profile!.source === "corrected" ? (p as NonNullable<CorrectedSeriesResponse["profile"]>).correctedNt[i] : null,
        residual: profile!.source === "corrected" ? (p as NonNullable<CorrectedSeriesResponse["profile"]>).residualNt[i] : null,
      });
    }
    if (xMode === "distance") rows.sort((a, b) => a.x - b.x);
  }
  const corrected = profile?.source === "corrected";
  const left = extent([...(show.raw ? rows.map((r) => r.raw) : []), ...(show.corrected ? rows.map((r) => r.corrected) : [])]);
  const right = extent(rows.map((r) => r.residual));
  const pad = (e: [number, number] | null) => (e ? Math.max(1, (e[1] - e[0]) * 0.06) : 1);
  const summary = p
    ? `Line ${line}: ${p.totalCount} readings. ${left ? `Field from ${formatNt(left[0])} to ${formatNt(left[1])} nT.` : ""} ${right ? `Residual from ${formatNt(right[0])} to ${formatNt(right[1])} nT.` : ""}`
    : undefined;
  const toggle = (k: keyof typeof show) => setShow((s) => ({ ...s, [k]: !s[k] }));
  return (
    <ChartFrame
      title={line ? `Profile of line ${line}` : "Line profile"}
      testId="profile-chart"
      loading={loading}
      summary={summary}
      empty={lines.length === 0 && !loading ? "No rover readings on this day." : undefined}
      controls={
        <>
          <label className="text-sm text-ink-700">
            <span className="mr-1">Line</span>
            <select className="rounded-md border border-ink-200 bg-white px-2 py-1 text-sm" value={line ?? ""} onChange={(e) => onLine(e.target.value)} aria-label="Survey line">
              {lines.map((l) => (
                <option key={l.line} value={l.line}>
                  {l.line || "(no line)"} · {l.count}
                </option>
              ))}
            </select>
          </label>
          <div role="group" aria-label="Horizontal axis" className="inline-flex overflow-hidden rounded-md border border-ink-200 text-sm">
            {(["distance", "time"] as const).map((a) => (
              <button
                key={a}
                type="button"
                aria-pressed={xMode === a}
                disabled={a === "distance" && !hasDistance}
                onClick={() => setAxis(a)}
                className={`px-2.5 py-1 ${xMode === a ? "bg-tide-700 text-white" : "bg-white text-ink-700 hover:bg-ink-50"} disabled:opacity-50`}
              >
                {a === "distance" ? "Distance" : "Time"}
              </button>
            ))}
          </div>
        </>
      }
      legend={
        <ul className="flex flex-wrap gap-x-4 gap-y-1">
          {(
            [
              ["raw", "Raw field", SERIES.raw, true],
              ["corrected", "Corrected (diurnal removed)", SERIES.corrected, false],
              ["residual", "Residual (right axis)", SERIES.residual, false],
            ] as const
          ).map(([k, label, colour, dashed]) =>
            k !== "raw" && !corrected ? null : (
              <li key={k}>
                <label className="flex cursor-pointer items-center gap-1.5">
                  <input type="checkbox" checked={show[k]} onChange={() => toggle(k)} className="accent-tide-700" />
                  <span className={`inline-block w-5 border-t-2 ${dashed ? "border-dashed" : ""}`} style={{ borderColor: colour }} />
                  {label}
                </label>
              </li>
            ),
          )}
          {!corrected ? <li className="text-ink-500">Run the correction to see corrected values and residuals.</li> : null}
        </ul>
      }
    >
      <div className="h-64 w-full sm:h-72">
        <ResponsiveContainer width="100%" height="100%">
          <LineChart data={rows} margin={{ top: 8, right: 8, bottom: 24, left: 12 }}>
            <CartesianGrid stroke="#e2e7ee" strokeDasharray="3 3" />
            <XAxis
              dataKey="x"
              type="number"
              domain={["dataMin", "dataMax"]}
              ticks={xMode === "time" && rows.length > 1 && rows[rows.length - 1].x - rows[0].x > 2 * 3_600_000 ? localHourTicks(rows[0].x, rows[rows.length - 1].x, timeZone) : undefined}
              tickFormatter={(v: number) => (xMode === "distance" ? formatNt(v, 0) : localTime(v, timeZone))}
              tick={{ fontSize: 11, fill: "#3b4b61" }}
              label={{ value: xMode === "distance" ? "Distance along line (m)" : `Local time (${timeZone})`, position: "insideBottom", offset: -14, fontSize: 11, fill: "#4d6079" }}
            />
            <YAxis
              yAxisId="field"
              domain={left ? [Math.floor(left[0] - pad(left)), Math.ceil(left[1] + pad(left))] : ["auto", "auto"]}
              tickFormatter={(v: number) => formatNt(v, 0)}
              tick={{ fontSize: 11, fill: "#3b4b61" }}
              width={64}
              label={{ value: "Total field (nT)", angle: -90, position: "insideLeft", fontSize: 11, fill: "#4d6079", dy: 50 }}
            />
            {corrected ? (
              <YAxis
                yAxisId="residual"
                orientation="right"
                domain={right ? [Math.floor(right[0] - pad(right)), Math.ceil(right[1] + pad(right))] : ["auto", "auto"]}
                tickFormatter={(v: number) => formatNt(v, right ? axisDigits(right[1] - right[0]) : 0)}
                tick={{ fontSize: 11, fill: SERIES.residual }}
                width={72}
                label={{ value: "Residual (nT)", angle: 90, position: "insideRight", offset: 0, fontSize: 11, fill: SERIES.residual, dy: -40 }}
              />
            ) : null}
            <Tooltip
              labelFormatter={(x) => (xMode === "distance" ? `${formatNt(Number(x), 1)} m along the line` : `${localTime(Number(x), timeZone, true)} local · ${utcTime(Number(x))}`)}
              formatter={(v, name) => [`${formatNt(Number(v), 2)} nT`, String(name)]}
            />
            {show.raw ? <Line yAxisId="field" name="Raw" dataKey="raw" stroke={SERIES.raw} strokeDasharray="5 3" strokeWidth={1.2} dot={false} isAnimationActive={false} /> : null}
            {corrected && show.corrected ? <Line yAxisId="field" name="Corrected" dataKey="corrected" stroke={SERIES.corrected} strokeWidth={1.6} dot={false} isAnimationActive={false} /> : null}
            {corrected && show.residual ? <Line yAxisId="residual" name="Residual" dataKey="residual" stroke={SERIES.residual} strokeWidth={1.3} dot={false} isAnimationActive={false} /> : null}
          </LineChart>
        </ResponsiveContainer>
      </div>
    </ChartFrame>
  );
}
