/** Plain words for audit actions (no `server-only`: the audit page shows them). */
export const AUDIT_ACTION_LABELS: Record<string, string> = {
  "survey.create": "Survey created",
  "survey.update": "Survey details changed",
  "survey.archive": "Survey archived",
  "survey.restore": "Survey restored",
  "member.add": "Member added",
  "member.role_change": "Member's role changed",
  "member.remove": "Member removed",
  "invitation.create": "Invitation sent",
  "invitation.revoke": "Invitation revoked",
  "invitation.accept": "Invitation accepted",
  "password.reset": "Password reset",
  "log.import": "Log imported",
  "processing.update": "Processing settings changed",
  "run.create": "Correction run started",
  "run.export": "Run exported",
  "qa.thresholds_update": "QA thresholds changed",
  "kp.update": "Kp values entered",
  "day.submit": "Day submitted for review",
  "day.accept": "Day accepted",
  "day.resurvey": "Day sent back for re-survey",
};

export function auditActionLabel(action: string): string {
  return AUDIT_ACTION_LABELS[action] ?? action;
}
