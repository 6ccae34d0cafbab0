import "server-only";
/**
 * Import profiles: a survey's named column mappings, matched to new files by their normalised
 * header row (./header-signature.ts) and applied when the uploader gives no mapping of their own.
 */
import { randomUUID } from "node:crypto";
import type { Knex } from "knex";
import "@/src/lib/zod-jitless";
import { z } from "zod";
import type { Delimiter } from "@/src/core/logs";
import type { Actor } from "../auth/actor";
import { assertSurveyPermission } from "../authz/permissions";
import { getDb } from "../db/client";
import { parseInput } from "../errors";
import { nowIso } from "../time";

export interface ImportProfile {
  id: string;
  name: string;
  headerSignature: string;
  delimiter: Delimiter | null;
  mapping: Record<string, string>;
  updatedAt: string;
}

type ProfileRow = { id: string; survey_id: string; name: string; header_signature: string; delimiter: string | null; mapping: string; updated_at: string };

function toProfile(r: ProfileRow): ImportProfile {
  return { id: r.id, name: r.name, headerSignature: r.header_signature, delimiter: (r.delimiter as Delimiter | null) ?? null, mapping: JSON.parse(r.mapping), updatedAt: r.updated_at };
}

/** Newest profile of the survey whose header signature equals `signature`. */
export async function findProfileForHeader(db: Knex | Knex.Transaction, surveyId: string, signature: string): Promise<ImportProfile | null> {
  const row = await db<ProfileRow>("import_profiles").where({ survey_id: surveyId, header_signature: signature }).orderBy("updated_at", "desc").first();
  return row ? toProfile(row) : null;
}

export async function listImportProfiles(actor: Actor, surveyId: string): Promise<ImportProfile[]> {
  await assertSurveyPermission(actor, surveyId, "logs.read");
  const rows = await getDb()<ProfileRow>("import_profiles").where({ survey_id: surveyId }).orderBy("name");
  return rows.map(toProfile);
}

const ProfileNameSchema = z.object({ name: z.string().trim().min(1, "Name the profile.").max(80, "At most 80 characters.") });

/** Saves (or replaces, by name) a profile inside the import's transaction. */
export async function saveProfileInTransaction(
  trx: Knex.Transaction,
  actor: Actor,
  surveyId: string,
  input: { name: string; headerSignature: string; delimiter: Delimiter | null; mapping: Record<string, string> },
): Promise<ImportProfile> {
  const { name } = parseInput(ProfileNameSchema, { name: input.name });
  const now = nowIso();
  const existing = await trx<ProfileRow>("import_profiles").where({ survey_id: surveyId, name }).first();
  const cols = { header_signature: input.headerSignature, delimiter: input.delimiter, mapping: JSON.stringify(input.mapping), updated_at: now };
  if (existing) {
    await trx("import_profiles").where({ id: existing.id }).update(cols);
    return toProfile({ ...existing, ...cols });
  }
  const id = randomUUID();
  await trx("import_profiles").insert({ id, survey_id: surveyId, name, ...cols, created_by: actor.userId, created_at: now });
  return toProfile({ id, survey_id: surveyId, name, ...cols });
}
