/**
 * QA review: per-survey QA thresholds (with their change history), 3-hourly Kp values held for a
 * survey, each day's automatic assessment (suggested verdict, reasons, metrics), each day's review
 * state with its full history, and per-user notification opt-outs.
 *
 * Times: ISO 8601 UTC strings like the foundation. Days: yyyy-mm-dd, survey local date.
 */
import type { Knex } from "knex";

export const REVIEW_STATES = ["in_processing", "awaiting_review", "accepted", "resurvey_needed"];

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("qa_thresholds", (t) => {
    t.text("survey_id").primary().references("id").inTable("surveys").onDelete("CASCADE");
    t.text("thresholds").notNullable(); // JSON, see src/server/qa-assessment/thresholds.ts
    t.integer("revision").notNullable().defaultTo(1);
    t.text("updated_by").nullable().references("id").inTable("users").onDelete("SET NULL");
    t.text("updated_at").notNullable();
  });

  await knex.schema.createTable("qa_threshold_changes", (t) => {
    t.increments("id").primary();
    t.text("survey_id").notNullable().references("id").inTable("surveys").onDelete("CASCADE");
    t.integer("revision").notNullable();
    t.text("setting").notNullable();
    t.text("old_value").nullable(); // JSON
    t.text("new_value").nullable(); // JSON
    t.text("changed_by").nullable().references("id").inTable("users").onDelete("SET NULL");
    t.text("changed_at").notNullable();
    t.index(["survey_id", "changed_at"]);
  });

  // Planetary Kp per 3-hour interval (start at 00, 03, … 21 UTC) as a team holds it for its survey.
  await knex.schema.createTable("kp_values", (t) => {
    t.text("survey_id").notNullable().references("id").inTable("surveys").onDelete("CASCADE");
    t.text("interval_start").notNullable(); // ISO UTC, on a 3-hour boundary
    t.double("kp").notNullable(); // 0 … 9
    t.text("source").notNullable().checkIn(["entered", "csv"]);
    t.text("entered_by").nullable().references("id").inTable("users").onDelete("SET NULL");
    t.text("entered_at").notNullable();
    t.primary(["survey_id", "interval_start"]);
  });

  // The latest automatic assessment of a day; `fingerprint` names its inputs (base log, thresholds revision, Kp).
  await knex.schema.createTable("day_assessments", (t) => {
    t.text("survey_id").notNullable().references("id").inTable("surveys").onDelete("CASCADE");
    t.text("day").notNullable();
    t.text("fingerprint").notNullable();
    t.integer("base_log_id").nullable().references("id").inTable("field_logs").onDelete("SET NULL");
    t.text("level").nullable().checkIn(["quiet", "disturbed", "storm"]); // null: nothing to judge
    t.text("reasons").notNullable().defaultTo("[]"); // JSON array of { level, metric, value, limit, text }
    t.text("metrics").nullable(); // JSON object of the day's metrics
    t.double("kp_max").nullable();
    t.text("computed_at").notNullable();
    t.primary(["survey_id", "day"]);
  });

  await knex.schema.createTable("day_reviews", (t) => {
    t.text("survey_id").notNullable().references("id").inTable("surveys").onDelete("CASCADE");
    t.text("day").notNullable();
    t.text("state").notNullable().checkIn(REVIEW_STATES);
    t.text("scope").nullable().checkIn(["day", "lines"]); // re-survey: the whole day or listed lines
    t.text("lines").notNullable().defaultTo("[]"); // JSON array of line names to re-walk
    t.text("comment").notNullable().defaultTo("");
    t.text("submitted_by").nullable().references("id").inTable("users").onDelete("SET NULL");
    t.text("submitted_at").nullable();
    t.text("decided_by").nullable().references("id").inTable("users").onDelete("SET NULL");
    t.text("decided_at").nullable();
    t.text("updated_at").notNullable();
    t.primary(["survey_id", "day"]);
    t.index(["state"]);
  });

  // Every step of a day's review: submitted, accepted, sent back, and assessment changes.
  await knex.schema.createTable("day_review_events", (t) => {
    t.increments("id").primary();
    t.text("survey_id").notNullable().references("id").inTable("surveys").onDelete("CASCADE");
    t.text("day").notNullable();
    t.text("kind").notNullable(); // submitted | accepted | resurvey | assessed
    t.text("from_state").nullable();
    t.text("to_state").nullable();
    t.text("actor_user_id").nullable().references("id").inTable("users").onDelete("SET NULL");
    t.text("comment").notNullable().defaultTo("");
    t.text("details").notNullable().defaultTo("{}"); // JSON
    t.text("created_at").notNullable();
    t.index(["survey_id", "day", "id"]);
  });

  // Opt-outs only: a row means the user does not want mail of that kind.
  await knex.schema.createTable("notification_opt_outs", (t) => {
    t.text("user_id").notNullable().references("id").inTable("users").onDelete("CASCADE");
    t.text("kind").notNullable();
    t.text("created_at").notNullable();
    t.primary(["user_id", "kind"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  for (const table of ["notification_opt_outs", "day_review_events", "day_reviews", "day_assessments", "kp_values", "qa_threshold_changes", "qa_thresholds"]) {
    await knex.schema.dropTableIfExists(table);
  }
}
