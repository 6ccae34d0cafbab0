/**
 * THE route access table: every route handler (method + path pattern) and every server action
 * (module + export name) with who may call it. Survey-scoped entries name a permission of the
 * permission table, so roles come from there, not from here. tests/server/authz-matrix.test.ts
 * scans app/ for route handlers and actions, fails for any not listed here, and calls each one
 * as anonymous, as each role on its survey and on another survey; assertRouteAccess applies an
 * entry in code; route handlers pass their own entry to actorFromRequest (its changesState).
 *
 * Keys: routes "METHOD /path/[param]" (route groups dropped), actions "app/…/actions.ts#exportName".
 */
import "server-only";
import type { Actor } from "../auth/actor";
import { UnauthenticatedError } from "../errors";
import type { Permission } from "./permission-table";
import { assertAdmin, assertSurveyPermission } from "./permissions";

export type Access =
  /** Anyone; the handler may still need a token in the URL or body (invitation, reset link). */
  | { who: "anonymous" }
  /** Any signed-in user (cookie or API token); acts on the caller's own things only. */
  | { who: "signed-in" }
  /** A member of the survey in the path whose role has `permission` (org admin: always). */
  | { who: "survey"; permission: Permission }
  /** Org admin only. */
  | { who: "admin" };

export type RouteAccessEntry = Access & {
  /** Changes state: cookie callers must come from our own origin (Bearer-token callers need not). */
  changesState: boolean;
};

const anonymous = (changesState = false): RouteAccessEntry => ({ who: "anonymous", changesState });
const signedIn = (changesState = false): RouteAccessEntry => ({ who: "signed-in", changesState });
const survey = (permission: Permission, changesState = false): RouteAccessEntry => ({ who: "survey", permission, changesState });
const admin = (changesState = false): RouteAccessEntry => ({ who: "admin", changesState });

const DAY = "/api/v1/surveys/[surveyId]/days/[date]";
const RUN = `${DAY}/runs/[run]`;

export const ROUTE_ACCESS = {
  "GET /api/health": anonymous(),
  "POST /api/v1/auth/sign-in": anonymous(true),
  "POST /api/v1/auth/sign-out": anonymous(true),
  "GET /api/v1/reference-field": signedIn(),
  "GET /api/v1/surveys/[surveyId]/days": survey("days.read"),
  [`GET ${DAY}`]: survey("days.read"),
  [`GET ${DAY}/series`]: survey("days.read"),
  [`GET ${DAY}/runs`]: survey("days.read"),
  [`POST ${DAY}/runs`]: survey("runs.create", true),
  [`GET ${RUN}`]: survey("days.read"),
  [`GET ${RUN}/compare`]: survey("days.read"),
  [`GET ${RUN}/corrected.csv`]: survey("export"),
  [`GET ${RUN}/corrected.geojson`]: survey("export"),
  "GET /api/v1/surveys/[surveyId]/logs": survey("logs.read"),
  "POST /api/v1/surveys/[surveyId]/logs": survey("logs.upload", true),
  "GET /api/v1/surveys/[surveyId]/logs/[logId]/original": survey("logs.read"),
  "GET /api/v1/surveys/[surveyId]/logs/[logId]/problems": survey("logs.read"),
  [`GET ${DAY}/review`]: survey("days.read"),
  [`POST ${DAY}/review/submit`]: survey("day.submit", true),
  [`POST ${DAY}/review/decision`]: survey("day.decide", true),
  "GET /api/v1/surveys/[surveyId]/kp": survey("days.read"),
  "POST /api/v1/surveys/[surveyId]/kp": survey("kp.update", true),
} as const satisfies Record<string, RouteAccessEntry>;

/** Server actions are POST endpoints too (Next checks their Origin itself); all change state. */
export const ACTION_ACCESS = {
  "app/(auth)/sign-in/actions.ts#signInAction": anonymous(true),
  "app/(auth)/forgot-password/actions.ts#requestPasswordResetAction": anonymous(true),
  "app/(auth)/reset-password/[token]/actions.ts#resetPasswordAction": anonymous(true),
  "app/(auth)/invitations/[token]/actions.ts#acceptInvitationAction": anonymous(true),
  "app/(workspace)/actions.ts#signOutAction": anonymous(true), // ends the caller's own session, if any
  "app/(workspace)/profile/actions.ts#createApiTokenAction": signedIn(true),
  "app/(workspace)/profile/actions.ts#revokeApiTokenAction": signedIn(true),
  "app/(workspace)/profile/actions.ts#signOutEverywhereAction": signedIn(true),
  "app/(workspace)/surveys/new/actions.ts#createSurveyAction": admin(true),
  "app/(workspace)/surveys/[surveyId]/edit/actions.ts#updateSurveyAction": survey("survey.update", true),
  "app/(workspace)/surveys/[surveyId]/edit/actions.ts#setArchivedAction": survey("survey.archive", true),
  "app/(workspace)/surveys/[surveyId]/members/actions.ts#inviteAction": survey("members.manage", true),
  "app/(workspace)/surveys/[surveyId]/members/actions.ts#memberAction": survey("members.manage", true),
  "app/(workspace)/surveys/[surveyId]/members/actions.ts#revokeInvitationAction": survey("members.manage", true),
  "app/(workspace)/surveys/[surveyId]/settings/actions.ts#updateProcessingSettingsAction": survey("processing.update", true),
  "app/(workspace)/surveys/[surveyId]/days/[date]/actions.ts#updateDatumAction": survey("processing.update", true),
  "app/(workspace)/surveys/[surveyId]/days/[date]/actions.ts#savePairingAction": survey("processing.update", true),
  "app/(workspace)/surveys/[surveyId]/days/[date]/review-actions.ts#submitDayAction": survey("day.submit", true),
  "app/(workspace)/surveys/[surveyId]/days/[date]/review-actions.ts#decideDayAction": survey("day.decide", true),
  "app/(workspace)/surveys/[surveyId]/qa/actions.ts#updateQaThresholdsAction": survey("qa.update", true),
  "app/(workspace)/surveys/[surveyId]/qa/actions.ts#saveKpAction": survey("kp.update", true),
  "app/(workspace)/profile/notification-actions.ts#saveNotificationPreferencesAction": signedIn(true),
} as const satisfies Record<string, RouteAccessEntry>;

export type RouteKey = keyof typeof ROUTE_ACCESS;
export type ActionKey = keyof typeof ACTION_ACCESS;

export function routeAccess(key: RouteKey): RouteAccessEntry {
  return ROUTE_ACCESS[key];
}

export function actionAccess(key: ActionKey): RouteAccessEntry {
  return ACTION_ACCESS[key];
}

/**
 * Applies an entry: UnauthenticatedError without an actor (unless anonymous), ForbiddenError for
 * non-admins on admin entries, and the survey permission check (NotFoundError off the survey).
 */
export async function assertRouteAccess(entry: Access, actor: Actor | null, surveyId?: string): Promise<void> {
  if (entry.who === "anonymous") return;
  if (!actor) throw new UnauthenticatedError();
  if (entry.who === "admin") assertAdmin(actor);
  if (entry.who === "survey") await assertSurveyPermission(actor, surveyId ?? "", entry.permission);
}
