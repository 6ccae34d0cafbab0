import type { Metadata } from "next";
import Link from "next/link";
import { guardedRead } from "@/app/_lib/guarded-read";
import { requireActor } from "@/src/server/auth/session";
import { getDaySeries, type BaseSeriesResponse } from "@/src/server/days/series";
import { getDay } from "@/src/server/days/service";
import { latestDoneRun } from "@/src/server/runs/service";
import { getSurvey } from "@/src/server/surveys/service";
import { CautionNotice } from "@/src/ui/caution-notice";
import { Refusal } from "@/src/ui/refusal";
import { formatCount, formatNt, localTime } from "../../_components/day-format";
import { ReportCharts } from "../_components/report-charts";

type Props = { params: Promise<{ surveyId: string; date: string }> };

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const { date } = await params;
  return { title: `Day report ${date}` };
}

function Row({ label, children }: { label: string; children: React.ReactNode }) {
  return (
    <>
      <dt className="text-ink-500">{label}</dt>
      <dd className="num text-ink-900">{children}</dd>
    </>
  );
}

/** Printable day report: parameters, QA metrics, charts and the caution. */
export default async function DayReportPage({ params }: Props) {
  const { surveyId, date } = await params;
  const actor = await requireActor(`/surveys/${surveyId}/days/${date}/report`);
  const survey = await guardedRead(getSurvey(actor, surveyId));
  if (!survey.ok) return <Refusal message={survey.message} />;
  const day = await guardedRead(getDay(actor, surveyId, date));
  if (!day.ok) return <Refusal message={day.message} />;
  const s = survey.value;
  const run = await latestDoneRun(actor, surveyId, date);
  const base = (await getDaySeries(actor, surveyId, date, { kind: "base" })) as BaseSeriesResponse;
  const qa = base.qa;
  const summary = run?.summary as { correctedCount?: number; count?: number; residualCount?: number; datumNt?: number | null; flagCounts?: Record<string, number> } | null;
  return (
    <article className="mx-auto max-w-4xl space-y-5 print:max-w-none">
      <p className="no-print text-sm">
        <Link className="text-tide-800 underline" href={`/surveys/${surveyId}/days/${date}`}>Back to the day</Link>
      </p>
      <header>
        <p className="text-sm text-ink-500">{s.code} · {s.client || "—"}</p>
        <h2 className="text-2xl font-semibold text-ink-900">Day report {date}</h2>
        <p className="text-sm text-ink-600">{s.name} · times in {s.timeZone} unless marked UTC</p>
      </header>
      <CautionNotice />
      <section className="grid gap-5 sm:grid-cols-2 print:grid-cols-2">
        <div className="rounded-lg border border-ink-100 bg-white p-4">
          <h3 className="mb-2 font-semibold text-ink-900">Correction</h3>
          {run ? (
            <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-1 text-sm">
              <Row label="Run">{run.number} by {run.createdBy ?? "unknown"}, {run.createdAt.slice(0, 16).replace("T", " ")} UTC</Row>
              <Row label="Datum">{run.parameters.datum === "reference" ? "reference field at the base" : `${typeof run.parameters.datum === "number" ? "fixed" : run.parameters.datum} ${formatNt(summary?.datumNt ?? null, 2)} nT`}</Row>
              <Row label="Method">{run.parameters.pairing.method === "loop" ? "looping" : `${run.parameters.method}, gaps > ${run.parameters.maxGapS} s not bridged`}</Row>
              <Row label="Model">{run.modelName ? `${run.modelName} (version ${run.modelVersion})` : "none"}</Row>
              <Row label="Instrument offset">{formatNt(run.parameters.instrumentOffsetNt, 2)} nT</Row>
              <Row label="Corrected">{formatCount(summary?.correctedCount ?? 0)} of {formatCount(summary?.count ?? 0)} readings</Row>
              {Object.entries(summary?.flagCounts ?? {}).filter(([, n]) => n > 0).map(([k, n]) => (
                <Row key={k} label={k.replace(/_/g, " ")}>{formatCount(n)}</Row>
              ))}
              {run.inputs.map((i) => (
                <Row key={i.logId} label={i.role}><span className="break-all">{i.originalName} · SHA-256 {i.sha256.slice(0, 16)}…</span></Row>
              ))}
            </dl>
          ) : (
            <p className="text-sm text-ink-600">This day has not been corrected yet.</p>
          )}
        </div>
        <div className="rounded-lg border border-ink-100 bg-white p-4">
          <h3 className="mb-2 font-semibold text-ink-900">Base record QA</h3>
          {qa ? (
            <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-1 text-sm">
              <Row label="Verdict">{qa.verdict.level}{qa.verdict.reasons.length ? `: ${qa.verdict.reasons.join("; ")}` : ""}</Row>
              <Row label="Readings">{formatCount(base.totalCount)}, every {formatNt(qa.samplingIntervalS, 1)} s</Row>
              <Row label="Span">{localTime(day.value.firstTimeMs, s.timeZone)}–{localTime(day.value.lastTimeMs, s.timeZone)}</Row>
              <Row label="Daily range">{formatNt(qa.rangeNt, 1)} nT</Row>
              <Row label="Largest change">{formatNt(qa.maxChangeNt, 1)} nT in 60 s</Row>
              <Row label="Chord deviation">{formatNt(qa.maxChordDeviationNt, 2)} nT over {qa.chordWindowS} s (limit {qa.chordThresholdNt} nT)</Row>
              <Row label="Noise (d4/16 RMS)">{formatNt(qa.noiseRmsNt, 3)} nT</Row>
              <Row label="Longest gap">{formatNt(qa.longestGapS, 0)} s (gap above {formatNt(qa.gapThresholdS, 0)} s)</Row>
              <Row label="Spikes">{formatCount(qa.spikeCount)}</Row>
            </dl>
          ) : (
            <p className="text-sm text-ink-600">No base record on this day.</p>
          )}
        </div>
      </section>
      <ReportCharts surveyId={surveyId} day={date} run={run?.number ?? null} timeZone={s.timeZone} />
      <footer className="border-t border-ink-100 pt-3 text-xs text-ink-500">
        Residuals are relative values (absolute main-field uncertainty is of the order of 100 nT). They locate anomalies; they are no clearance for digging.
      </footer>
    </article>
  );
}
