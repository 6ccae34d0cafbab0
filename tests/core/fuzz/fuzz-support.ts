/**
 * Shared pieces of the parser fuzz tests: a bounded property runner (run count and wall time
 * capped, so a loaded 2-core machine still finishes), a per-call clock that turns a slow input
 * into a failure instead of a hang, and text damage (truncate, delete/duplicate/swap lines,
 * flip characters, inject NUL/BOM/CR/quotes) described by data so fast-check can shrink it.
 */
import fc from "fast-check";

export interface FuzzBudget {
  /** Runs asked for. */
  numRuns: number;
  /** Stop starting new runs after this long (the runs done still count). */
  timeLimitMs: number;
  /**
   * Fewest runs of every property: when the time limit stops it earlier (a loaded machine), the
   * missing runs follow without a limit, so the outcome never depends on the clock.
   */
  minRuns?: number;
}

/** Run counts per property, printed by the fuzz files when FUZZ_REPORT=1. */
export const runLog: { name: string; numRuns: number; interrupted: boolean }[] = [];

/** fc.check within a budget; throws fast-check's report on a counterexample. */
export function runProperty<Ts>(name: string, property: fc.IProperty<Ts>, budget: FuzzBudget, extra: fc.Parameters<Ts> = {}): number {
  const details = fc.check(property, {
    numRuns: budget.numRuns,
    interruptAfterTimeLimit: budget.timeLimitMs,
    ...extra,
  });
  if (details.failed) throw new Error(fc.defaultReportMessage(details) ?? `property ${name} failed`);
  let runs = details.numRuns;
  const minRuns = budget.minRuns ?? Math.min(20, budget.numRuns);
  if (runs < minRuns) {
    // the time limit cut it short: the missing runs follow, without a limit
    const more = fc.check(property, { ...extra, numRuns: minRuns - runs });
    if (more.failed) throw new Error(fc.defaultReportMessage(more) ?? `property ${name} failed`);
    runs += more.numRuns;
  }
  runLog.push({ name, numRuns: runs, interrupted: details.interrupted });
  return runs;
}

export function printRunLog(file: string): void {
  if (process.env.FUZZ_REPORT !== "1") return;
  for (const r of runLog) console.log(`[fuzz] ${file} · ${r.name}: ${r.numRuns} runs${r.interrupted ? " (time limit reached)" : ""}`);
}

/** Longest a single parse of a fuzz input may take (inputs are at most a few kB): far above a linear parse, far below a hang. */
export const MAX_CALL_MS = 1000;

/** Calls `fn`, and fails when the single call took longer than `maxMs`. */
export function withinTime<T>(fn: () => T, maxMs = MAX_CALL_MS): T {
  const t0 = performance.now();
  try {
    return fn();
  } finally {
    const ms = performance.now() - t0;
    if (ms > maxMs) throw new Error(`one call took ${ms.toFixed(0)} ms (limit ${maxMs} ms)`);
  }
}

/** What a parser did with one input: a value, or an error of a named class. */
export type Outcome<T> = { ok: true; value: T } | { ok: false; error: unknown };

export function outcomeOf<T>(fn: () => T): Outcome<T> {
  try {
    return { ok: true, value: fn() };
  } catch (error) {
    return { ok: false, error };
  }
}

/** Characters a damage step may write: structure of delimited text, number parts, and troublemakers. */
export const NASTY_PIECES = [
  "\u0000", "\uFEFF", "\r", "\n", "\r\n", '"', "'", ",", ";", "\t", "|", " ", "#", "-", "+", ".", "e", "E", "x",
  "0", "1", "9", "T", "Z", ":", "/", "NaN", "Infinity", "1e999", "\u00e9", "\u20ac", "\ud83d\ude00", "\ud800", "\\",
  "9".repeat(40), " ".repeat(64),
] as const;

export type Damage =
  | { op: "truncate"; at: number }
  | { op: "deleteLine"; line: number }
  | { op: "duplicateLine"; line: number }
  | { op: "swapLines"; a: number; b: number }
  | { op: "flip"; at: number; piece: string }
  | { op: "inject"; at: number; piece: string };

const piece = fc.oneof(fc.constantFrom(...NASTY_PIECES), fc.string({ maxLength: 3, unit: "binary" }));
/** Positions are drawn as fractions of the current length, so a step always lands inside the text. */
const fraction = fc.double({ min: 0, max: 1, maxExcluded: true, noNaN: true });

export const damageArb: fc.Arbitrary<Damage> = fc.oneof(
  fraction.map((at) => ({ op: "truncate", at }) as Damage),
  fraction.map((line) => ({ op: "deleteLine", line }) as Damage),
  fraction.map((line) => ({ op: "duplicateLine", line }) as Damage),
  fc.tuple(fraction, fraction).map(([a, b]) => ({ op: "swapLines", a, b }) as Damage),
  fc.tuple(fraction, piece).map(([at, p]) => ({ op: "flip", at, piece: p }) as Damage),
  fc.tuple(fraction, piece).map(([at, p]) => ({ op: "inject", at, piece: p }) as Damage),
);

export const damagesArb = fc.array(damageArb, { minLength: 1, maxLength: 4 });

/** Applies one damage step; lines are split and joined on "\n" (a CR stays with its line). */
export function applyDamage(text: string, d: Damage): string {
  const pos = (f: number, n: number) => Math.min(n - 1, Math.floor(f * n));
  switch (d.op) {
    case "truncate":
      return text.slice(0, Math.floor(d.at * text.length));
    case "flip": {
      if (text.length === 0) return d.piece;
      const i = pos(d.at, text.length);
      return text.slice(0, i) + d.piece + text.slice(i + 1);
    }
    case "inject": {
      const i = Math.floor(d.at * (text.length + 1));
      return text.slice(0, i) + d.piece + text.slice(i);
    }
    default: {
      const lines = text.split("\n");
      if (d.op === "deleteLine") lines.splice(pos(d.line, lines.length), 1);
      else if (d.op === "duplicateLine") {
        const i = pos(d.line, lines.length);
        lines.splice(i, 0, lines[i]);
      } else {
        const a = pos(d.a, lines.length), b = pos(d.b, lines.length);
        [lines[a], lines[b]] = [lines[b], lines[a]];
      }
      return lines.join("\n");
    }
  }
}

export function applyDamages(text: string, damages: readonly Damage[]): string {
  return damages.reduce(applyDamage, text);
}

/** Cut points (sorted, within the text) from random numbers: any split of a text into chunks. */
export const splitArb = fc.array(fraction, { maxLength: 12 });

const isLowSurrogate = (c: number) => c >= 0xdc00 && c <= 0xdfff;
const isHighSurrogate = (c: number) => c >= 0xd800 && c <= 0xdbff;

/**
 * Splits a string into chunks at code-point boundaries (a cut inside a surrogate pair moves one
 * place on); `{ anyCodeUnit: true }` cuts anywhere, even between the halves of a pair.
 */
export function splitText(text: string, fractions: readonly number[], opts: { anyCodeUnit?: boolean } = {}): string[] {
  const keepPairs = (c: number) =>
    !opts.anyCodeUnit && c > 0 && c < text.length && isHighSurrogate(text.charCodeAt(c - 1)) && isLowSurrogate(text.charCodeAt(c)) ? c + 1 : c;
  const cuts = fractions.map((f) => keepPairs(Math.floor(f * (text.length + 1)))).sort((a, b) => a - b);
  const chunks: string[] = [];
  let at = 0;
  for (const c of cuts) {
    chunks.push(text.slice(at, c));
    at = c;
  }
  chunks.push(text.slice(at));
  return chunks;
}

/** Splits bytes anywhere (inside a UTF-8 sequence too), as a network stream may deliver them. */
export function splitBytes(bytes: Uint8Array, fractions: readonly number[]): Uint8Array[] {
  const cuts = fractions.map((f) => Math.floor(f * (bytes.length + 1))).sort((a, b) => a - b);
  const chunks: Uint8Array[] = [];
  let at = 0;
  for (const c of cuts) {
    chunks.push(bytes.subarray(at, c));
    at = c;
  }
  chunks.push(bytes.subarray(at));
  return chunks;
}

/** Random bytes read the two ways a server meets them: UTF-8 (with replacement) and Windows-1252/Latin-1. */
export const bytesAsTextArb = fc
  .tuple(fc.uint8Array({ maxLength: 2048 }), fc.boolean())
  .map(([bytes, utf8]) => (utf8 ? new TextDecoder("utf-8").decode(bytes) : Buffer.from(bytes).toString("latin1")));
