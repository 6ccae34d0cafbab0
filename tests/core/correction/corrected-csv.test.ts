/**
 * The corrected-row CSV shared by the CLI and the run export: values known by construction,
 * rounding as Number#toFixed, empty cells for missing values, RFC 4180 quoting, and the same bytes
 * whichever kind of sink takes them.
 */
import { describe, expect, it } from "vitest";
import { CORRECTED_CSV_COLUMNS, CorrectedCsvStream, CorrectionFlag, writeCorrectedCsv, type CorrectionColumns, type CorrectedCsvRover } from "@/src/core/correction";

function columns(n: number, fill: (i: number) => [number, number, number, number, number, number]): CorrectionColumns {
  const c: CorrectionColumns = {
    count: n, baseNt: new Float64Array(n), diurnalNt: new Float64Array(n), correctedNt: new Float64Array(n),
    referenceNt: new Float64Array(n), residualNt: new Float64Array(n), flags: new Uint8Array(n),
  };
  for (let i = 0; i < n; i++) {
    const [b, d, k, r, s, f] = fill(i);
    c.baseNt[i] = b; c.diurnalNt[i] = d; c.correctedNt[i] = k; c.referenceNt[i] = r; c.residualNt[i] = s; c.flags[i] = f;
  }
  return c;
}

async function text(rover: CorrectedCsvRover, result: CorrectionColumns, kind: "sync" | "async"): Promise<string> {
  const pieces: Uint8Array[] = [];
  const keep = (b: Uint8Array) => void pieces.push(b.slice());
  await writeCorrectedCsv(kind === "sync" ? { writeBytes: keep } : { writeBytes: async (b) => keep(b) }, rover, result);
  return new TextDecoder().decode(Buffer.concat(pieces));
}

/** n rover readings 50 ms apart from 05:00 UTC, field by `fieldNt`; lat/lon, height and line names when asked. */
function roverOf(n: number, fieldNt: (i: number) => number, o: { position?: boolean; height?: boolean; readingsPerLine?: number } = {}): CorrectedCsvRover {
  const t0 = Date.UTC(2026, 4, 4, 5);
  return {
    count: n,
    timeMs: Float64Array.from({ length: n }, (_, i) => t0 + i * 50),
    fieldNt: Float64Array.from({ length: n }, (_, i) => fieldNt(i)),
    latDeg: o.position ? Float64Array.from({ length: n }, (_, i) => 52 + i * 1e-7) : null,
    lonDeg: o.position ? Float64Array.from({ length: n }, () => -3.5) : null,
    heightM: o.height ? Float64Array.from({ length: n }, (_, i) => 200 + (i % 100) * 0.01) : null,
    line: o.readingsPerLine ? Array.from({ length: n }, (_, i) => `L${Math.floor(i / o.readingsPerLine!)}`) : null,
  };
}

describe("writeCorrectedCsv", () => {
  it("writes the header and one row per reading, with empty cells, quoting and flag names", async () => {
    // constructed example (not published): base 48 310.0 nT at 08:00 and 48 322.0 nT at 10:00, a
    // reading of 48 405.0 nT at 09:15, datum 48 310.0 → base 48 317.5, diurnal 7.5, corrected 48 397.5 nT
    const t0 = Date.UTC(2026, 4, 4, 9, 15);
    const rover: CorrectedCsvRover = {
      count: 2,
      timeMs: Float64Array.of(t0, t0 + 250),
      fieldNt: Float64Array.of(48_405, 48_406.0004),
      latDeg: Float64Array.of(52.12345678, NaN),
      lonDeg: Float64Array.of(-3.45, NaN),
      heightM: Float64Array.of(210.5, NaN),
      line: ["L1", 'a "b", c'],
    };
    const result = columns(2, (i) =>
      i === 0 ? [48_317.5, 7.5, 48_397.5, 48_900.25, 48_397.5 - 48_900.25, 0] : [NaN, NaN, NaN, NaN, NaN, CorrectionFlag.baseGap | CorrectionFlag.noPosition],
    );
    expect(await text(rover, result, "sync")).toBe(
      CORRECTED_CSV_COLUMNS.join(",") + "\n" +
        "2026-05-04T09:15:00.000Z,52.1234568,-3.4500000,210.500,L1,48405.000,48317.500,7.500,48397.500,48900.250,-502.750,\n" +
        '2026-05-04T09:15:00.250Z,,,,"a ""b"", c",48406.000,,,,,,base_gap|no_position\n',
    );
  });

  it("gives the same bytes to a sink that keeps each buffer until its promise settles and to one that copies at once", async () => {
    const n = 300_000; // several 4 MiB buffers
    const t0 = Date.UTC(2026, 4, 4, 5);
    const rover = roverOf(n, (i) => 48_900 + Math.sin(i / 1000) * 30);
    const result = columns(n, (i) => [48_900 + i * 1e-4, i * 1e-4, 48_900, NaN, NaN, i % 1000 === 0 ? CorrectionFlag.duplicateTime : 0]);
    const sync = await text(rover, result, "sync");
    expect(await text(rover, result, "async")).toBe(sync);
    const rows = sync.trimEnd().split("\n");
    expect(rows).toHaveLength(n + 1);
    expect(rows[n]).toBe(`${new Date(t0 + (n - 1) * 50).toISOString()},,,,,${(48_900 + Math.sin((n - 1) / 1000) * 30).toFixed(3)},${(48_900 + (n - 1) * 1e-4).toFixed(3)},${((n - 1) * 1e-4).toFixed(3)},48900.000,,,`);
    expect(rows[1001].endsWith(",duplicate_time")).toBe(true);
  });

  it("writes the same bytes a batch at a time as all at once, and refuses rows past the rover readings", async () => {
    const n = 70_000;
    const rover = roverOf(n, (i) => 48_900 + Math.cos(i / 700) * 25, { position: true, readingsPerLine: 9000 });
    const whole = columns(n, (i) => [48_890 + i * 1e-4, i * 1e-4 - 3, 48_901, 49_100 + i * 1e-5, -199, i % 777 === 0 ? CorrectionFlag.baseGap : 0]);
    const once = await text(rover, whole, "async");
    const pieces: Uint8Array[] = [];
    const csv = new CorrectedCsvStream({ writeBytes: async (b) => void pieces.push(b.slice()) });
    for (const [from, to] of [[0, 1], [1, 40_000], [40_000, 40_000], [40_000, n]]) {
      const part = columns(to - from, (i) => {
        const k = from + i;
        return [whole.baseNt[k], whole.diurnalNt[k], whole.correctedNt[k], whole.referenceNt[k], whole.residualNt[k], whole.flags[k]];
      });
      await csv.write(rover, part, from);
    }
    await csv.finish();
    expect(new TextDecoder().decode(Buffer.concat(pieces))).toBe(once);
    await expect(new CorrectedCsvStream({ writeBytes: () => {} }).write(rover, columns(2, () => [1, 1, 1, 1, 1, 0]), n - 1)).rejects.toThrow(RangeError);
  });

  it("with several buffers out at once, a sink that reads each buffer only when its write settles, out of order, gets the same bytes", async () => {
    const n = 200_000; // ~6 buffers of 4 MiB: several in flight
    const rover = roverOf(n, (i) => 48_900 + Math.sin(i / 900) * 30, { position: true, height: true, readingsPerLine: 5000 });
    const result = columns(n, (i) => [48_890 + i * 1e-4, i * 1e-4, 48_901, 49_100, -199, 0]);
    const expected = await text(rover, result, "sync");
    const pieces: Uint8Array[] = [];
    let seq = 0;
    let active = 0;
    let most = 0;
    const slow = (b: Uint8Array) => {
      const k = seq++;
      active++;
      most = Math.max(most, active);
      // settles later for even buffers than for odd ones, and copies the bytes only then
      return new Promise<void>((resolve) => setTimeout(() => {
        pieces[k] = b.slice();
        active--;
        resolve();
      }, k % 2 === 0 ? 15 : 1));
    };
    await writeCorrectedCsv({ writeBytes: slow }, rover, result);
    expect(active).toBe(0);
    expect(most).toBeGreaterThan(1); // buffers really were out together
    expect(new TextDecoder().decode(Buffer.concat(pieces))).toBe(expected);
  });

  it("a failed write is thrown once every other write has ended", async () => {
    const n = 150_000;
    const rover = roverOf(n, () => 48_900);
    let seq = 0;
    let active = 0;
    const failing = () => {
      const k = seq++;
      active++;
      return new Promise<void>((resolve, reject) => setTimeout(() => {
        active--;
        if (k === 1) reject(new Error("disk full"));
        else resolve();
      }, k === 1 ? 1 : 20));
    };
    await expect(writeCorrectedCsv({ writeBytes: failing }, rover, columns(n, () => [1, 1, 1, 1, 1, 0]))).rejects.toThrow("disk full");
    expect(seq).toBeGreaterThan(2);
    expect(active).toBe(0);
  });
});
