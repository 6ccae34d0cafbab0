/**
 * Demo scenario (all invented): the company "Copperwren Geophysics", five users, two active
 * surveys and one archived. On a database that already holds the demo, seeding leaves it as it
 * is (nothing a demo user did is lost); with `replace`, demo surveys (by code) and demo users
 * (by e-mail) are deleted with everything that hangs off them, then re-inserted.
 * Passwords are hashed here, at seed time.
 */
import { randomUUID } from "node:crypto";
import type { Knex } from "knex";
import { hashPassword } from "../src/server/auth/password";
import { DEMO_SIGN_INS } from "./demo-users";

type Role = "crew" | "processor" | "reviewer" | "lead";

type UserKey = "admin" | "lead" | "processor" | "crew" | "reviewer";

/** The demo people (seeds/demo-users.ts), keyed by their e-mail's local part. */
export const DEMO_USERS = DEMO_SIGN_INS.map((u) => ({
  ...u,
  key: u.email.split("@")[0] as UserKey,
  isAdmin: u.email.startsWith("admin@"),
}));


export const DEMO_SURVEYS: ReadonlyArray<{
  code: string;
  name: string;
  client: string;
  areaDescription: string;
  timeZone: string;
  notes: string;
  archived: boolean;
  members: ReadonlyArray<readonly [UserKey, Role]>;
}> = [
  {
    code: "BRM-26",
    name: "Brennock Moor former works",
    client: "Ellory Land Trust",
    areaDescription:
      "Brownfield site of a demolished works: old buried services and foundations expected. Grid of north–south lines at 1 m spacing over the former yard.",
    timeZone: "Europe/London",
    notes: "Residual anomalies are no clearance for digging; buried services and any ordnance are for licensed specialists under local codes.",
    archived: false,
    members: [
      ["lead", "lead"],
      ["processor", "processor"],
      ["crew", "crew"],
    ],
  },
  {
    code: "SDK-26",
    name: "Saltwick Dyke traverse",
    client: "Marren Hill Minerals",
    areaDescription: "Mineral exploration: east–west traverses across a suspected mafic dyke, 10 m station spacing.",
    timeZone: "Australia/Adelaide",
    notes: "",
    archived: false,
    members: [
      ["lead", "lead"],
      ["processor", "processor"],
      ["reviewer", "reviewer"],
    ],
  },
  {
    code: "OLD-25",
    name: "Fenwold test grid",
    client: "Copperwren Geophysics",
    areaDescription: "Instrument test grid used for the previous season.",
    timeZone: "Europe/London",
    notes: "Archived after the season closed.",
    archived: true,
    members: [["lead", "lead"]],
  },
];

export interface SeedResult {
  users: number;
  surveys: number;
  members: number;
  replaced: number;
  /** True when the demo was already there and `replace` was not asked for. */
  kept: boolean;
}

export async function seed(knex: Knex, opts: { replace?: boolean } = {}): Promise<SeedResult> {
  if (!opts.replace) {
    const present = await knex("surveys").whereIn("code", DEMO_SURVEYS.map((s) => s.code)).count({ n: "*" }).first();
    if (Number(present?.n ?? 0) > 0) return { users: 0, surveys: 0, members: 0, replaced: 0, kept: true };
  }
  const hashes = await Promise.all(DEMO_USERS.map((u) => hashPassword(u.password)));
  return knex.transaction(async (trx) => {
    const now = new Date().toISOString();
    const codes = DEMO_SURVEYS.map((s) => s.code);
    const emails = DEMO_USERS.map((u) => u.email);
    const replacedSurveys = await trx("surveys").whereIn("code", codes).delete();
    const replacedUsers = await trx("users").whereIn("email", emails).delete();

    const ids = {} as Record<UserKey, string>;
    for (const [i, u] of DEMO_USERS.entries()) {
      ids[u.key] = randomUUID();
      await trx("users").insert({
        id: ids[u.key],
        email: u.email,
        name: u.name,
        password_hash: hashes[i],
        is_admin: u.isAdmin ? 1 : 0,
        created_at: now,
        updated_at: now,
      });
    }
    let members = 0;
    for (const s of DEMO_SURVEYS) {
      const id = randomUUID();
      await trx("surveys").insert({
        id,
        code: s.code,
        name: s.name,
        client: s.client,
        area_description: s.areaDescription,
        time_zone: s.timeZone,
        notes: s.notes,
        archived_at: s.archived ? now : null,
        created_by: ids.admin,
        created_at: now,
        updated_at: now,
      });
      for (const [key, role] of s.members) {
        await trx("survey_members").insert({ survey_id: id, user_id: ids[key], role, joined_at: now });
        members += 1;
      }
    }
    return { users: DEMO_USERS.length, surveys: DEMO_SURVEYS.length, members, replaced: replacedSurveys + replacedUsers, kept: false };
  });
}
