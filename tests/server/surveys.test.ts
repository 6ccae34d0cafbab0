import { describe, expect, it } from "vitest";
import { INSERTION_ORDER, setupTestDatabase } from "../support/test-db";

setupTestDatabase();

const surveys = await import("@/src/server/surveys/service");
const { SurveyInputSchema } = await import("@/src/server/surveys/schema");
const { ConflictError, NotFoundError, ValidationError } = await import("@/src/server/errors");
const { getDb } = await import("@/src/server/db/client");
const { makeUser, makeSurvey, addMember, countRows } = await import("../support/fixtures");

const input = (over: Record<string, unknown> = {}) => ({
  name: "Harlow Fen grid",
  code: "hfg-26",
  client: "An Invented Client",
  areaDescription: "Two hectares of pasture.",
  timeZone: "Pacific/Auckland",
  notes: "",
  ...over,
});

function fieldErrorsOf(err: unknown): Record<string, string[]> {
  expect(err).toBeInstanceOf(ValidationError);
  return (err as InstanceType<typeof ValidationError>).fieldErrors;
}

describe("survey input", () => {
  it("accepts IANA zones and rejects made-up ones", () => {
    expect(SurveyInputSchema.safeParse(input({ timeZone: "Australia/Adelaide" })).success).toBe(true);
    expect(SurveyInputSchema.safeParse(input({ timeZone: "UTC" })).success).toBe(true);
    expect(SurveyInputSchema.safeParse(input({ timeZone: "Mars/Olympus_Mons" })).success).toBe(false);
    expect(SurveyInputSchema.safeParse(input({ timeZone: "../etc" })).success).toBe(false);
  });

  it("codes: upper-cased, 2–20 of A–Z 0–9 -, not starting with a dash", () => {
    expect(SurveyInputSchema.parse(input()).code).toBe("HFG-26");
    for (const bad of ["-AB", "A", "AB_1", "A".repeat(21), "ÄB"]) expect(SurveyInputSchema.safeParse(input({ code: bad })).success).toBe(false);
  });
});

describe("create, edit, archive", () => {
  it("admin creates; the survey gets an audit event; the code is unique", async () => {
    const admin = await makeUser({ isAdmin: true });
    const s = await surveys.createSurvey(admin, input());
    expect(s).toMatchObject({ code: "HFG-26", name: "Harlow Fen grid", timeZone: "Pacific/Auckland", archivedAt: null, myRole: "admin" });
    expect(s.createdAt).toMatch(/^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d\.\d{3}Z$/);
    const audit = await getDb()("audit_events").where({ survey_id: s.id });
    expect(audit.map((a) => a.action)).toEqual(["survey.create"]);
    expect(JSON.parse(audit[0].details)).toMatchObject({ code: "HFG-26" });

    const rows = await countRows("surveys");
    const dup = await surveys.createSurvey(admin, input({ name: "Another" })).catch((e: unknown) => e);
    expect(fieldErrorsOf(dup)).toEqual({ code: ["This code is taken."] });
    expect(await countRows("surveys")).toBe(rows);
  });

  it("validation errors name every bad field and write nothing", async () => {
    const admin = await makeUser({ isAdmin: true });
    const before = [await countRows("surveys"), await countRows("audit_events")];
    const err = await surveys.createSurvey(admin, { name: "", code: "x", timeZone: "Nowhere/Else", notes: "n".repeat(5001), client: 7 }).catch((e: unknown) => e);
    expect(Object.keys(fieldErrorsOf(err)).sort()).toEqual(["client", "code", "name", "notes", "timeZone"]);
    expect(await surveys.createSurvey(admin, "not an object").catch((e: unknown) => e)).toBeInstanceOf(ValidationError);
    expect([await countRows("surveys"), await countRows("audit_events")]).toEqual(before);
  });

  it("lead edits (audited with changed fields); archived surveys are hidden by default and locked for edits", async () => {
    const surveyId = await makeSurvey({ code: "EDIT-1" });
    const lead = await makeUser();
    await addMember(surveyId, lead.userId, "lead");
    const updated = await surveys.updateSurvey(lead, surveyId, input({ code: "EDIT-1", name: "New name" }));
    expect(updated).toMatchObject({ name: "New name", myRole: "lead" });
    const ev = await getDb()("audit_events").where({ survey_id: surveyId, action: "survey.update" }).first();
    expect(JSON.parse(ev.details).changed).toEqual(expect.arrayContaining(["name", "time_zone"]));

    const badEdit = await surveys.updateSurvey(lead, surveyId, input({ code: "EDIT-1", name: "" })).catch((e: unknown) => e);
    expect(fieldErrorsOf(badEdit)).toHaveProperty("name");
    expect((await surveys.getSurvey(lead, surveyId)).name).toBe("New name");

    const archived = await surveys.archiveSurvey(lead, surveyId);
    expect(archived.archivedAt).not.toBeNull();
    expect((await surveys.listSurveys(lead)).map((s) => s.id)).not.toContain(surveyId);
    expect((await surveys.listSurveys(lead, { includeArchived: true })).map((s) => s.id)).toContain(surveyId);
    await expect(surveys.updateSurvey(lead, surveyId, input({ code: "EDIT-1" }))).rejects.toBeInstanceOf(ConflictError);
    expect((await surveys.restoreSurvey(lead, surveyId)).archivedAt).toBeNull();
    const actions = (await getDb()("audit_events").where({ survey_id: surveyId }).orderByRaw(INSERTION_ORDER)).map((a) => a.action);
    expect(actions).toEqual(["survey.update", "survey.archive", "survey.restore"]);
  });
});

describe("members", () => {
  it("lists members, changes roles, removes, and keeps at least one lead", async () => {
    const surveyId = await makeSurvey();
    const lead = await makeUser({ name: "A Lead" });
    const crew = await makeUser({ name: "B Crew" });
    await addMember(surveyId, lead.userId, "lead");
    await addMember(surveyId, crew.userId, "crew");
    expect((await surveys.listMembers(lead, surveyId)).map((m) => [m.name, m.role])).toEqual([["A Lead", "lead"], ["B Crew", "crew"]]);

    await expect(surveys.changeMemberRole(lead, surveyId, lead.userId, "crew")).rejects.toBeInstanceOf(ConflictError);
    await expect(surveys.removeMember(lead, surveyId, lead.userId)).rejects.toBeInstanceOf(ConflictError);
    const bad = await surveys.changeMemberRole(lead, surveyId, crew.userId, "captain").catch((e: unknown) => e);
    expect(fieldErrorsOf(bad)).toHaveProperty("role");
    await expect(surveys.changeMemberRole(lead, surveyId, "no-such-user", "crew")).rejects.toBeInstanceOf(NotFoundError);

    expect(await surveys.changeMemberRole(lead, surveyId, crew.userId, "lead")).toMatchObject({ role: "lead" });
    await surveys.changeMemberRole(lead, surveyId, lead.userId, "reviewer"); // another lead exists now
    await surveys.removeMember(crew, surveyId, lead.userId);
    expect((await surveys.listMembers(crew, surveyId)).map((m) => m.userId)).toEqual([crew.userId]);
    await expect(surveys.getSurvey(lead, surveyId)).rejects.toBeInstanceOf(NotFoundError);
    const actions = (await getDb()("audit_events").where({ survey_id: surveyId }).orderByRaw(INSERTION_ORDER)).map((a) => a.action);
    expect(actions).toEqual(["member.role_change", "member.role_change", "member.remove"]);
  });
});
