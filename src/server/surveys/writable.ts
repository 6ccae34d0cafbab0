import "server-only";
import type { Knex } from "knex";
import { ConflictError } from "../errors";

/** Refuses a change to an archived survey's data (its settings, thresholds, Kp, pairings): 409 with what to do. */
export async function assertSurveyWritable(db: Knex | Knex.Transaction, surveyId: string, doing: string): Promise<void> {
  const survey = await db("surveys").where({ id: surveyId }).first("archived_at");
  if (survey?.archived_at) throw new ConflictError(`This survey is archived: restore it before ${doing}.`);
}
