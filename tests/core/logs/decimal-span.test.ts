/**
 * Numbers read from bytes must equal JavaScript's own Number() of the same text, bit for bit
 * (ECMAScript StringToNumber is the reference: correctly rounded decimal → binary64), both in
 * parseDecimalBytes and in the log scanner, which reads plain decimals of numeric columns while it
 * cuts the line into cells.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { parseLogText } from "@/src/core/logs";
import { parseDecimalBytes } from "@/src/core/logs/decimal-span";

const encoder = new TextEncoder();

/** Decimal-looking text: optional sign, 0–20 integer digits, optional point and 0–20 fraction digits. */
const decimalTextArb = fc
  .tuple(
    fc.constantFrom("", "-", "+"),
    fc.string({ unit: fc.constantFrom(..."0123456789"), maxLength: 20 }),
    fc.boolean(),
    fc.string({ unit: fc.constantFrom(..."0123456789"), maxLength: 20 }),
  )
  .map(([sign, int, point, frac]) => sign + int + (point ? "." + frac : ""));

/** Number() of a cell as the parser defines it (blank → NaN, decimal comma → point). */
function reference(text: string, decimalComma: boolean): number {
  const t = (decimalComma ? text.replace(",", ".") : text).trim();
  if (t.length === 0) return NaN;
  const v = Number(t);
  return Number.isFinite(v) ? v : NaN;
}

describe("parseDecimalBytes", () => {
  it("equals Number() whenever it gives a number, and gives one for every short plain decimal", () => {
    fc.assert(
      fc.property(decimalTextArb, fc.string({ maxLength: 3 }), fc.string({ maxLength: 3 }), (text, before, after) => {
        const head = encoder.encode(before);
        const bytes = encoder.encode(before + text + after);
        const v = parseDecimalBytes(bytes, head.length, head.length + encoder.encode(text).length, false);
        const digitCount = text.replace(/[^0-9]/g, "").length;
        if (digitCount >= 1 && digitCount <= 15) expect(Object.is(v, Number(text))).toBe(true);
        else expect(Number.isNaN(v)).toBe(true);
      }),
      { numRuns: 2000 },
    );
  });

  it("reads a decimal comma only when asked, and refuses other forms", () => {
    const read = (s: string, comma = false) => parseDecimalBytes(encoder.encode(s), 0, encoder.encode(s).length, comma);
    expect(read("48310,25", true)).toBe(48310.25);
    expect(read("48310,25")).toBeNaN();
    expect(Object.is(read("-0"), -0)).toBe(true);
    expect(read(".5")).toBe(0.5);
    expect(read("5.")).toBe(5);
    for (const s of ["", "-", ".", "1e3", "1.2.3", "--1", " 1", "0x10", "1_0", "1234567890123456"]) expect(read(s)).toBeNaN();
  });
});

describe("numbers read while the line is cut", () => {
  const cellArb = fc.oneof(
    decimalTextArb,
    decimalTextArb.map((s) => ` ${s} `),
    fc.constantFrom("1e3", "4.8e4", "-1.5E-2", "abc", "", " ", "9007199254740993", "48954.720000000000001", "0.1", "1,5", "+.5"),
  );

  it.each([
    [",", "\n", false],
    [",", "\r\n", false],
    [";", "\n", true],
    ["\t", "\r\n", true],
  ] as const)("delimiter %j, line end %j: every kept field equals Number() of its text", (delimiter, eol, decimalComma) => {
    fc.assert(
      fc.property(fc.array(fc.tuple(cellArb, cellArb), { minLength: 1, maxLength: 30 }), (generated) => {
        const cells = generated.filter(([f, h]) => !f.includes(delimiter) && !h.includes(delimiter));
        const rows = cells.map(([field, height], i) => {
          const f = decimalComma ? field.replace(".", ",") : field;
          const h = decimalComma ? height.replace(".", ",") : height;
          return [`2026-05-04T09:00:${String(i).padStart(2, "0")}Z`, f, h].join(delimiter);
        });
        const text = ["time", "field", "height_m"].join(delimiter) + eol + rows.join(eol) + eol;
        const r = parseLogText(text, { fieldRangeNt: { minNt: -1e300, maxNt: 1e300 } });
        const expected = cells
          .map(([field, height]) => ({
            field: reference(decimalComma ? field.replace(".", ",") : field, decimalComma),
            height: reference(decimalComma ? height.replace(".", ",") : height, decimalComma),
            heightText: height.trim(),
          }))
          .filter((e) => !Number.isNaN(e.field) && (e.heightText.length === 0 || !Number.isNaN(e.height)));
        expect(r.readings.count).toBe(expected.length);
        expected.forEach((e, i) => {
          expect(Object.is(r.readings.fieldNt[i], e.field)).toBe(true);
          if (e.heightText.length > 0) expect(Object.is(r.readings.heightM![i], e.height)).toBe(true);
          else expect(r.readings.heightM![i]).toBeNaN();
        });
      }),
      { numRuns: 200 },
    );
  });
});
