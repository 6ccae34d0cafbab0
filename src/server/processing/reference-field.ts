import "server-only";
/**
 * The main field of a reference model at one point and instant, for any signed-in user (the
 * model is public; no survey data is involved). Inputs zod-parsed; a date outside the model's
 * validity or a missing coefficient table is a clear 400.
 */
import "@/src/lib/zod-jitless";
import { z } from "zod";
import { OutsideModelValidityError, synthesizeField, type FieldVector } from "@/src/core/reference-field";
import { parseTimestamp } from "@/src/core/time";
import { loadReferenceModel, ReferenceModelFileError } from "@/src/lib/reference-model";
import type { Actor } from "../auth/actor";
import { ValidationError, parseInput } from "../errors";

const num = (what: string, min: number, max: number) =>
  z.coerce.number({ message: `${what} must be a number.` }).min(min, `${what} must be at least ${min}.`).max(max, `${what} must be at most ${max}.`);

export const ReferenceFieldQuerySchema = z.object({
  lat: num("lat", -90, 90),
  lon: num("lon", -180, 360),
  heightM: z.preprocess((v) => (v === "" || v === undefined ? 0 : v), num("heightM", -1000, 1_000_000)),
  date: z.string({ message: "date is required (ISO 8601, e.g. 2026-05-04 or 2026-05-04T10:30:00Z)." }).min(1, "date is required."),
  model: z.preprocess((v) => (v === "" || v === undefined ? "igrf" : v), z.enum(["igrf", "wmm"], { message: "model must be igrf or wmm." })),
});

export interface ReferenceFieldAnswer {
  model: { name: string; version: string };
  point: { latDeg: number; lonDeg: number; heightM: number; timeUtc: string };
  field: FieldVector;
}

function parseDate(text: string): number {
  const iso = /^\d{4}-\d{2}-\d{2}$/.test(text) ? `${text}T00:00:00Z` : text;
  try {
    const ms = parseTimestamp(iso, { timeZone: "UTC" });
    if (Number.isFinite(ms)) return ms;
  } catch {
    /* reported below */
  }
  throw new ValidationError({ date: ["date must be ISO 8601, e.g. 2026-05-04 or 2026-05-04T10:30:00Z."] });
}

export function referenceFieldAt(actor: Actor, query: unknown): ReferenceFieldAnswer {
  void actor; // signed in is enough
  const q = parseInput(ReferenceFieldQuerySchema, query);
  const timeMs = parseDate(q.date);
  let model;
  try {
    model = loadReferenceModel(q.model);
  } catch (err) {
    if (err instanceof ReferenceModelFileError) throw new ValidationError({ model: [err.message] }, "This reference model is not available on this server.");
    throw err;
  }
  try {
    const field = synthesizeField(model, { latitudeDeg: q.lat, longitudeDeg: q.lon, heightM: q.heightM, timeMs });
    return { model: { name: model.name, version: model.version }, point: { latDeg: q.lat, lonDeg: q.lon, heightM: q.heightM, timeUtc: new Date(timeMs).toISOString() }, field };
  } catch (err) {
    if (err instanceof OutsideModelValidityError) throw new ValidationError({ date: [err.message] });
    if (err instanceof RangeError) throw new ValidationError({}, err.message);
    throw err;
  }
}
