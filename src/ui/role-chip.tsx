/** The actor's role on a survey, as word + shape + colour. */
import { SURVEY_ROLE_LABELS } from "@/src/server/authz/roles";
import { BootIcon, EyeIcon, FlagIcon, ShieldIcon, WaveIcon } from "./icons";
import { StatusChip, type ChipTone } from "./status-chip";

export type RoleName = "crew" | "processor" | "reviewer" | "lead" | "admin";

const ROLE: Record<RoleName, { label: string; tone: ChipTone; icon: typeof ShieldIcon; detail: string }> = {
  admin: { label: "Org admin", tone: "neutral", icon: ShieldIcon, detail: "Organisation administrator: every survey, every action" },
  lead: { label: SURVEY_ROLE_LABELS.lead, tone: "info", icon: FlagIcon, detail: "Manages members and settings of this survey" },
  processor: { label: SURVEY_ROLE_LABELS.processor, tone: "info", icon: WaveIcon, detail: "Runs corrections and exports" },
  reviewer: { label: SURVEY_ROLE_LABELS.reviewer, tone: "info", icon: EyeIcon, detail: "Decides field days in QA review" },
  crew: { label: SURVEY_ROLE_LABELS.crew, tone: "info", icon: BootIcon, detail: "Uploads base and rover logs" },
};

export const ROLE_LABEL: Record<RoleName, string> = Object.fromEntries(
  Object.entries(ROLE).map(([role, value]) => [role, value.label]),
) as Record<RoleName, string>;

export function RoleChip({ role }: { role: RoleName }) {
  const r = ROLE[role];
  return <StatusChip label={r.label} tone={r.tone} icon={r.icon} detail={r.detail} />;
}
