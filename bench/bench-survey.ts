/**
 * The one user and survey the in-process benches import into, written straight into a fresh
 * migrated database (no password: the benches call the services as this actor directly).
 */
import type { Knex } from "knex";

export const BENCH_SURVEY_ID = "bench-survey";

export async function addBenchSurvey(db: Knex, role: "crew" | "processor"): Promise<{ userId: string; email: string; name: string; isAdmin: boolean }> {
  const now = new Date().toISOString();
  const actor = { userId: "bench-user", email: "bench@fieldtide.invalid", name: "Bench", isAdmin: false };
  await db("users").insert({ id: actor.userId, email: actor.email, name: actor.name, password_hash: "x", is_admin: 0, created_at: now, updated_at: now });
  await db("surveys").insert({ id: BENCH_SURVEY_ID, code: "BENCH", name: "Bench", time_zone: "Europe/London", created_at: now, updated_at: now });
  await db("survey_members").insert({ survey_id: BENCH_SURVEY_ID, user_id: actor.userId, role, joined_at: now });
  return actor;
}
