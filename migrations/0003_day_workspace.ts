/**
 * Day workspace: processing settings per survey (with their change history), per-day pairing
 * choices (which base and rover logs a day's correction uses), numbered correction runs with
 * their full parameters and inputs, and each run's per-reading results.
 *
 * Times: ISO 8601 UTC strings, like the foundation. A run's results are stored as one BLOB per
 * column (little-endian typed arrays): a 200 000-reading run is written and read back in tens of
 * milliseconds, and runs are immutable once done.
 */
import type { Knex } from "knex";

export const RUN_STATUSES = ["queued", "running", "done", "failed"];

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("processing_settings", (t) => {
    t.text("survey_id").primary().references("id").inTable("surveys").onDelete("CASCADE");
    t.text("settings").notNullable(); // JSON, see src/server/processing/schema.ts
    t.integer("revision").notNullable().defaultTo(1);
    t.text("updated_by").nullable().references("id").inTable("users").onDelete("SET NULL");
    t.text("updated_at").notNullable();
  });

  // One row per changed setting: who, when, old → new (JSON values).
  await knex.schema.createTable("processing_setting_changes", (t) => {
    t.increments("id").primary();
    t.text("survey_id").notNullable().references("id").inTable("surveys").onDelete("CASCADE");
    t.integer("revision").notNullable();
    t.text("setting").notNullable();
    t.text("old_value").nullable();
    t.text("new_value").nullable();
    t.text("changed_by").nullable().references("id").inTable("users").onDelete("SET NULL");
    t.text("changed_at").notNullable();
    t.index(["survey_id", "changed_at"]);
  });

  // A processor's explicit choice of logs for a day; without a row the defaults apply.
  await knex.schema.createTable("day_pairings", (t) => {
    t.text("survey_id").notNullable().references("id").inTable("surveys").onDelete("CASCADE");
    t.text("day").notNullable(); // yyyy-mm-dd, survey local date
    t.text("method").notNullable().checkIn(["base", "loop"]);
    t.integer("base_log_id").nullable().references("id").inTable("field_logs").onDelete("SET NULL");
    t.integer("fallback_base_log_id").nullable().references("id").inTable("field_logs").onDelete("SET NULL");
    t.text("rover_log_ids").notNullable().defaultTo("[]"); // JSON array of ids; [] = all rover logs of the day
    t.text("updated_by").nullable().references("id").inTable("users").onDelete("SET NULL");
    t.text("updated_at").notNullable();
    t.primary(["survey_id", "day"]);
  });

  await knex.schema.createTable("correction_runs", (t) => {
    t.increments("id").primary();
    t.text("survey_id").notNullable().references("id").inTable("surveys").onDelete("CASCADE");
    t.text("day").notNullable();
    t.integer("number").notNullable(); // 1, 2, 3 … per survey day
    t.text("status").notNullable().checkIn(RUN_STATUSES);
    t.double("progress").notNullable().defaultTo(0); // 0 … 1
    t.text("parameters").notNullable(); // JSON: every option the core correction was given
    t.text("model_name").nullable(); // e.g. IGRF-14; null for no reference model
    t.text("model_version").nullable();
    t.text("inputs").notNullable(); // JSON array: { logId, kind, role, originalName, sha256, readingCount }
    t.text("summary").nullable(); // JSON: the core's CorrectionSummary + run facts
    t.text("error").nullable();
    t.text("process_id").notNullable(); // boot id of the server process that ran it (interrupted runs)
    t.integer("reading_count").notNullable().defaultTo(0);
    t.text("created_by").nullable().references("id").inTable("users").onDelete("SET NULL");
    t.text("created_at").notNullable();
    t.text("started_at").nullable();
    t.text("finished_at").nullable();
    t.unique(["survey_id", "day", "number"]);
    t.index(["survey_id", "day", "status"]);
  });

  await knex.schema.createTable("correction_run_columns", (t) => {
    t.integer("run_id").notNullable().references("id").inTable("correction_runs").onDelete("CASCADE");
    t.text("name").notNullable();
    t.text("dtype").notNullable(); // f64 | i32 | u8
    t.binary("data").notNullable();
    t.primary(["run_id", "name"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  for (const table of ["correction_run_columns", "correction_runs", "day_pairings", "processing_setting_changes", "processing_settings"]) {
    await knex.schema.dropTableIfExists(table);
  }
}
