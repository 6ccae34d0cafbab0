import "server-only";
/**
 * Review of survey days. A day starts "in processing"; a processor (or the lead) submits it
 * ("day.submit") → "awaiting review"; only a QA reviewer decides ("day.decide"): "accepted", or
 * "re-survey needed" for the whole day or for listed lines, which needs a comment. A day sent back
 * is submitted again once re-walked. Every step is in the day's history and on the audit trail;
 * mail goes out after the step is saved (see ../notifications/review-mail.ts).
 */
import type { Knex } from "knex";
import "@/src/lib/zod-jitless";
import { z } from "zod";
import { refuseIfArchived } from "../surveys/writable";
import type { Actor } from "../auth/actor";
import { recordAudit } from "../audit/record";
import { assertSurveyPermission, roleAllows, type SurveyRole } from "../authz/permissions";
import { getDb } from "../db/client";
import { ConflictError, parseInput, ValidationError } from "../errors";
import { getDay, listDays, parseDay, type DaySummary } from "../days/service";
import { getDaySeries, type RoverSeriesResponse } from "../days/series";
import { readKp } from "../kp/service";
import { mailAwaitingReview, mailDecision, type MailOutcome } from "../notifications/review-mail";
import { assessDay, type DayAssessment } from "../qa-assessment/assess";
import { nowIso } from "../time";
import { REVIEW_EVENT_LABELS, VERDICT_LABELS, type ReviewEventKind, type ReviewState } from "./states";

export interface ReviewEvent {
  id: number;
  kind: ReviewEventKind;
  label: string;
  fromState: ReviewState | null;
  toState: ReviewState | null;
  actorName: string | null;
  comment: string;
  details: Record<string, unknown>;
  createdAt: string;
}

export interface DayReview {
  day: string;
  state: ReviewState;
  scope: "day" | "lines" | null;
  lines: string[];
  comment: string;
  submittedBy: string | null;
  submittedAt: string | null;
  decidedBy: string | null;
  decidedAt: string | null;
  assessment: DayAssessment;
}

type ReviewRow = {
  survey_id: string; day: string; state: ReviewState; scope: "day" | "lines" | null; lines: string; comment: string;
  submitted_by: string | null; submitted_at: string | null; decided_by: string | null; decided_at: string | null;
  submitted_by_name?: string | null; decided_by_name?: string | null;
};

function reviewQuery(db: Knex | Knex.Transaction) {
  return db("day_reviews as r")
    .leftJoin("users as s", "s.id", "r.submitted_by")
    .leftJoin("users as d", "d.id", "r.decided_by")
    .select("r.*", "s.name as submitted_by_name", "d.name as decided_by_name");
}

function toReview(day: string, r: ReviewRow | undefined, assessment: DayAssessment): DayReview {
  return {
    day,
    state: r?.state ?? "in_processing",
    scope: r?.scope ?? null,
    lines: r ? (JSON.parse(r.lines) as string[]) : [],
    comment: r?.comment ?? "",
    submittedBy: r?.submitted_by_name ?? null,
    submittedAt: r?.submitted_at ?? null,
    decidedBy: r?.decided_by_name ?? null,
    decidedAt: r?.decided_at ?? null,
    assessment,
  };
}

/** The day's review state and its (refreshed) assessment. */
export async function getDayReview(actor: Actor, surveyId: string, dayInput: unknown): Promise<DayReview> {
  const summary = await getDay(actor, surveyId, dayInput); // days.read; 404 for a day without logs
  const db = getDb();
  const assessment = await assessDay(db, surveyId, summary);
  const row = (await reviewQuery(db).where({ "r.survey_id": surveyId, "r.day": summary.day }).first()) as ReviewRow | undefined;
  return toReview(summary.day, row, assessment);
}

/** Every step of the day's review, oldest first. */
export async function listDayReviewHistory(actor: Actor, surveyId: string, dayInput: unknown): Promise<ReviewEvent[]> {
  await assertSurveyPermission(actor, surveyId, "days.read");
  const day = parseDay(dayInput);
  const rows = await getDb()("day_review_events as e")
    .leftJoin("users as u", "u.id", "e.actor_user_id")
    .where({ "e.survey_id": surveyId, "e.day": day })
    .select("e.*", "u.name as actor_name")
    .orderBy("e.id");
  return rows.map((r: { id: number; kind: ReviewEventKind; from_state: ReviewState | null; to_state: ReviewState | null; actor_name: string | null; comment: string; details: string; created_at: string }) => ({
    id: r.id, kind: r.kind, label: REVIEW_EVENT_LABELS[r.kind] ?? r.kind, fromState: r.from_state, toState: r.to_state, actorName: r.actor_name,
    comment: r.comment, details: JSON.parse(r.details), createdAt: r.created_at,
  }));
}

const SubmitSchema = z.object({ comment: z.string().trim().max(4000, "At most 4 000 characters.").default("") });

const DecideSchema = z
  .object({
    decision: z.enum(["accept", "resurvey"], { message: "Choose accept or re-survey." }),
    scope: z.enum(["day", "lines"], { message: "Choose the whole day or listed lines." }).optional(),
    lines: z
      .preprocess((v) => (typeof v === "string" ? v.split(/[\s,;]+/) : v), z.array(z.string().trim().max(80, "A line name is at most 80 characters.")))
      .transform((a) => [...new Set(a.filter((l) => l !== ""))])
      .default([]),
    comment: z.string().trim().max(4000, "At most 4 000 characters.").default(""),
  })
  .superRefine((v, ctx) => {
    if (v.decision !== "resurvey") return;
    if (!v.comment) ctx.addIssue({ code: "custom", path: ["comment"], message: "Say why the day must be walked again (the crew reads this)." });
    if (!v.scope) ctx.addIssue({ code: "custom", path: ["scope"], message: "Choose the whole day or listed lines." });
    if (v.scope === "lines" && v.lines.length === 0) ctx.addIssue({ code: "custom", path: ["lines"], message: "List the lines to re-walk (e.g. L180, L181)." });
  });

async function surveyFacts(db: Knex | Knex.Transaction, surveyId: string) {
  return (await db("surveys").where({ id: surveyId }).first("code", "name", "archived_at")) as { code: string; name: string; archived_at: string | null };
}

async function recordStep(
  trx: Knex.Transaction, surveyId: string, day: string, actor: Actor, kind: ReviewEventKind, from: ReviewState, to: ReviewState, comment: string, details: Record<string, unknown>,
) {
  await trx("day_review_events").insert({
    survey_id: surveyId, day, kind, from_state: from, to_state: to, actor_user_id: actor.userId, comment, details: JSON.stringify(details), created_at: nowIso(),
  });
}

/** Processor or lead: the day goes to "awaiting review"; its reviewers are mailed. */
export async function submitDayForReview(actor: Actor, surveyId: string, dayInput: unknown, input: unknown = {}): Promise<{ review: DayReview; mail: MailOutcome }> {
  await assertSurveyPermission(actor, surveyId, "day.submit");
  const { comment } = parseInput(SubmitSchema, input ?? {});
  const summary = await getDay(actor, surveyId, dayInput);
  const day = summary.day;
  const db = getDb();
  const survey = await surveyFacts(db, surveyId);
  refuseIfArchived(survey, "submitting days");
  const assessment = await assessDay(db, surveyId, summary);
  await db.transaction(async (trx) => {
    await assertSurveyPermission(actor, surveyId, "day.submit", trx);
    const row = (await trx("day_reviews").where({ survey_id: surveyId, day }).first()) as ReviewRow | undefined;
    const from: ReviewState = row?.state ?? "in_processing";
    if (from === "awaiting_review") throw new ConflictError("This day already awaits review.");
    if (from === "accepted") throw new ConflictError("This day is accepted; it cannot be submitted again.");
    const now = nowIso();
    const next = { state: "awaiting_review", scope: null, lines: "[]", comment, submitted_by: actor.userId, submitted_at: now, decided_by: null, decided_at: null, updated_at: now };
    if (row) await trx("day_reviews").where({ survey_id: surveyId, day }).update(next);
    else await trx("day_reviews").insert({ survey_id: surveyId, day, ...next });
    const details = { verdict: assessment.level, reasons: assessment.reasons.map((r) => r.text) };
    await recordStep(trx, surveyId, day, actor, "submitted", from, "awaiting_review", comment, details);
    await recordAudit(trx, { surveyId, actorUserId: actor.userId, action: "day.submit", details: { day, from, ...details } });
  });
  const reviewerIds = (await db("survey_members").where({ survey_id: surveyId, role: "reviewer" }).pluck("user_id")) as string[];
  const mail = await mailAwaitingReview(
    { surveyId, surveyCode: survey.code, surveyName: survey.name, day, actorName: actor.name, actorUserId: actor.userId },
    reviewerIds,
    { verdict: assessment.level ? VERDICT_LABELS[assessment.level] : "not assessed (no base record)", reasons: assessment.reasons.map((r) => r.text), comment },
  );
  return { review: await getDayReview(actor, surveyId, day), mail };
}

/** The crew and processor of a day: who uploaded its logs, ran its corrections or submitted it. */
async function peopleOfDay(db: Knex, surveyId: string, day: string): Promise<string[]> {
  const uploaders = (await db("log_days as d").join("field_logs as l", "l.id", "d.log_id").where({ "d.survey_id": surveyId, "d.day": day }).whereNotNull("l.uploaded_by").distinct().pluck("l.uploaded_by")) as string[];
  const runners = (await db("correction_runs").where({ survey_id: surveyId, day }).whereNotNull("created_by").distinct().pluck("created_by")) as string[];
  const submitters = (await db("day_review_events").where({ survey_id: surveyId, day, kind: "submitted" }).whereNotNull("actor_user_id").distinct().pluck("actor_user_id")) as string[];
  const members = new Set((await db("survey_members").where({ survey_id: surveyId }).pluck("user_id")) as string[]);
  return [...new Set([...uploaders, ...runners, ...submitters])].filter((id) => members.has(id));
}

/** Reviewer only: accept, or send back (whole day or listed lines, with a comment). */
export async function decideDay(actor: Actor, surveyId: string, dayInput: unknown, input: unknown): Promise<{ review: DayReview; mail: MailOutcome }> {
  await assertSurveyPermission(actor, surveyId, "day.decide");
  const v = parseInput(DecideSchema, input);
  const summary = await getDay(actor, surveyId, dayInput);
  const day = summary.day;
  const db = getDb();
  const survey = await surveyFacts(db, surveyId);
  refuseIfArchived(survey, "deciding days");
  const scope = v.decision === "resurvey" ? (v.scope ?? "day") : null;
  const lines = scope === "lines" ? v.lines : [];
  if (lines.length > 0) {
    const known = ((await getDaySeries(actor, surveyId, day, { kind: "rover", maxPoints: 10 })) as RoverSeriesResponse).lines.map((l) => l.line).filter((l) => l !== "");
    const unknown = known.length > 0 ? lines.filter((l) => !known.includes(l)) : [];
    if (unknown.length > 0) throw new ValidationError({ lines: [`Not a line of this day: ${unknown.join(", ")}. Lines of the day: ${known.join(", ")}.`] });
  }
  const kind: ReviewEventKind = v.decision === "accept" ? "accepted" : "resurvey";
  const to: ReviewState = v.decision === "accept" ? "accepted" : "resurvey_needed";
  await db.transaction(async (trx) => {
    await assertSurveyPermission(actor, surveyId, "day.decide", trx);
    const row = (await trx("day_reviews").where({ survey_id: surveyId, day }).first()) as ReviewRow | undefined;
    const from: ReviewState = row?.state ?? "in_processing";
    if (from !== "awaiting_review") throw new ConflictError(from === "in_processing" ? "This day has not been submitted for review yet." : "This day is already decided; a processor submits it again after re-survey.");
    const now = nowIso();
    await trx("day_reviews").where({ survey_id: surveyId, day }).update({ state: to, scope, lines: JSON.stringify(lines), comment: v.comment, decided_by: actor.userId, decided_at: now, updated_at: now });
    await recordStep(trx, surveyId, day, actor, kind, from, to, v.comment, { scope, lines });
    await recordAudit(trx, { surveyId, actorUserId: actor.userId, action: v.decision === "accept" ? "day.accept" : "day.resurvey", details: { day, scope, lines, comment: v.comment } });
  });
  const mail = await mailDecision(
    { surveyId, surveyCode: survey.code, surveyName: survey.name, day, actorName: actor.name, actorUserId: actor.userId },
    await peopleOfDay(db, surveyId, day),
    { kind, comment: v.comment, scope, lines },
  );
  return { review: await getDayReview(actor, surveyId, day), mail };
}

export interface QueueRow {
  surveyId: string;
  surveyCode: string;
  surveyName: string;
  myRole: SurveyRole | "admin";
  day: string;
  state: ReviewState;
  submittedBy: string | null;
  submittedAt: string | null;
  decidedBy: string | null;
  assessment: DayAssessment;
}

/** Review states and assessments of every day of one survey (newest first): the calendar. */
export async function listSurveyDayReviews(actor: Actor, surveyId: string): Promise<{ summary: DaySummary; review: DayReview }[]> {
  const days = await listDays(actor, surveyId); // days.read
  const db = getDb();
  const rows = (await reviewQuery(db).where("r.survey_id", surveyId)) as ReviewRow[];
  const byDay = new Map(rows.map((r) => [r.day, r]));
  const kp = await readKp(db, surveyId);
  const out: { summary: DaySummary; review: DayReview }[] = [];
  for (const d of days) out.push({ summary: d, review: toReview(d.day, byDay.get(d.day), await assessDay(db, surveyId, d, kp)) });
  return out;
}

/** Days of every survey where the actor decides (reviewer; admin: all surveys), with their assessment. */
export async function listReviewQueue(actor: Actor): Promise<QueueRow[]> {
  const db = getDb();
  const surveys = (actor.isAdmin
    ? await db("surveys").whereNull("archived_at").select("id", "code", "name")
    : await db("survey_members as m").join("surveys as s", "s.id", "m.survey_id").where({ "m.user_id": actor.userId }).whereNull("s.archived_at").select("s.id", "s.code", "s.name", "m.role")) as { id: string; code: string; name: string; role?: SurveyRole }[];
  const out: QueueRow[] = [];
  for (const s of surveys) {
    const role = actor.isAdmin ? "admin" : s.role!;
    if (!roleAllows(role, "day.decide")) continue;
    for (const { summary, review } of await listSurveyDayReviews(actor, s.id)) {
      out.push({
        surveyId: s.id, surveyCode: s.code, surveyName: s.name, myRole: role, day: summary.day, state: review.state,
        submittedBy: review.submittedBy, submittedAt: review.submittedAt, decidedBy: review.decidedBy, assessment: review.assessment,
      });
    }
  }
  return out;
}

/** True when the actor decides days on any survey (top bar "Review"). */
export async function decidesAnywhere(actor: Actor): Promise<boolean> {
  if (actor.isAdmin) return true;
  const roles = (await getDb()("survey_members").where({ user_id: actor.userId }).pluck("role")) as SurveyRole[];
  return roles.some((r) => roleAllows(r, "day.decide"));
}
