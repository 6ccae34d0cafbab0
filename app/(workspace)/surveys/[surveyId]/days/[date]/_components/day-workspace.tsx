"use client";
/**
 * The day's charts and runs. Data comes from the day API routes (thinned on the server); a run is
 * started with POST …/runs and polled until it is done, then the charts follow the new run.
 */
import { useRouter } from "next/navigation";
import { useCallback, useEffect, useRef, useState } from "react";
import type { BaseSeriesResponse, CorrectedSeriesResponse, RoverSeriesResponse } from "@/src/server/days/series";
import type { RunComparison, RunRecord } from "@/src/server/runs/service";
import { Button } from "@/src/ui/button";
import { FormError } from "@/src/ui/form-message";
import { StatusChip } from "@/src/ui/status-chip";
import { formatCount, formatNt, RUN_STATUS_LABEL } from "../../_components/day-format";
import { DriftChart } from "./drift-chart";
import { PlanView } from "./plan-view";
import { ProfileChart, type ProfileData } from "./profile-chart";
import { ResidualHistogram } from "./residual-histogram";

type Props = {
  surveyId: string;
  day: string;
  timeZone: string;
  initialRuns: RunRecord[];
  canRun: boolean;
  canExport: boolean;
  runBlockedReason: string | null;
  sidePanel: React.ReactNode;
};

async function getJson<T>(url: string, init?: RequestInit): Promise<T> {
  const res = await fetch(url, { cache: "no-store", ...init });
  const body = await res.json().catch(() => ({}));
  if (!res.ok) throw new Error(body?.error?.formError ?? body?.error?.message ?? `Request failed (${res.status}).`);
  return body as T;
}

const POLL_MS = 700;

export function DayWorkspace({ surveyId, day, timeZone, initialRuns, canRun, canExport, runBlockedReason, sidePanel }: Props) {
  const api = `/api/v1/surveys/${encodeURIComponent(surveyId)}/days/${day}`;
  const [runs, setRuns] = useState<RunRecord[]>(initialRuns);
  const latestDone = runs.find((r) => r.status === "done") ?? null;
  const [selected, setSelected] = useState<number | null>(latestDone?.number ?? null);
  const [base, setBase] = useState<BaseSeriesResponse | null>(null);
  const [baseLoading, setBaseLoading] = useState(true);
  const [overview, setOverview] = useState<CorrectedSeriesResponse | null>(null);
  const [overviewLoading, setOverviewLoading] = useState(false);
  const [lines, setLines] = useState<RoverSeriesResponse["lines"]>([]);
  const [line, setLine] = useState<string | null>(null);
  const [profile, setProfile] = useState<ProfileData | null>(null);
  const [profileLoading, setProfileLoading] = useState(true);
  const [error, setError] = useState<string | null>(null);
  const [starting, setStarting] = useState(false);
  const [compareWith, setCompareWith] = useState<number | null>(null);
  const [comparison, setComparison] = useState<RunComparison | null>(null);
  const active = runs.find((r) => r.status === "queued" || r.status === "running") ?? null;
  const pollTimer = useRef<ReturnType<typeof setTimeout> | null>(null);
  const router = useRouter();

  const loadBase = useCallback(() => {
    setBaseLoading(true);
    getJson<BaseSeriesResponse>(`${api}/series?kind=base`)
      .then(setBase, (e: Error) => setError(e.message))
      .finally(() => setBaseLoading(false));
  }, [api]);
  useEffect(loadBase, [loadBase]);

  // lines of the day (from the rover logs) when there is no run yet; from the run otherwise
  useEffect(() => {
    if (selected !== null) return;
    getJson<RoverSeriesResponse>(`${api}/series?kind=rover&maxPoints=10`).then(
      (r) => {
        setLines(r.lines);
        setLine((l) => l ?? r.lines[0]?.line ?? null);
        if (r.lines.length === 0) setProfileLoading(false);
      },
      (e: Error) => setError(e.message),
    );
  }, [api, selected]);

  useEffect(() => {
    if (selected === null) {
      setOverview(null);
      return;
    }
    setOverviewLoading(true);
    getJson<CorrectedSeriesResponse>(`${api}/series?kind=corrected&run=${selected}`)
      .then((r) => {
        setOverview(r);
        setLines(r.lines);
        setLine((l) => (l !== null && r.lines.some((x) => x.line === l) ? l : (r.lines[0]?.line ?? null)));
      }, (e: Error) => setError(e.message))
      .finally(() => setOverviewLoading(false));
  }, [api, selected]);

  useEffect(() => {
    if (line === null) return;
    setProfileLoading(true);
    const q = `line=${encodeURIComponent(line)}`;
    const request =
      selected !== null
        ? getJson<CorrectedSeriesResponse>(`${api}/series?kind=corrected&run=${selected}&${q}`).then((r) => (r.profile ? ({ source: "corrected", data: r.profile } as const) : null))
        : getJson<RoverSeriesResponse>(`${api}/series?kind=rover&${q}`).then((r) => ({ source: "rover", data: r }) as const);
    request.then(setProfile, (e: Error) => setError(e.message)).finally(() => setProfileLoading(false));
  }, [api, line, selected]);

  const poll = useCallback(() => {
    getJson<{ runs: RunRecord[] }>(`${api}/runs`).then(
      ({ runs: next }) => {
        setRuns(next);
        const still = next.find((r) => r.status === "queued" || r.status === "running");
        if (still) pollTimer.current = setTimeout(poll, POLL_MS);
        else {
          const newest = next[0];
          if (newest?.status === "done") {
            setSelected(newest.number);
            loadBase(); // the datum line follows the new run
            router.refresh(); // header strip: last run
          } else if (newest?.status === "failed") setError(`Run ${newest.number} failed: ${newest.error ?? ""}`);
        }
      },
      (e: Error) => setError(e.message),
    );
  }, [api, loadBase, router]);
  useEffect(() => {
    if (active && !pollTimer.current) pollTimer.current = setTimeout(poll, POLL_MS);
    return () => {
      if (pollTimer.current) clearTimeout(pollTimer.current);
      pollTimer.current = null;
    };
  }, [active, poll]);

  async function startRun() {
    setError(null);
    setStarting(true);
    try {
      const { run } = await getJson<{ run: RunRecord }>(`${api}/runs`, { method: "POST" });
      setRuns((rs) => [run, ...rs]);
    } catch (e) {
      setError((e as Error).message);
    } finally {
      setStarting(false);
    }
  }

  useEffect(() => {
    setComparison(null);
    if (selected === null || compareWith === null || compareWith === selected) return;
    getJson<{ comparison: RunComparison }>(`${api}/runs/${selected}/compare?with=${compareWith}`).then((r) => setComparison(r.comparison), (e: Error) => setError(e.message));
  }, [api, selected, compareWith]);

  const doneRuns = runs.filter((r) => r.status === "done");
  const current = runs.find((r) => r.number === selected) ?? null;

  return (
    <div className="grid gap-5 lg:grid-cols-[minmax(0,1fr)_20rem]">
      <div className="min-w-0 space-y-5">
        {error ? <FormError message={error} /> : null}
        <DriftChart data={base} loading={baseLoading} timeZone={timeZone} />
        <ProfileChart profile={profile} loading={profileLoading} lines={lines} line={line} onLine={setLine} timeZone={timeZone} />
        <div className="grid gap-5 xl:grid-cols-2">
          <PlanView data={overview} loading={overviewLoading} />
          <ResidualHistogram data={overview} loading={overviewLoading} />
        </div>
      </div>
      <aside className="space-y-5" aria-label="Runs and parameters">
        <section className="rounded-lg border border-ink-100 bg-white p-4 shadow-sm" aria-labelledby="runs-heading">
          <h3 id="runs-heading" className="mb-2 text-base font-semibold text-ink-900">Correction runs</h3>
          {canRun ? (
            <Button onClick={startRun} disabled={Boolean(active) || starting || Boolean(runBlockedReason)} className="w-full">
              {runs.length === 0 ? "Run the correction" : "Run again with current settings"}
            </Button>
          ) : (
            <p className="text-sm text-ink-600">Your role can read the runs; a processor or the lead runs corrections.</p>
          )}
          {runBlockedReason && canRun ? <p className="mt-2 text-sm text-flare-700">{runBlockedReason}</p> : null}
          {active ? (
            <div className="mt-3" role="status" aria-live="polite">
              <p className="text-sm text-ink-700">Run {active.number}: {RUN_STATUS_LABEL[active.status].toLowerCase()}… {Math.round(active.progress * 100)} %</p>
              <div className="mt-1 h-2 w-full overflow-hidden rounded bg-ink-100">
                <div className="h-full bg-tide-600 transition-all" style={{ width: `${Math.max(3, active.progress * 100)}%` }} />
              </div>
            </div>
          ) : null}
          {runs.length === 0 ? <p className="mt-3 text-sm text-ink-600">No run yet. The charts show the raw readings until the day is corrected.</p> : null}
          <ol className="mt-3 space-y-2" aria-label="Runs of this day, newest first">
            {runs.map((r) => (
              <li key={r.id} className={`rounded-md border px-3 py-2 text-sm ${r.number === selected ? "border-tide-500 bg-tide-50" : "border-ink-100"}`} data-testid={`run-${r.number}`}>
                <div className="flex items-center justify-between gap-2">
                  <button type="button" className="font-semibold text-ink-900 underline-offset-2 hover:underline disabled:no-underline" disabled={r.status !== "done"} onClick={() => setSelected(r.number)} aria-pressed={r.number === selected}>
                    Run {r.number}
                  </button>
                  <StatusChip label={RUN_STATUS_LABEL[r.status]} tone={r.status === "done" ? "ok" : r.status === "failed" ? "stop" : "info"} detail={r.error ?? undefined} />
                </div>
                <p className="num mt-0.5 text-xs text-ink-600">
                  {r.createdBy ?? "unknown"} · {r.createdAt.slice(0, 16).replace("T", " ")} UTC
                </p>
                <p className="mt-0.5 text-xs text-ink-600">
                  Datum {describeDatum(r)} · {r.parameters.method} · {r.modelName ?? "no model"}
                </p>
                {r.status === "failed" && r.error ? <p className="mt-1 text-xs text-storm-700">{r.error}</p> : null}
                {r.status === "done" && canExport ? (
                  <p className="mt-1 flex gap-3 text-xs">
                    <a className="font-medium text-tide-800 underline underline-offset-2" href={`${api}/runs/${r.number}/corrected.csv`} download>CSV</a>
                    <a className="font-medium text-tide-800 underline underline-offset-2" href={`${api}/runs/${r.number}/corrected.geojson`} download>GeoJSON</a>
                  </p>
                ) : null}
              </li>
            ))}
          </ol>
          {doneRuns.length >= 2 && current ? (
            <div className="mt-3 border-t border-ink-100 pt-3 text-sm">
              <label className="text-ink-700">
                Compare run {current.number} with{" "}
                <select className="rounded-md border border-ink-200 bg-white px-2 py-1" value={compareWith ?? ""} onChange={(e) => setCompareWith(e.target.value ? Number(e.target.value) : null)}>
                  <option value="">—</option>
                  {doneRuns.filter((r) => r.number !== current.number).map((r) => (
                    <option key={r.number} value={r.number}>run {r.number}</option>
                  ))}
                </select>
              </label>
              {comparison ? (
                <dl className="num mt-2 grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5 text-xs" data-testid="run-comparison">
                  <dt className="text-ink-500">Changed readings</dt>
                  <dd>{formatCount(comparison.changedCount)} of {formatCount(comparison.matched)}</dd>
                  <dt className="text-ink-500">Largest change</dt>
                  <dd>{formatNt(comparison.largestChangeNt, 3)} nT</dd>
                  <dt className="text-ink-500">Parameters</dt>
                  <dd>{comparison.parameterChanges.length === 0 ? "same" : comparison.parameterChanges.map((c) => c.name).join(", ")}</dd>
                </dl>
              ) : null}
            </div>
          ) : null}
        </section>
        {current ? <RunFacts run={current} /> : null}
        {sidePanel}
      </aside>
    </div>
  );
}

function describeDatum(r: RunRecord): string {
  const d = r.parameters.datum;
  const v = r.summary?.datumNt;
  if (d === "reference") return "reference field";
  return `${typeof d === "number" ? "fixed" : d} ${typeof v === "number" ? `${formatNt(v, 1)} nT` : ""}`.trim();
}

function RunFacts({ run }: { run: RunRecord }) {
  const s = run.summary as { correctedCount?: number; count?: number; flagCounts?: Record<string, number>; fallback?: { levelShiftNt: number; samplesUsed: number } } | null;
  return (
    <section className="rounded-lg border border-ink-100 bg-white p-4 text-sm shadow-sm" aria-labelledby="run-facts-heading">
      <h3 id="run-facts-heading" className="mb-2 text-base font-semibold text-ink-900">Run {run.number} parameters</h3>
      <dl className="num grid grid-cols-[auto_1fr] gap-x-3 gap-y-1 text-xs">
        <dt className="text-ink-500">Datum</dt><dd>{describeDatum(run)}</dd>
        <dt className="text-ink-500">Method</dt><dd>{run.parameters.pairing.method === "loop" ? `looping (station ${run.parameters.pairing.loopStation})` : `${run.parameters.method}, gaps > ${run.parameters.maxGapS} s not bridged`}</dd>
        <dt className="text-ink-500">Model</dt><dd>{run.modelName ? `${run.modelName} (version ${run.modelVersion})` : "none"}</dd>
        <dt className="text-ink-500">Instrument offset</dt><dd>{formatNt(run.parameters.instrumentOffsetNt, 2)} nT</dd>
        <dt className="text-ink-500">Corrected</dt><dd>{formatCount(s?.correctedCount ?? 0)} of {formatCount(s?.count ?? 0)} readings</dd>
        {s?.flagCounts ? Object.entries(s.flagCounts).filter(([, n]) => n > 0).map(([k, n]) => (
          <FlagRow key={k} name={k} n={n} />
        )) : null}
        {s?.fallback ? (<><dt className="text-ink-500">Second base</dt><dd>{formatCount(s.fallback.samplesUsed)} samples, shift {formatNt(s.fallback.levelShiftNt, 2)} nT</dd></>) : null}
        {run.inputs.map((i) => (
          <InputRow key={i.logId} role={i.role} name={i.originalName} sha={i.sha256} />
        ))}
      </dl>
    </section>
  );
}

function FlagRow({ name, n }: { name: string; n: number }) {
  return (
    <>
      <dt className="text-ink-500">{name.replace(/_/g, " ")}</dt>
      <dd>{formatCount(n)}</dd>
    </>
  );
}

function InputRow({ role, name, sha }: { role: string; name: string; sha: string }) {
  return (
    <>
      <dt className="text-ink-500">{role}</dt>
      <dd className="break-all" title={`SHA-256 ${sha}`}>{name} <span className="text-ink-400">{sha.slice(0, 10)}…</span></dd>
    </>
  );
}
