import "server-only";
import type { Knex } from "knex";
import { ConflictError } from "../errors";

/** An archived survey is read-only: 409 saying what to do, for a survey row already loaded. */
export function refuseIfArchived(survey: { archived_at: string | null } | undefined, doing: string): void {
  if (survey?.archived_at) throw new ConflictError(`This survey is archived: restore it before ${doing}.`);
}

/** Refuses a change to an archived survey's data (its settings, thresholds, Kp, pairings): 409 with what to do. */
export async function assertSurveyWritable(db: Knex | Knex.Transaction, surveyId: string, doing: string): Promise<void> {
  refuseIfArchived(await db("surveys").where({ id: surveyId }).first("archived_at"), doing);
}
