/**
 * THE permission table: which survey roles may do what on their survey. The org admin may do
 * everything on every survey. Code checks it through assertSurveyPermission; tests iterate it.
 * No `server-only`, so pages can hide controls a role cannot use (the server still checks).
 */
import { SURVEY_ROLES, type SurveyRole } from "./roles";

const ALL: readonly SurveyRole[] = SURVEY_ROLES;

export const PERMISSIONS = {
  "survey.read": ALL,
  "survey.update": ["lead"],
  "survey.archive": ["lead"],
  "members.read": ALL,
  "members.manage": ["lead"],
  "logs.upload": ["crew", "processor", "lead"],
  "logs.read": ALL,
  "days.read": ALL,
  "runs.create": ["processor", "lead"],
  "processing.update": ["processor", "lead"],
  "settings.update": ["lead"],
  export: ["processor", "reviewer", "lead"],
  /** Only a QA reviewer decides a day (accept or send back); the org admin may too. */
  "day.decide": ["reviewer"],
  /** A processor (or the lead) hands a day to review. */
  "day.submit": ["processor", "lead"],
  /** The survey's QA thresholds. */
  "qa.update": ["processor", "lead"],
  /** 3-hourly Kp values held for the survey. */
  "kp.update": ["reviewer", "processor", "lead"],
  /** The survey's audit trail. */
  "audit.read": ["lead"],
} as const satisfies Record<string, readonly SurveyRole[]>;

export type Permission = keyof typeof PERMISSIONS;

export const PERMISSION_NAMES = Object.keys(PERMISSIONS) as Permission[];

export function roleAllows(role: SurveyRole | "admin", permission: Permission): boolean {
  if (role === "admin") return true;
  return (PERMISSIONS[permission] as readonly SurveyRole[]).includes(role);
}
