/**
 * The full parameter object of a correction run, built from the survey's processing settings and
 * the day's pairing, stored with the run and handed to the core unchanged. Pure.
 */
import type { BasePosition, DatumChoice, InterpolationMethod } from "@/src/core/correction";
import type { DayPairing } from "../days/service";
import type { ProcessingSettings } from "../processing/schema";

export interface RunParameters {
  day: string;
  timeZone: string;
  datum: DatumChoice;
  method: InterpolationMethod;
  /** Longest base gap bridged, s (looping bridges any gap). */
  maxGapS: number;
  /** Rover − base offset subtracted from raw readings, nT (0 unless the setting applies it). */
  instrumentOffsetNt: number;
  referenceModel: "igrf" | "wmm" | null;
  /** From the base log's upload details; null = median position of the base readings, if any. */
  basePosition: BasePosition | null;
  pairing: {
    method: "base" | "loop";
    baseLogId: number | null;
    fallbackBaseLogId: number | null;
    roverLogIds: number[];
    loopStation: string;
  };
  settingsRevision: number;
  settings: ProcessingSettings;
}

export function datumChoiceOf(s: ProcessingSettings): DatumChoice {
  if (s.datumKind === "value") return s.datumValueNt!;
  return s.datumKind;
}

export function buildRunParameters(
  day: string,
  timeZone: string,
  settings: ProcessingSettings,
  settingsRevision: number,
  pairing: DayPairing,
): RunParameters {
  if (pairing.method === "none") throw new RangeError(pairing.notes[pairing.notes.length - 1] ?? "No base log for this day.");
  const b = pairing.baseLog;
  const basePosition =
    b && b.baseLatitudeDeg !== null && b.baseLongitudeDeg !== null
      ? { latDeg: b.baseLatitudeDeg, lonDeg: b.baseLongitudeDeg, heightM: b.baseHeightM ?? 0 }
      : null;
  return {
    day,
    timeZone,
    datum: datumChoiceOf(settings),
    method: settings.interpolation,
    maxGapS: settings.maxBaseGapS,
    instrumentOffsetNt: settings.applyInstrumentOffset ? settings.instrumentOffsetNt : 0,
    referenceModel: settings.referenceModel === "none" ? null : settings.referenceModel,
    basePosition,
    pairing: {
      method: pairing.method,
      baseLogId: pairing.method === "base" ? (b?.id ?? null) : null,
      fallbackBaseLogId: pairing.method === "base" ? (pairing.fallbackBaseLog?.id ?? null) : null,
      roverLogIds: pairing.roverLogs.map((l) => l.id),
      loopStation: settings.loopStation,
    },
    settingsRevision,
    settings,
  };
}

/** Human-readable differences between two runs' parameters (for the comparison). */
export function parameterDifferences(a: RunParameters, b: RunParameters): { name: string; from: unknown; to: unknown }[] {
  const pick = (p: RunParameters) => ({
    datum: p.datum,
    method: p.method,
    maxGapS: p.maxGapS,
    instrumentOffsetNt: p.instrumentOffsetNt,
    referenceModel: p.referenceModel,
    baseLogId: p.pairing.baseLogId,
    fallbackBaseLogId: p.pairing.fallbackBaseLogId,
    roverLogIds: p.pairing.roverLogIds,
    pairingMethod: p.pairing.method,
  });
  const x = pick(a);
  const y = pick(b);
  return (Object.keys(x) as (keyof typeof x)[])
    .filter((k) => JSON.stringify(x[k]) !== JSON.stringify(y[k]))
    .map((k) => ({ name: k, from: x[k], to: y[k] }));
}
