/** The demo seed (contract scenario) and the db script as users run it. */
import { execFile } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { promisify } from "node:util";
import { describe, expect, it } from "vitest";
import { setupTestDatabase, TEST_ON_POSTGRES } from "../support/test-db";

const testDb = setupTestDatabase();
const { dir } = testDb;

const { getDb } = await import("@/src/server/db/client");
const { seed } = await import("@/seeds/01_demo");
const accounts = await import("@/src/server/auth/accounts");
const surveys = await import("@/src/server/surveys/service");

const DEMO = [
  ["admin@copperwren.example", "fieldtide-admin", "Ada Ferrow", true, []],
  ["lead@copperwren.example", "fieldtide-lead", "Lewin Marsh", false, [["BRM-26", "lead"], ["OLD-25", "lead"], ["SDK-26", "lead"]]],
  ["processor@copperwren.example", "fieldtide-processor", "Priya Lantern", false, [["BRM-26", "processor"], ["SDK-26", "processor"]]],
  ["crew@copperwren.example", "fieldtide-crew", "Tomas Quill", false, [["BRM-26", "crew"]]],
  ["reviewer@copperwren.example", "fieldtide-reviewer", "Rhea Okonjo", false, [["SDK-26", "reviewer"]]],
] as const;

describe("demo seed", () => {
  it("creates exactly the contract's demo scenario; re-running keeps it, `replace` rebuilds it cleanly", async () => {
    expect((await seed(getDb())).kept).toBe(false);
    const firstIds = (await getDb()("users").select("id")).map((r) => r.id);
    expect((await seed(getDb())).kept).toBe(true);
    expect((await getDb()("users").select("id")).map((r) => r.id)).toEqual(firstIds);
    await seed(getDb(), { replace: true });
    expect(await getDb()("users").count({ n: "*" }).first()).toEqual({ n: 5 });
    expect(await getDb()("surveys").count({ n: "*" }).first()).toEqual({ n: 3 });
    expect((await getDb()("users").select("id")).map((r) => r.id)).not.toEqual(firstIds);

    for (const [email, password, name, isAdmin, memberships] of DEMO) {
      const actor = await accounts.authenticate(email, password);
      expect(actor).toMatchObject({ email, name, isAdmin });
      const rows = await getDb()("survey_members").join("surveys", "surveys.id", "survey_members.survey_id")
        .where("survey_members.user_id", actor!.userId).select("surveys.code", "survey_members.role").orderBy("surveys.code");
      expect(rows.map((r) => [r.code, r.role])).toEqual(memberships);
    }
    const hashes = await getDb()("users").pluck("password_hash");
    expect(hashes.every((h: string) => h.startsWith("$argon2id$"))).toBe(true);

    const byCode = Object.fromEntries((await getDb()("surveys").select()).map((s) => [s.code, s]));
    expect(byCode["BRM-26"]).toMatchObject({ name: "Brennock Moor former works", client: "Ellory Land Trust", time_zone: "Europe/London", archived_at: null });
    expect(byCode["SDK-26"]).toMatchObject({ name: "Saltwick Dyke traverse", client: "Marren Hill Minerals", time_zone: "Australia/Adelaide", archived_at: null });
    expect(byCode["OLD-25"].name).toBe("Fenwold test grid");
    expect(byCode["OLD-25"].archived_at).not.toBeNull();

    const lead = await accounts.authenticate("lead@copperwren.example", "fieldtide-lead");
    expect((await surveys.listSurveys(lead!)).map((s) => s.code)).toEqual(["BRM-26", "SDK-26"]);
  });
});

describe("scripts/db.ts", () => {
  const run = promisify(execFile);
  const tsx = path.resolve("node_modules/.bin/tsx");

  it("reset deletes, migrates and seeds, and says so; a bad command is refused", async () => {
    const file = path.join(dir, "script.sqlite");
    const env = { ...process.env, DATABASE_FILE: file, DATABASE_URL: "" }; // the SQLite file, whichever engine the suite runs on
    fs.writeFileSync(file, "not a database");
    const { stdout } = await run(tsx, ["scripts/db.ts", "reset"], { env });
    expect(stdout).toContain(`deleted ${file}`);
    expect(stdout).toContain("applied migrations: 0001_foundation");
    expect(stdout).toMatch(/seeded demo data: 5 users, 3 surveys, 7 memberships/);
    expect(stdout).toMatch(/0 pending/);
    const again = await run(tsx, ["scripts/db.ts", "migrate"], { env });
    expect(again.stdout).toContain("already up to date");
    const reseed = await run(tsx, ["scripts/db.ts", "seed"], { env });
    expect(reseed.stdout).toContain("demo data already present: left as it is");
    await expect(run(tsx, ["scripts/db.ts", "explode"], { env })).rejects.toMatchObject({ code: 2 });
  }, 60_000);

  it.runIf(TEST_ON_POSTGRES)("on PostgreSQL, reset drops every table of DATABASE_URL's schema, then migrates and seeds", async () => {
    const env = { ...process.env, DATABASE_URL: testDb.url! };
    const { stdout } = await run(tsx, ["scripts/db.ts", "reset"], { env });
    expect(stdout).toMatch(/dropped every table of postgres:\/\//);
    expect(stdout).toContain("applied migrations: 0001_foundation");
    expect(stdout).toMatch(/seeded demo data: 5 users, 3 surveys, 7 memberships/);
    expect(Number((await getDb()("surveys").count({ n: "*" }).first())?.n)).toBe(3);
  }, 60_000);
});
