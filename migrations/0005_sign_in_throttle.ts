/**
 * Failed sign-ins, one row each, for the sliding-window throttle (src/server/auth/throttle.ts):
 * counted per account (the e-mail as typed, lower-cased, whether or not it exists) and per client
 * address over the last minutes. Old rows are swept as new ones are written.
 */
import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("sign_in_failures", (t) => {
    t.increments("id");
    t.text("account").notNullable(); // lower-cased e-mail
    t.text("address").notNullable(); // client address, "unknown" when none
    t.bigInteger("failed_at_ms").notNullable(); // Unix ms
    t.index(["account", "failed_at_ms"]);
    t.index(["address", "failed_at_ms"]);
    t.index(["failed_at_ms"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("sign_in_failures");
}
