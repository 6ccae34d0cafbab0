"use client";
/** The charts of the printable day report (same API data as the day page). */
import { useEffect, useState } from "react";
import type { BaseSeriesResponse, CorrectedSeriesResponse } from "@/src/server/days/series";
import { Button } from "@/src/ui/button";
import { DriftChart } from "./drift-chart";
import { PlanView } from "./plan-view";
import { ResidualHistogram } from "./residual-histogram";

export function ReportCharts({ surveyId, day, run, timeZone }: { surveyId: string; day: string; run: number | null; timeZone: string }) {
  const api = `/api/v1/surveys/${encodeURIComponent(surveyId)}/days/${day}/series`;
  const [base, setBase] = useState<BaseSeriesResponse | null>(null);
  const [corrected, setCorrected] = useState<CorrectedSeriesResponse | null>(null);
  const [loading, setLoading] = useState({ base: true, corrected: run !== null });
  useEffect(() => {
    fetch(`${api}?kind=base`).then((r) => r.json()).then(setBase).finally(() => setLoading((l) => ({ ...l, base: false })));
    if (run !== null) fetch(`${api}?kind=corrected&run=${run}`).then((r) => r.json()).then(setCorrected).finally(() => setLoading((l) => ({ ...l, corrected: false })));
  }, [api, run]);
  return (
    <div className="space-y-4">
      <div className="no-print flex justify-end">
        <Button variant="secondary" onClick={() => window.print()}>Print or save as PDF</Button>
      </div>
      <DriftChart data={base} loading={loading.base} timeZone={timeZone} />
      {run !== null ? (
        <div className="grid gap-4 md:grid-cols-2 print:grid-cols-2">
          <PlanView data={corrected} loading={loading.corrected} />
          <ResidualHistogram data={corrected} loading={loading.corrected} />
        </div>
      ) : null}
    </div>
  );
}
