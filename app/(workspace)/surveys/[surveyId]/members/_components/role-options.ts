import { SURVEY_ROLES, SURVEY_ROLE_LABELS } from "@/src/server/authz/roles";

/** Survey roles for selects, lead last (the broadest role). */
export const ROLE_OPTIONS = SURVEY_ROLES.map((role) => ({ value: role, label: SURVEY_ROLE_LABELS[role] }));
