import type { Metadata } from "next";
import Link from "next/link";
import { guardedRead } from "@/app/_lib/guarded-read";
import { requireActor } from "@/src/server/auth/session";
import { roleAllows } from "@/src/server/authz/permission-table";
import { getDaySeries, type BaseSeriesResponse, type RoverSeriesResponse } from "@/src/server/days/series";
import { listKp } from "@/src/server/kp/service";
import { getQaThresholds } from "@/src/server/qa-assessment/thresholds-service";
import { getDayReview, listDayReviewHistory } from "@/src/server/review/service";
import { getDay, getDayPairing } from "@/src/server/days/service";
import { getProcessingSettings } from "@/src/server/processing/service";
import { listRuns } from "@/src/server/runs/service";
import { getSurvey } from "@/src/server/surveys/service";
import { LinkButton } from "@/src/ui/button";
import { CautionNotice } from "@/src/ui/caution-notice";
import { Refusal } from "@/src/ui/refusal";
import { ReviewStateChip, VerdictChip } from "@/src/ui/review-chips";
import { StatusChip } from "@/src/ui/status-chip";
import { formatCount, localTime } from "../_components/day-format";
import { DatumForm } from "./_components/datum-form";
import { PairingForm } from "./_components/pairing-form";
import { DayWorkspace } from "./_components/day-workspace";
import { KpStrip } from "./_components/kp-strip";
import { ReviewPanel } from "./_components/review-panel";

type Props = { params: Promise<{ surveyId: string; date: string }> };

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const { date } = await params;
  return { title: `Day ${date}` };
}

export default async function DayPage({ params }: Props) {
  const { surveyId, date } = await params;
  const actor = await requireActor(`/surveys/${surveyId}/days/${date}`);
  const survey = await guardedRead(getSurvey(actor, surveyId));
  if (!survey.ok) return <Refusal message={survey.message} />;
  const day = await guardedRead(getDay(actor, surveyId, date));
  if (!day.ok) return <Refusal message={day.message} />;
  const [pairing, runs, settings, base] = await Promise.all([
    getDayPairing(actor, surveyId, date),
    listRuns(actor, surveyId, date),
    getProcessingSettings(actor, surveyId),
    getDaySeries(actor, surveyId, date, { kind: "base" }) as Promise<BaseSeriesResponse>,
  ]);
  // Review: the assessment is refreshed here when the day's base log, thresholds or Kp changed.
  const [review, history, kp, qaThresholds, rover] = await Promise.all([
    getDayReview(actor, surveyId, date),
    listDayReviewHistory(actor, surveyId, date),
    listKp(actor, surveyId, { fromMs: day.value.firstTimeMs, toMs: day.value.lastTimeMs }),
    getQaThresholds(actor, surveyId),
    getDaySeries(actor, surveyId, date, { kind: "rover", maxPoints: 10 }) as Promise<RoverSeriesResponse>,
  ]);
  const s = survey.value;
  const d = day.value;
  const canRun = roleAllows(s.myRole, "runs.create") && !s.archivedAt;
  const canEdit = roleAllows(s.myRole, "processing.update") && !s.archivedAt;
  const canExport = roleAllows(s.myRole, "export");
  const blocked =
    pairing.method === "none" ? (pairing.notes.at(-1) ?? "No base log for this day.") : pairing.roverLogs.length === 0 ? "No rover log on this day: upload the day's rover log first." : null;
  const lastRun = runs[0] ?? null;
  const assessment = review.assessment;
  const reasons = assessment.reasons.map((r) => r.text);

  const sidePanel = (
    <>
      <ReviewPanel
        surveyId={surveyId}
        review={review}
        history={history}
        canSubmit={roleAllows(s.myRole, "day.submit") && !s.archivedAt}
        canDecide={roleAllows(s.myRole, "day.decide") && !s.archivedAt}
        lines={rover.lines.map((l) => l.line).filter((l) => l !== "")}
        timeZone={s.timeZone}
      />
      <section className="rounded-lg border border-ink-100 bg-white p-4 text-sm shadow-sm" aria-labelledby="pairing-heading">
        <h3 id="pairing-heading" className="mb-2 text-base font-semibold text-ink-900">Logs of the day</h3>
        <ul className="space-y-1 text-ink-700">
          {pairing.notes.map((n) => (
            <li key={n}>{n}</li>
          ))}
        </ul>
        <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-3 gap-y-1 text-xs">
          {pairing.baseLog ? (<><dt className="text-ink-500">Base</dt><dd className="break-all">{pairing.baseLog.originalName} <span className="num text-ink-500">({formatCount(pairing.baseLog.readingCount)})</span></dd></>) : null}
          {pairing.fallbackBaseLog ? (<><dt className="text-ink-500">Second base</dt><dd className="break-all">{pairing.fallbackBaseLog.originalName}</dd></>) : null}
          {pairing.roverLogs.map((l) => (
            <RoverRow key={l.id} name={l.originalName} count={l.readingCount} />
          ))}
        </dl>
        {canEdit ? (
          <PairingForm
            surveyId={surveyId}
            day={date}
            explicit={pairing.explicit}
            method={pairing.method}
            baseLogId={pairing.baseLog?.id ?? null}
            fallbackBaseLogId={pairing.fallbackBaseLog?.id ?? null}
            baseLogs={d.baseLogs.map((l) => ({ id: l.id, name: l.originalName }))}
            roverLogs={d.roverLogs.map((l) => ({ id: l.id, name: l.originalName }))}
            chosenRoverIds={pairing.explicit ? pairing.roverLogs.map((l) => l.id) : []}
          />
        ) : null}
      </section>
      {canEdit ? (
        <section className="rounded-lg border border-ink-100 bg-white p-4 shadow-sm" aria-labelledby="datum-heading">
          <h3 id="datum-heading" className="mb-2 text-base font-semibold text-ink-900">Survey datum</h3>
          <DatumForm surveyId={surveyId} day={date} datumKind={settings.settings.datumKind} datumValueNt={settings.settings.datumValueNt} />
          <p className="mt-3 text-xs text-ink-500">
            Interpolation, gaps, model and offsets: <Link className="text-tide-800 underline" href={`/surveys/${surveyId}/settings`}>processing settings</Link>.
          </p>
        </section>
      ) : null}
    </>
  );

  return (
    <div className="space-y-5">
      <div className="flex flex-col gap-3 rounded-lg border border-ink-100 bg-white px-4 py-3 shadow-sm sm:flex-row sm:items-center sm:justify-between">
        <div className="min-w-0">
          <div className="text-sm text-ink-500">
            <Link href={`/surveys/${surveyId}/days`} className="hover:underline">Days</Link>
            <span className="mx-1.5 text-ink-300" aria-hidden="true">/</span>
          </div>
          <h2 className="num text-xl font-semibold text-ink-900">{d.day}</h2>
          <p className="num text-sm text-ink-600">
            {localTime(d.firstTimeMs, s.timeZone)}–{localTime(d.lastTimeMs, s.timeZone)} {s.timeZone} · base {formatCount(d.baseReadingCount)} · rover {formatCount(d.roverReadingCount)} readings
          </p>
        </div>
        <div className="flex flex-wrap items-center gap-2">
          <ReviewStateChip state={review.state} />
          {base.qa || assessment.level ? (
            <VerdictChip level={assessment.level} reasons={reasons} />
          ) : (
            <StatusChip label="No base record" tone="warn" detail={pairing.notes.at(-1)} />
          )}
          {lastRun ? (
            <StatusChip
              label={`Run ${lastRun.number}: ${lastRun.status}`}
              tone={lastRun.status === "done" ? "ok" : lastRun.status === "failed" ? "stop" : "info"}
              detail={`by ${lastRun.createdBy ?? "unknown"} at ${lastRun.createdAt} (UTC)`}
            />
          ) : (
            <StatusChip label="Not corrected" tone="neutral" />
          )}
          <LinkButton href={`/surveys/${surveyId}/days/${date}/report`} variant="secondary">Day report</LinkButton>
        </div>
      </div>
      {reasons.length > 0 ? (
        <ul className="text-sm text-ink-700" aria-label="Why the day is flagged (survey QA thresholds)">
          {reasons.map((r) => (
            <li key={r}>• {r}</li>
          ))}
        </ul>
      ) : null}
      <CautionNotice compact />
      <KpStrip values={kp} limit={qaThresholds.thresholds.kpLimit} timeZone={s.timeZone} qaHref={`/surveys/${surveyId}/qa`} />
      <DayWorkspace
        surveyId={surveyId}
        day={date}
        timeZone={s.timeZone}
        initialRuns={runs}
        canRun={canRun}
        canExport={canExport}
        runBlockedReason={blocked}
        sidePanel={sidePanel}
      />
    </div>
  );
}

function RoverRow({ name, count }: { name: string; count: number }) {
  return (
    <>
      <dt className="text-ink-500">Rover</dt>
      <dd className="break-all">{name} <span className="num text-ink-500">({formatCount(count)})</span></dd>
    </>
  );
}
