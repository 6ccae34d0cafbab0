/**
 * Demo scenario (all invented): the company "Copperwren Geophysics", five users, two active
 * surveys and one archived. Re-running replaces the demo rows cleanly: demo surveys (by code)
 * and demo users (by e-mail) are deleted with everything that hangs off them, then re-inserted.
 * Passwords are hashed here, at seed time.
 */
import { randomUUID } from "node:crypto";
import type { Knex } from "knex";
import { hashPassword } from "../src/server/auth/password";

type Role = "crew" | "processor" | "reviewer" | "lead";

export const DEMO_USERS = [
  { key: "admin", email: "admin@copperwren.example", password: "fieldtide-admin", name: "Ada Ferrow", isAdmin: true },
  { key: "lead", email: "lead@copperwren.example", password: "fieldtide-lead", name: "Lewin Marsh", isAdmin: false },
  { key: "processor", email: "processor@copperwren.example", password: "fieldtide-processor", name: "Priya Lantern", isAdmin: false },
  { key: "crew", email: "crew@copperwren.example", password: "fieldtide-crew", name: "Tomas Quill", isAdmin: false },
  { key: "reviewer", email: "reviewer@copperwren.example", password: "fieldtide-reviewer", name: "Rhea Okonjo", isAdmin: false },
] as const;

type UserKey = (typeof DEMO_USERS)[number]["key"];

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

export async function seed(knex: Knex): Promise<{ users: number; surveys: number; members: number; replaced: number }> {
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
    return { users: DEMO_USERS.length, surveys: DEMO_SURVEYS.length, members, replaced: replacedSurveys + replacedUsers };
  });
}
