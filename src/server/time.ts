/** Stored times are ISO 8601 UTC strings (see migrations/0001_foundation.ts). */
export function nowIso(): string {
  return new Date().toISOString();
}

export function isoAfterMs(durationMs: number, fromMs = Date.now()): string {
  return new Date(fromMs + durationMs).toISOString();
}

export const HOUR_MS = 60 * 60 * 1000;
