/**
 * The CSV byte writer's number and time cells (putFixed3At, putFixed7At, IsoTimeBytes) against the language's own
 * formatting (Number#toFixed, Date#toISOString), written through a CsvByteWriter with small buffers
 * so that handOff runs often.
 */
import { describe, expect, it } from "vitest";
import { CsvByteWriter, IsoTimeBytes, ISO_TIME_BYTES, MAX_FIXED_BYTES, putFixed3At, putFixed7At } from "@/src/core/csv";

/** The writer's number cell for each number of decimals it has. */
const PUT_FIXED: Record<number, typeof putFixed3At> = { 3: putFixed3At, 7: putFixed7At };

/** One line per item, each written by `put` at the writer's position (room for `room` bytes). */
async function linesOf<T>(items: readonly T[], room: number, put: (view: DataView, p: number, item: T) => number): Promise<string[]> {
  const chunks: Buffer[] = [];
  const w = new CsvByteWriter((b) => void chunks.push(Buffer.from(b)), 1 << 16);
  for (const item of items) {
    w.reserve(room + 1);
    const p = put(w.view, w.pos, item);
    w.bytes[p] = 10;
    w.pos = p + 1;
    if (w.nearlyFull) await w.handOff();
  }
  await w.finish();
  return Buffer.concat(chunks).toString("latin1").split("\n").slice(0, -1);
}

/** Each [value, decimals] through putFixed3At or putFixed7At. */
function fixedLines(values: Array<[number, number]>): Promise<string[]> {
  const cell = new Float64Array(1);
  return linesOf(values, MAX_FIXED_BYTES, (view, p, [v, d]) => {
    cell[0] = v;
    return PUT_FIXED[d](view, p, cell, 0);
  });
}

describe("CSV number output", () => {
  it("prints fixed decimals like Number#toFixed for values read from 2-decimal logs", async () => {
    const values: Array<[number, number]> = [];
    let seed = 3;
    const rnd = () => ((seed = (seed * 1_103_515_245 + 12_345) % 2_147_483_648) / 2_147_483_648);
    for (let i = 0; i < 20_000; i++) {
      const v = Math.round((rnd() - 0.5) * 2e7) / 100; // ±100 000.00 like field and residual values
      values.push([v, 3], [v / 3, 3], [(rnd() - 0.5) * 360, 7], [rnd() * 1e-3, 3], [-rnd() * 1e-4, 3]);
    }
    values.push([0, 3], [-0, 3], [-0.0004, 3], [48397.5, 3], [NaN, 3], [123456789.125, 3], [-1e12, 7]);
    const lines = await fixedLines(values);
    const expected = values.map(([v, d]) => (Number.isNaN(v) ? "" : v.toFixed(d).replace(/^-(0\.0*)$/, "$1")));
    expect(lines).toEqual(expected);
  });

  it("prints every digit-group length like Number#toFixed, up to and past the 32-bit fast range", async () => {
    // reference: Number#toFixed (ECMA-262 §21.1.3.3), exact for these values: m + 0.25 and m are
    // exact in binary and never lie on a rounding tie at these decimals
    const magnitudes = [0, 1, 9, 10, 99, 100, 999, 1000, 9999, 10_000, 99_999, 100_000, 999_999, 1e6, 9_999_999, 1e7, 99_999_999, 1e8, 999_999_999, 1e9, 2_147_483_647, 1e12];
    const values: Array<[number, number]> = [];
    for (const d of [3, 7]) {
      const fastLimit = Math.floor(2_147_483_647 / 10 ** d);
      for (const m of [...magnitudes, fastLimit - 1, fastLimit, fastLimit + 1]) for (const x of [m, m + 0.25, -m, -(m + 0.25)]) values.push([x, d]);
    }
    const lines = await fixedLines(values);
    expect(lines).toEqual(values.map(([v, d]) => v.toFixed(d).replace(/^-(0\.?0*)$/, "$1")));
  });
});

describe("CSV time output", () => {
  it("prints ISO 8601 UTC with ms exactly like Date#toISOString", async () => {
    const times: number[] = [];
    let t = Date.UTC(2026, 4, 4, 23, 59, 58, 990);
    for (let i = 0; i < 3000; i++) times.push((t += 7)); // runs across midnight
    for (let i = 0; i < 3000; i++) times.push(Math.round((i * 7_919_333_777) % 4e12) - 1e12); // 1938–2096
    const iso = new IsoTimeBytes();
    const lines = await linesOf(times, ISO_TIME_BYTES, (view, p, ms) => iso.put(view, p, ms));
    expect(lines).toEqual(times.map((ms) => new Date(ms).toISOString()));
  });
});
