/** Users and surveys made directly in the test database (no services, no permission checks). */
import { randomUUID } from "node:crypto";
import { getDb } from "@/src/server/db/client";
import { hashPassword } from "@/src/server/auth/password";
import type { Actor } from "@/src/server/auth/actor";
import type { SurveyRole } from "@/src/server/authz/roles";

let counter = 0;

export async function makeUser(opts: { isAdmin?: boolean; password?: string; email?: string; name?: string } = {}): Promise<Actor & { password: string }> {
  counter += 1;
  const id = randomUUID();
  const password = opts.password ?? `password-${counter}-long-enough`;
  const email = opts.email ?? `user${counter}-${id.slice(0, 6)}@test.example`;
  const name = opts.name ?? `Test User ${counter}`;
  const now = new Date().toISOString();
  await getDb()("users").insert({
    id,
    email,
    name,
    password_hash: await hashPassword(password),
    is_admin: opts.isAdmin ? 1 : 0,
    created_at: now,
    updated_at: now,
  });
  return { userId: id, email, name, isAdmin: Boolean(opts.isAdmin), password };
}

export async function makeSurvey(opts: { code?: string; archived?: boolean } = {}): Promise<string> {
  counter += 1;
  const id = randomUUID();
  const now = new Date().toISOString();
  await getDb()("surveys").insert({
    id,
    code: opts.code ?? `T${counter}-${id.slice(0, 4).toUpperCase()}`,
    name: `Test survey ${counter}`,
    client: "",
    area_description: "",
    time_zone: "UTC",
    notes: "",
    archived_at: opts.archived ? now : null,
    created_by: null,
    created_at: now,
    updated_at: now,
  });
  return id;
}

export async function addMember(surveyId: string, userId: string, role: SurveyRole): Promise<void> {
  await getDb()("survey_members").insert({ survey_id: surveyId, user_id: userId, role, joined_at: new Date().toISOString() });
}

export async function countRows(table: string): Promise<number> {
  const row = await getDb()(table).count<{ n: number }[]>({ n: "*" });
  return Number(row[0].n);
}
