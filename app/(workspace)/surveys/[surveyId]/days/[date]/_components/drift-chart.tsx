"use client";
/** Base drift curve against survey-local time: gaps as breaks, QA windows shaded, datum line. */
import { CartesianGrid, Line, LineChart, ReferenceArea, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import type { BaseSeriesResponse } from "@/src/server/days/series";
import { formatCount, formatNt, localHourTicks, localTime, utcTime } from "../../_components/day-format";
import { ChartFrame } from "./chart-frame";
import { QA_FILL, SERIES } from "./chart-style";

export function DriftChart({ data, loading, timeZone }: { data: BaseSeriesResponse | null; loading: boolean; timeZone: string }) {
  const rows = data ? data.t.map((t, i) => ({ t, f: data.fieldNt[i] })) : [];
  const fallback = data?.fallback ?? null;
  const fallbackRows = fallback ? fallback.t.map((t, i) => ({ t, g: fallback.fieldNt[i] })) : [];
  const values = data ? ([...data.fieldNt, ...(fallback?.fieldNt ?? [])].filter((v) => v !== null) as number[]) : [];
  const allT = [...rows.map((r) => r.t), ...fallbackRows.map((r) => r.t)];
  const tMin = allT.length ? Math.min(...allT) : 0;
  const tMax = allT.length ? Math.max(...allT) : 1;
  const min = values.length ? Math.min(...values, data?.datum.valueNt ?? Infinity) : 0;
  const max = values.length ? Math.max(...values, data?.datum.valueNt ?? -Infinity) : 1;
  const pad = Math.max(1, (max - min) * 0.05);
  const metrics = data ? [...new Set(data.windows.map((w) => w.metric))] : [];
  const summary = data && data.qa
    ? `Base record of ${data.totalCount} readings, range ${formatNt(data.qa.rangeNt)} nT, largest chord deviation ${formatNt(data.qa.maxChordDeviationNt, 2)} nT over ${data.qa.chordWindowS} s, longest gap ${formatNt(data.qa.longestGapS, 0)} s, ${data.windows.length} shaded windows. Datum ${formatNt(data.datum.valueNt)} nT.`
    : undefined;
  return (
    <ChartFrame
      title="Base drift curve"
      testId="drift-chart"
      loading={loading}
      summary={summary}
      empty={data && !data.log ? (data.notes.at(-1) ?? "No base log for this day.") : undefined}
      legend={
        data ? (
          <ul className="flex flex-wrap gap-x-4 gap-y-1">
            <li className="flex items-center gap-1.5"><span className="inline-block h-0.5 w-5" style={{ background: SERIES.base }} /> Base total field ({formatCount(data.totalCount)} readings, {data.t.length} drawn)</li>
            {fallback ? (
              <li className="flex items-center gap-1.5">
                <span className="inline-block w-5 shrink-0 border-t-2 border-dotted" style={{ borderColor: SERIES.fallbackBase }} />
                <span>
                  Second base “{fallback.log.originalName}”, shifted <span className="num">{fallback.levelShiftNt >= 0 ? "+" : "−"}{formatNt(Math.abs(fallback.levelShiftNt), 1)} nT</span> onto the first (from{" "}
                  {fallback.shiftFrom === "simultaneous" ? "simultaneous readings" : "the two medians"}); fills {formatCount(fallback.samplesUsed)} readings of its gaps
                </span>
              </li>
            ) : null}
            {data.datum.valueNt !== null ? (
              <li className="flex items-center gap-1.5"><span className="inline-block w-5 border-t-2 border-dashed" style={{ borderColor: SERIES.datum }} /> Datum <span className="num">{formatNt(data.datum.valueNt, 1)} nT</span> ({data.datum.source})</li>
            ) : (
              <li>Datum: {data.datum.source}</li>
            )}
            {metrics.map((m) => (
              <li key={m} className="flex items-center gap-1.5"><span className="inline-block h-3 w-4 rounded-sm opacity-40" style={{ background: QA_FILL[m]?.fill }} /> {QA_FILL[m]?.label ?? m}</li>
            ))}
            <li className="text-ink-500">Times {timeZone}; breaks mark gaps in the record.</li>
          </ul>
        ) : null
      }
    >
      <div className="h-64 w-full sm:h-72">
        <ResponsiveContainer width="100%" height="100%">
          <LineChart margin={{ top: 8, right: 12, bottom: 24, left: 12 }}>
            <CartesianGrid stroke="#e2e7ee" strokeDasharray="3 3" />
            <XAxis
              dataKey="t"
              type="number"
              scale="time"
              domain={[tMin, tMax]}
              ticks={allT.length > 1 ? localHourTicks(tMin, tMax, timeZone) : undefined}
              tickFormatter={(t: number) => localTime(t, timeZone)}
              tick={{ fontSize: 11, fill: "#3b4b61" }}
              label={{ value: `Local time (${timeZone})`, position: "insideBottom", offset: -14, fontSize: 11, fill: "#4d6079" }}
            />
            <YAxis
              domain={[Math.floor(min - pad), Math.ceil(max + pad)]}
              tickFormatter={(v: number) => formatNt(v, 0)}
              tick={{ fontSize: 11, fill: "#3b4b61" }}
              width={64}
              label={{ value: "Total field (nT)", angle: -90, position: "insideLeft", offset: 0, fontSize: 11, fill: "#4d6079", dy: 50 }}
            />
            {data?.windows.map((w, i) => (
              <ReferenceArea key={i} x1={w.startMs} x2={Math.max(w.endMs, w.startMs + 1000)} fill={QA_FILL[w.metric]?.fill ?? "#e89410"} fillOpacity={0.3} strokeOpacity={0} ifOverflow="hidden" />
            ))}
            {data?.datum.valueNt != null ? <ReferenceLine y={data.datum.valueNt} stroke={SERIES.datum} strokeDasharray="6 4" /> : null}
            <Tooltip
              labelFormatter={(t) => `${localTime(Number(t), timeZone, true)} local · ${utcTime(Number(t))}`}
              formatter={(v, name) => [`${formatNt(Number(v), 2)} nT`, name === "g" ? "Second base (shifted)" : "Base"]}
            />
            {fallback ? (
              <Line data={fallbackRows} type="linear" dataKey="g" stroke={SERIES.fallbackBase} strokeWidth={1.2} strokeDasharray="2 3" dot={false} isAnimationActive={false} connectNulls={false} />
            ) : null}
            <Line data={rows} type="linear" dataKey="f" stroke={SERIES.base} strokeWidth={1.3} dot={false} isAnimationActive={false} connectNulls={false} />
          </LineChart>
        </ResponsiveContainer>
      </div>
    </ChartFrame>
  );
}
