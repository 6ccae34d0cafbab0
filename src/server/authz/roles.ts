/** Per-survey member roles (no `server-only`: forms and pages may show these labels). */
export const SURVEY_ROLES = ["crew", "processor", "reviewer", "lead"] as const;
export type SurveyRole = (typeof SURVEY_ROLES)[number];

export const SURVEY_ROLE_LABELS: Record<SurveyRole, string> = {
  crew: "Field crew",
  processor: "Data processor",
  reviewer: "QA reviewer",
  lead: "Survey lead",
};

export function isSurveyRole(value: unknown): value is SurveyRole {
  return typeof value === "string" && (SURVEY_ROLES as readonly string[]).includes(value);
}
