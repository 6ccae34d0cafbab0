import "server-only";
/** Each user's opt-outs from review mail; only the user changes their own. */
import "@/src/lib/zod-jitless";
import { z } from "zod";
import type { Actor } from "../auth/actor";
import { getDb } from "../db/client";
import { parseInput } from "../errors";
import { nowIso } from "../time";
import { NOTIFICATION_KINDS, type NotificationKind } from "./kinds";

export type NotificationPreferences = Record<NotificationKind, boolean>;

export async function getNotificationPreferences(actor: Actor): Promise<NotificationPreferences> {
  const off = new Set((await getDb()("notification_opt_outs").where({ user_id: actor.userId }).pluck("kind")) as string[]);
  return Object.fromEntries(NOTIFICATION_KINDS.map((k) => [k, !off.has(k)])) as NotificationPreferences;
}

const PreferencesSchema = z.object({ enabled: z.array(z.enum(NOTIFICATION_KINDS, { message: "Unknown kind of mail." })).max(NOTIFICATION_KINDS.length) });

/** `enabled`: the kinds the user wants; every other kind is turned off. */
export async function saveNotificationPreferences(actor: Actor, input: unknown): Promise<NotificationPreferences> {
  const { enabled } = parseInput(PreferencesSchema, input);
  const off = NOTIFICATION_KINDS.filter((k) => !enabled.includes(k));
  await getDb().transaction(async (trx) => {
    await trx("notification_opt_outs").where({ user_id: actor.userId }).delete();
    if (off.length > 0) await trx("notification_opt_outs").insert(off.map((kind) => ({ user_id: actor.userId, kind, created_at: nowIso() })));
  });
  return getNotificationPreferences(actor);
}

/** Of these user ids, those who have not turned `kind` off. */
export async function usersWanting(userIds: string[], kind: NotificationKind): Promise<string[]> {
  if (userIds.length === 0) return [];
  const off = new Set((await getDb()("notification_opt_outs").whereIn("user_id", userIds).andWhere({ kind }).pluck("user_id")) as string[]);
  return userIds.filter((id) => !off.has(id));
}
