import type { Knex } from "knex";
import type { EngineName } from "./types";

/** Which engine a Knex instance (or transaction) talks to. */
export function engineOf(db: Knex): EngineName {
  const client = (db.client as { config: { client: unknown } }).config.client;
  return client === "pg" ? "postgres" : "sqlite";
}
