/**
 * Field log ingest: the original files of base and rover logs (kept verbatim on disk under
 * UPLOAD_DIR, named by generated id), their parsed readings, the rows refused or flagged while
 * reading them, per-log survey days, named column-mapping profiles, and personal API tokens.
 *
 * Times: field_logs/profiles/tokens use ISO 8601 UTC strings like the foundation; readings keep
 * time as integer ms since the Unix epoch, UTC (fast range scans when pairing base and rover).
 * local_day is the reading's calendar date in the survey's time zone as days since 1970-01-01.
 */
import type { Knex } from "knex";

export const LOG_KINDS = ["base", "rover"];
export const SENSOR_TYPES = ["proton-precession", "overhauser", "other"];
export const TIME_BASES = ["utc", "gps", "local"];

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("field_logs", (t) => {
    t.increments("id").primary();
    t.text("survey_id").notNullable().references("id").inTable("surveys").onDelete("CASCADE");
    t.text("kind").notNullable().checkIn(LOG_KINDS);
    t.text("original_name").notNullable(); // as uploaded; shown and used for the download name only
    t.text("storage_key").notNullable().unique(); // file name under UPLOAD_DIR/originals (generated)
    t.text("sha256").notNullable(); // hex of the original bytes
    t.integer("size_bytes").notNullable();
    t.text("instrument").notNullable().defaultTo("");
    t.text("sensor_type").notNullable().checkIn(SENSOR_TYPES);
    t.text("operator").notNullable().defaultTo("");
    t.text("base_site_name").nullable();
    t.double("base_latitude_deg").nullable();
    t.double("base_longitude_deg").nullable();
    t.double("base_height_m").nullable();
    t.text("time_basis").notNullable().checkIn(TIME_BASES);
    t.double("clock_offset_s").notNullable().defaultTo(0);
    t.text("delimiter").notNullable();
    t.text("header").notNullable(); // JSON array of header names as written
    t.text("mapping").notNullable(); // JSON object role → header name used
    t.text("profile_id").nullable();
    t.integer("row_count").notNullable(); // data rows seen
    t.integer("reading_count").notNullable(); // readings stored
    t.integer("rejected_count").notNullable();
    t.integer("issue_count").notNullable();
    t.bigInteger("first_time_ms").nullable();
    t.bigInteger("last_time_ms").nullable();
    t.text("warnings").notNullable().defaultTo("[]"); // JSON array of strings
    t.text("uploaded_by").nullable().references("id").inTable("users").onDelete("SET NULL");
    t.text("uploaded_at").notNullable();
    t.unique(["survey_id", "sha256"]);
    t.index(["survey_id", "uploaded_at"]);
    t.index(["survey_id", "instrument", "first_time_ms"]);
  });

  // Readings: integer log id and no extra columns, so a million rows stay small and fast.
  await knex.schema.createTable("log_readings", (t) => {
    t.integer("log_id").notNullable().references("id").inTable("field_logs").onDelete("CASCADE");
    t.bigInteger("time_ms").notNullable();
    t.double("field_nt").notNullable();
    t.double("latitude_deg").nullable();
    t.double("longitude_deg").nullable();
    t.double("height_m").nullable();
    t.text("line").nullable();
    t.text("station").nullable();
    t.integer("source_line").notNullable();
    t.integer("local_day").notNullable();
    t.index(["log_id", "time_ms"]);
  });

  // Rows of a log that were refused (rejected) or kept with a warning (issue: time backwards, duplicate time).
  await knex.schema.createTable("log_problems", (t) => {
    t.integer("log_id").notNullable().references("id").inTable("field_logs").onDelete("CASCADE");
    t.text("kind").notNullable().checkIn(["rejected", "issue"]);
    t.integer("line").notNullable();
    t.text("column_name").notNullable();
    t.text("value").notNullable();
    t.text("reason").notNullable();
    t.text("message").notNullable();
    t.index(["log_id", "line"]);
  });

  // Survey days a log covers (local calendar date in the survey's zone), with counts and span.
  await knex.schema.createTable("log_days", (t) => {
    t.integer("log_id").notNullable().references("id").inTable("field_logs").onDelete("CASCADE");
    t.text("survey_id").notNullable().references("id").inTable("surveys").onDelete("CASCADE");
    t.text("day").notNullable(); // yyyy-mm-dd
    t.integer("reading_count").notNullable();
    t.bigInteger("first_time_ms").notNullable();
    t.bigInteger("last_time_ms").notNullable();
    t.primary(["log_id", "day"]);
    t.index(["survey_id", "day"]);
  });

  await knex.schema.createTable("import_profiles", (t) => {
    t.text("id").primary();
    t.text("survey_id").notNullable().references("id").inTable("surveys").onDelete("CASCADE");
    t.text("name").notNullable();
    t.text("header_signature").notNullable(); // normalised header row (see src/server/logs/header-signature.ts)
    t.text("delimiter").nullable();
    t.text("mapping").notNullable(); // JSON object role → header name
    t.text("created_by").nullable().references("id").inTable("users").onDelete("SET NULL");
    t.text("created_at").notNullable();
    t.text("updated_at").notNullable();
    t.unique(["survey_id", "name"]);
    t.index(["survey_id", "header_signature"]);
  });

  await knex.schema.createTable("api_tokens", (t) => {
    t.text("id").primary();
    t.text("user_id").notNullable().references("id").inTable("users").onDelete("CASCADE");
    t.text("name").notNullable();
    t.text("token_hash").notNullable().unique(); // SHA-256 hex of the token
    t.text("token_prefix").notNullable(); // first characters, to tell tokens apart on screen
    t.text("created_at").notNullable();
    t.text("last_used_at").nullable();
    t.text("revoked_at").nullable();
    t.index(["user_id"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  for (const table of ["api_tokens", "import_profiles", "log_days", "log_problems", "log_readings", "field_logs"]) {
    await knex.schema.dropTableIfExists(table);
  }
}
