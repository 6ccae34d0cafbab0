"use client";
/**
 * Plan view of the readings coloured by residual on a diverging scale (ours) centred on the day's median,
 * symmetric to the larger of |2nd| and |98th| percentile, with its legend and range. Positions
 * are drawn in metres east/north of the readings' centre so the map keeps its shape.
 */
import { CartesianGrid, Cell, ResponsiveContainer, Scatter, ScatterChart, Tooltip, XAxis, YAxis } from "recharts";
import type { CorrectedSeriesResponse } from "@/src/server/days/series";
import { formatCount, formatNt } from "../../_components/day-format";
import { ChartFrame } from "./chart-frame";
import { DIVERGING_GRADIENT, divergingColour } from "./chart-style";

const M_PER_DEG_LAT = 111_132; // mean metres per degree of latitude (WGS84, common approximation)

export function PlanView({ data, loading }: { data: CorrectedSeriesResponse | null; loading: boolean }) {
  const plan = data?.plan;
  const hist = data?.histogram;
  // Centred on the day's median: residuals are relative values (the main-field model is uncertain by
  // ~100 nT), so what matters on the map is departure from the day's background.
  const centre = hist ? hist.medianNt : 0;
  const limit = hist ? Math.max(Math.abs(hist.p2Nt - centre), Math.abs(hist.p98Nt - centre), 0.5) : 1;
  let points: { e: number; n: number; v: number }[] = [];
  let domain: { x: [number, number]; y: [number, number] } = { x: [0, 1], y: [0, 1] };
  if (plan && plan.latDeg.length > 0) {
    const lat0 = plan.latDeg.reduce((s, v) => s + v, 0) / plan.latDeg.length;
    const lon0 = plan.lonDeg.reduce((s, v) => s + v, 0) / plan.lonDeg.length;
    const mPerDegLon = M_PER_DEG_LAT * Math.cos((lat0 * Math.PI) / 180);
    points = plan.latDeg.map((la, i) => ({ e: (plan.lonDeg[i] - lon0) * mPerDegLon, n: (la - lat0) * M_PER_DEG_LAT, v: plan.valueNt[i] }));
    const es = points.map((p) => p.e), ns = points.map((p) => p.n);
    const [e0, e1, n0, n1] = [Math.min(...es), Math.max(...es), Math.min(...ns), Math.max(...ns)];
    const half = Math.max(e1 - e0, n1 - n0, 10) / 2 * 1.05;
    const ec = (e0 + e1) / 2, nc = (n0 + n1) / 2;
    domain = { x: [ec - half, ec + half], y: [nc - half, nc + half] };
  }
  const what = plan?.value === "corrected" ? "Corrected field" : "Residual";
  return (
    <ChartFrame
      title={`Plan view: ${what.toLowerCase()}`}
      testId="plan-view"
      loading={loading}
      empty={!loading && !plan ? "Run the correction to map the residuals." : plan && plan.latDeg.length === 0 ? "The rover readings have no positions." : undefined}
      summary={plan ? `${plan.latDeg.length} of ${plan.withPosition} positioned readings drawn; colour ${what.toLowerCase()} from ${formatNt(centre - limit)} to ${formatNt(centre + limit)} nT.` : undefined}
      legend={
        plan ? (
          <div className="max-w-sm">
            <div className="h-3 w-full rounded-sm border border-ink-200" style={{ background: DIVERGING_GRADIENT }} aria-hidden="true" />
            <div className="num mt-0.5 flex justify-between">
              <span>≤ {formatNt(centre - limit)} nT</span>
              <span>{formatNt(centre)} (median)</span>
              <span>≥ {formatNt(centre + limit)} nT</span>
            </div>
            <p className="mt-1 text-ink-500">
              {formatCount(plan.latDeg.length)} of {formatCount(plan.withPosition)} readings drawn (LTTB along the walked path); metres from the centre of the readings, north up.
            </p>
          </div>
        ) : null
      }
    >
      <div className="mx-auto aspect-square w-full max-w-[28rem]">
        <ResponsiveContainer width="100%" height="100%">
          <ScatterChart margin={{ top: 8, right: 8, bottom: 24, left: 8 }}>
            <CartesianGrid stroke="#e2e7ee" strokeDasharray="3 3" />
            <XAxis type="number" dataKey="e" domain={domain.x} tickFormatter={(v: number) => formatNt(v, 0)} tick={{ fontSize: 11, fill: "#3b4b61" }} allowDataOverflow
              label={{ value: "East (m)", position: "insideBottom", offset: -14, fontSize: 11, fill: "#4d6079" }} />
            <YAxis type="number" dataKey="n" domain={domain.y} tickFormatter={(v: number) => formatNt(v, 0)} tick={{ fontSize: 11, fill: "#3b4b61" }} width={48} allowDataOverflow
              label={{ value: "North (m)", angle: -90, position: "insideLeft", fontSize: 11, fill: "#4d6079" }} />
            <Tooltip formatter={(v, name) => [name === "v" ? `${formatNt(Number(v), 2)} nT` : `${formatNt(Number(v), 1)} m`, name === "e" ? "East" : name === "n" ? "North" : what]} />
            <Scatter data={points} isAnimationActive={false} shape="circle">
              {points.map((p, i) => (
                <Cell key={i} fill={divergingColour(p.v - centre, limit)} stroke="none" />
              ))}
            </Scatter>
          </ScatterChart>
        </ResponsiveContainer>
      </div>
    </ChartFrame>
  );
}
