/**
 * Foundation schema: accounts, sessions, surveys and their members, invitations, password
 * resets, captured mail (fake SMTP) and the audit trail.
 *
 * Times: ISO 8601 UTC strings (`2026-12-01T22:15:00.000Z`) everywhere, except
 * sessions.expires_at, which is integer seconds since the epoch as lucia's SQLite adapter expects.
 */
import type { Knex } from "knex";

const SURVEY_ROLES = ["crew", "processor", "reviewer", "lead"];

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("users", (t) => {
    t.text("id").primary();
    t.text("email").notNullable().unique(); // stored lower-case
    t.text("name").notNullable();
    t.text("password_hash").notNullable();
    t.integer("is_admin").notNullable().defaultTo(0);
    t.text("created_at").notNullable();
    t.text("updated_at").notNullable();
  });

  await knex.schema.createTable("sessions", (t) => {
    t.text("id").primary();
    t.bigInteger("expires_at").notNullable(); // seconds since epoch (lucia adapter-sqlite)
    t.text("user_id").notNullable().references("id").inTable("users").onDelete("CASCADE");
    t.index(["user_id"]);
  });

  await knex.schema.createTable("surveys", (t) => {
    t.text("id").primary();
    t.text("code").notNullable().unique();
    t.text("name").notNullable();
    t.text("client").notNullable().defaultTo("");
    t.text("area_description").notNullable().defaultTo("");
    t.text("time_zone").notNullable();
    t.text("notes").notNullable().defaultTo("");
    t.text("archived_at").nullable();
    t.text("created_by").nullable().references("id").inTable("users").onDelete("SET NULL");
    t.text("created_at").notNullable();
    t.text("updated_at").notNullable();
  });

  await knex.schema.createTable("survey_members", (t) => {
    t.text("survey_id").notNullable().references("id").inTable("surveys").onDelete("CASCADE");
    t.text("user_id").notNullable().references("id").inTable("users").onDelete("CASCADE");
    t.text("role").notNullable().checkIn(SURVEY_ROLES);
    t.text("joined_at").notNullable();
    t.primary(["survey_id", "user_id"]);
    t.index(["user_id"]);
  });

  await knex.schema.createTable("invitations", (t) => {
    t.text("id").primary();
    t.text("survey_id").notNullable().references("id").inTable("surveys").onDelete("CASCADE");
    t.text("email").notNullable(); // lower-case
    t.text("role").notNullable().checkIn(SURVEY_ROLES);
    t.text("token_hash").notNullable().unique(); // SHA-256 hex of the token in the link
    t.text("invited_by").nullable().references("id").inTable("users").onDelete("SET NULL");
    t.text("expires_at").notNullable();
    t.text("used_at").nullable();
    t.text("accepted_user_id").nullable().references("id").inTable("users").onDelete("SET NULL");
    t.text("revoked_at").nullable();
    t.text("created_at").notNullable();
    t.index(["survey_id"]);
  });

  await knex.schema.createTable("password_resets", (t) => {
    t.text("id").primary();
    t.text("user_id").notNullable().references("id").inTable("users").onDelete("CASCADE");
    t.text("token_hash").notNullable().unique(); // SHA-256 hex
    t.text("expires_at").notNullable();
    t.text("used_at").nullable();
    t.text("created_at").notNullable();
    t.index(["user_id"]);
  });

  await knex.schema.createTable("captured_mail", (t) => {
    t.increments("id").primary();
    t.text("message_id").nullable();
    t.text("envelope_from").notNullable().defaultTo("");
    t.text("envelope_to").notNullable().defaultTo("[]"); // JSON array of addresses
    t.text("from_header").notNullable().defaultTo("");
    t.text("to_header").notNullable().defaultTo("");
    t.text("subject").notNullable().defaultTo("");
    t.text("text_body").nullable();
    t.text("html_body").nullable();
    t.text("raw").notNullable();
    t.text("received_at").notNullable();
  });

  await knex.schema.createTable("audit_events", (t) => {
    t.text("id").primary();
    t.text("survey_id").nullable().references("id").inTable("surveys").onDelete("CASCADE");
    t.text("actor_user_id").nullable().references("id").inTable("users").onDelete("SET NULL");
    t.text("action").notNullable();
    t.text("details").notNullable().defaultTo("{}"); // JSON object
    t.text("created_at").notNullable();
    t.index(["survey_id", "created_at"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  for (const table of ["audit_events", "captured_mail", "password_resets", "invitations", "survey_members", "surveys", "sessions", "users"]) {
    await knex.schema.dropTableIfExists(table);
  }
}
