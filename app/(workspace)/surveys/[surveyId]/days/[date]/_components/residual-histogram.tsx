"use client";
/** Histogram of every reading's residual (40 bins between the 2nd and 98th percentiles). */
import { Bar, BarChart, CartesianGrid, Cell, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import type { CorrectedSeriesResponse } from "@/src/server/days/series";
import { axisDigits, formatCount, formatNt } from "../../_components/day-format";
import { ChartFrame } from "./chart-frame";
import { divergingColour } from "./chart-style";

export function ResidualHistogram({ data, loading }: { data: CorrectedSeriesResponse | null; loading: boolean }) {
  const h = data?.histogram;
  const centre = h ? h.medianNt : 0;
  const limit = h ? Math.max(Math.abs(h.p2Nt - centre), Math.abs(h.p98Nt - centre), 0.5) : 1;
  const rows = h ? h.counts.map((c, i) => ({ mid: (h.edgesNt[i] + h.edgesNt[i + 1]) / 2, count: c })) : [];
  const total = h ? h.counts.reduce((s, c) => s + c, 0) + h.below + h.above : 0;
  return (
    <ChartFrame
      title={`Histogram of ${h?.value === "corrected" ? "corrected values" : "residuals"}`}
      testId="residual-histogram"
      loading={loading}
      empty={!loading && !h ? "Run the correction to see the distribution of residuals." : undefined}
      summary={h ? `${total} readings; median ${formatNt(h.medianNt, 2)} nT; 2nd to 98th percentile ${formatNt(h.p2Nt, 2)} to ${formatNt(h.p98Nt, 2)} nT.` : undefined}
      legend={
        h ? (
          <p className="num">
            Median {formatNt(h.medianNt, 2)} nT · 2–98 %: {formatNt(h.p2Nt, 2)} to {formatNt(h.p98Nt, 2)} nT · outside: {formatCount(h.below)} below, {formatCount(h.above)} above · all {formatCount(total)} readings
          </p>
        ) : null
      }
    >
      <div className="h-56 w-full">
        <ResponsiveContainer width="100%" height="100%">
          <BarChart data={rows} margin={{ top: 8, right: 8, bottom: 24, left: 8 }} barCategoryGap={1}>
            <CartesianGrid stroke="#e2e7ee" strokeDasharray="3 3" vertical={false} />
            <XAxis dataKey="mid" type="number" domain={h ? [h.edgesNt[0], h.edgesNt[h.edgesNt.length - 1]] : [0, 1]} tickFormatter={(v: number) => formatNt(v, h ? axisDigits(h.p98Nt - h.p2Nt) : 0)}
              tick={{ fontSize: 11, fill: "#3b4b61" }} label={{ value: `${h?.value === "corrected" ? "Corrected field" : "Residual"} (nT)`, position: "insideBottom", offset: -14, fontSize: 11, fill: "#4d6079" }} />
            <YAxis tick={{ fontSize: 11, fill: "#3b4b61" }} width={48} allowDecimals={false}
              label={{ value: "Readings", angle: -90, position: "insideLeft", fontSize: 11, fill: "#4d6079" }} />
            <Tooltip formatter={(v) => [formatCount(Number(v)), "Readings"]} labelFormatter={(m) => `around ${formatNt(Number(m), 2)} nT`} />
            <Bar dataKey="count" isAnimationActive={false}>
              {rows.map((r, i) => (
                <Cell key={i} fill={divergingColour(r.mid - centre, limit)} stroke="#9aaabf" strokeWidth={0.5} />
              ))}
            </Bar>
          </BarChart>
        </ResponsiveContainer>
      </div>
    </ChartFrame>
  );
}
