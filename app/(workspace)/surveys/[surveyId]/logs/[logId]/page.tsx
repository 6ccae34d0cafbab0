import type { Metadata } from "next";
import Link from "next/link";
import { guardedRead } from "@/app/_lib/guarded-read";
import { requireActor } from "@/src/server/auth/session";
import { getLog, getLogFieldSeries } from "@/src/server/logs/read-service";
import { SENSOR_LABELS, TIME_BASIS_LABELS } from "@/src/server/logs/schema";
import { logProblemsCsvUrl, logsUrl } from "@/src/server/logs/urls";
import { getSurvey } from "@/src/server/surveys/service";
import { formatCount, formatDateTime } from "@/src/ui/format";
import { AlertIcon } from "@/src/ui/icons";
import { Refusal } from "@/src/ui/refusal";
import { StatusChip } from "@/src/ui/status-chip";
import { FieldChart } from "../_components/field-chart";

export const metadata: Metadata = { title: "Log" };

const MIN_GAP_MS = 60_000;

function local(ms: number | null, tz: string): string {
  return ms === null ? "—" : formatDateTime(new Date(ms).toISOString(), tz);
}

function Row({ label, children }: { label: string; children: React.ReactNode }) {
  return (
    <>
      <dt className="text-ink-500">{label}</dt>
      <dd className="min-w-0 break-words text-ink-800">{children}</dd>
    </>
  );
}

export default async function LogPage({ params }: { params: Promise<{ surveyId: string; logId: string }> }) {
  const { surveyId, logId } = await params;
  const actor = await requireActor(`/surveys/${surveyId}/logs/${logId}`);
  const survey = await guardedRead(getSurvey(actor, surveyId));
  if (!survey.ok) return <Refusal message={survey.message} />;
  const tz = survey.value.timeZone;
  const log = await guardedRead(getLog(actor, surveyId, logId));
  if (!log.ok) return <Refusal message={log.message} />;
  const l = log.value;
  const series = await getLogFieldSeries(actor, surveyId, logId);
  const spanMs = (l.lastTimeMs ?? 0) - (l.firstTimeMs ?? 0);
  const gapMs = Math.max(MIN_GAP_MS, series.totalPoints > 1 ? (20 * spanMs) / series.totalPoints : MIN_GAP_MS);
  const problemsTotal = l.rejectedCount + l.issueCount;

  return (
    <div className="space-y-5">
      <div className="text-sm">
        <Link href={logsUrl(surveyId)} className="text-tide-700 underline underline-offset-2">All logs</Link>
      </div>
      <div className="flex flex-wrap items-center gap-3">
        <h2 className="break-all text-lg font-semibold text-ink-900">{l.originalName}</h2>
        <StatusChip tone="info" label={l.kind === "base" ? "Base station" : "Rover"} />
        {problemsTotal > 0 ? <StatusChip tone="warn" label={`${formatCount(problemsTotal)} rows set aside or flagged`} /> : <StatusChip tone="ok" label="All rows read" />}
      </div>
      {l.warnings.length ? (
        <ul className="space-y-1 text-sm text-flare-700">
          {l.warnings.map((w, i) => (
            <li key={i} className="flex items-start gap-2"><AlertIcon size={14} className="mt-0.5 shrink-0" /> {w}</li>
          ))}
        </ul>
      ) : null}
      <section className="rounded-lg border border-ink-100 bg-white p-4 shadow-sm" aria-labelledby="chart-title">
        <h3 id="chart-title" className="mb-2 text-sm font-semibold text-ink-900">Total field against time</h3>
        <FieldChart timeMs={series.timeMs} fieldNt={series.fieldNt} timeZone={tz} gapMs={gapMs} kind={l.kind} />
        <p className="mt-1 text-xs text-ink-500">
          {series.totalPoints > series.timeMs.length
            ? `Thinned to ${formatCount(series.timeMs.length)} of ${formatCount(series.totalPoints)} readings (largest-triangle-three-buckets keeps peaks and troughs). Breaks mark gaps over ${Math.round(gapMs / 1000)} s.`
            : `All ${formatCount(series.totalPoints)} readings. Breaks mark gaps over ${Math.round(gapMs / 1000)} s.`}
        </p>
      </section>
      <div className="grid gap-5 lg:grid-cols-2">
        <section className="rounded-lg border border-ink-100 bg-white p-4 shadow-sm">
          <h3 className="mb-2 text-sm font-semibold text-ink-900">Log</h3>
          <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
            <Row label="Instrument">{l.instrument || "—"} ({SENSOR_LABELS[l.sensorType]})</Row>
            <Row label="Operator">{l.operator || "—"}</Row>
            {l.baseSite ? (
              <Row label="Base site">
                {l.baseSite.name}
                {l.baseSite.latitudeDeg !== null ? <span className="num"> · {l.baseSite.latitudeDeg}°, {l.baseSite.longitudeDeg}°{l.baseSite.heightM !== null ? `, ${l.baseSite.heightM} m` : ""}</span> : null}
              </Row>
            ) : null}
            <Row label="Time basis">{TIME_BASIS_LABELS[l.timeBasis]}{l.timeBasis === "local" ? ` (${tz})` : ""}; clock offset <span className="num">{l.clockOffsetS} s</span></Row>
            <Row label={`Span (${tz})`}><span className="num">{local(l.firstTimeMs, tz)} – {local(l.lastTimeMs, tz).slice(11)}</span></Row>
            <Row label="Span (UTC)"><span className="num">{l.firstTimeMs === null ? "—" : `${new Date(l.firstTimeMs).toISOString()} – ${new Date(l.lastTimeMs!).toISOString()}`}</span></Row>
            <Row label="Survey days">{l.dayCounts.map((d) => `${d.day} (${formatCount(d.readingCount)})`).join(", ") || "—"}</Row>
            <Row label="Rows">
              <span className="num">{formatCount(l.rowCount)}</span> read, <span className="num">{formatCount(l.readingCount)}</span> stored,{" "}
              <span className="num">{formatCount(l.rejectedCount)}</span> refused, <span className="num">{formatCount(l.issueCount)}</span> flagged
            </Row>
            <Row label="Columns">{Object.entries(l.mapping).map(([role, name]) => `${role}: ${name}`).join(" · ")} ({l.delimiter})</Row>
            <Row label="Uploaded">{formatDateTime(l.uploadedAt, tz)} by {l.uploadedBy ?? "—"}</Row>
          </dl>
        </section>
        <section className="rounded-lg border border-ink-100 bg-white p-4 shadow-sm">
          <h3 className="mb-2 text-sm font-semibold text-ink-900">Original file</h3>
          <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
            <Row label="Size"><span className="num">{formatCount(l.sizeBytes)} bytes</span></Row>
            <Row label="SHA-256"><code className="num break-all text-xs">{l.sha256}</code></Row>
          </dl>
          {l.originalAvailable ? (
            <a href={l.originalUrl} className="mt-3 inline-flex min-h-10 items-center rounded-md border border-ink-200 px-3 py-2 text-sm font-medium text-ink-800 hover:bg-ink-50" download>
              Download the original
            </a>
          ) : (
            <p className="mt-3 text-sm text-storm-700">The original file is missing from storage.</p>
          )}
        </section>
      </div>
      {problemsTotal > 0 ? (
        <section className="rounded-lg border border-ink-100 bg-white p-4 shadow-sm">
          <div className="mb-2 flex flex-wrap items-center justify-between gap-2">
            <h3 className="text-sm font-semibold text-ink-900">Rows set aside or flagged</h3>
            <a href={logProblemsCsvUrl(surveyId, l.id)} className="text-sm text-tide-700 underline underline-offset-2" download>Download all as CSV</a>
          </div>
          <div className="overflow-x-auto">
            <table className="min-w-full text-xs">
              <thead className="text-left text-ink-600">
                <tr>{["Line", "Kind", "Column", "Value", "Reason"].map((h) => <th key={h} scope="col" className="px-2 py-1 font-medium">{h}</th>)}</tr>
              </thead>
              <tbody>
                {l.problems.map((p, i) => (
                  <tr key={i} className="border-t border-ink-100">
                    <td className="num px-2 py-1">{p.line}</td>
                    <td className="px-2 py-1">{p.kind === "rejected" ? "refused" : "kept, flagged"}</td>
                    <td className="px-2 py-1">{p.column}</td>
                    <td className="num px-2 py-1 break-all">{p.value}</td>
                    <td className="px-2 py-1">{p.message}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          {problemsTotal > l.problems.length ? <p className="mt-1 text-xs text-ink-500">First {l.problems.length} shown; the CSV lists every kept detail.</p> : null}
        </section>
      ) : null}
    </div>
  );
}
