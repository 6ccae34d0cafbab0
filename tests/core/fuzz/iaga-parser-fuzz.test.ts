/**
 * Property tests of the IAGA coefficient-table parser (src/core/reference-field/iaga-parser.ts)
 * on the published IGRF-14 table (IAGA 2024, doi:10.5281/zenodo.14012302), read at test time
 * from FIELDTIDE_IGRF_FILE or ../shared/reference/igrf14coeffs.txt, never copied into the repo.
 * Damaged copies must parse to exactly what their text says, or fail with a CoefficientTableError
 * that names a line of the file; random bytes and text likewise.
 */
import fc from "fast-check";
import { afterAll, describe, expect, it } from "vitest";
import { CoefficientTableError, parseIagaCoefficients, type FieldModel } from "@/src/core/reference-field";
import { coefficientIndex } from "@/src/core/reference-field/model";
import { igrfText } from "../reference-field/reference-files";
import { applyDamages, bytesAsTextArb, damagesArb, outcomeOf, printRunLog, runProperty, withinTime, type Outcome } from "./fuzz-support";

afterAll(() => printRunLog("iaga-parser"));

const TEXT = igrfText();
const LINES = TEXT.split("\n");
const HEADER_LINE = LINES.findIndex((l) => l.startsWith("g/h")) + 1;
/** 1-based numbers of the coefficient rows (g/h n m values…). */
const ROW_LINES = LINES.map((l, i) => ({ l, n: i + 1 })).filter(({ l, n }) => n > HEADER_LINE && /^[gh]\s/.test(l)).map(({ n }) => n);
const BASELINE = parseIagaCoefficients(TEXT);

/** Lines as an editor counts them: a final line break does not start another line. */
function lineCount(text: string): number {
  const lines = text.split(/\r?\n/);
  return Math.max(1, lines[lines.length - 1] === "" ? lines.length - 1 : lines.length);
}


function parse(text: string): Outcome<FieldModel> {
  return outcomeOf(() => withinTime(() => parseIagaCoefficients(text)));
}

/** The table error, checked to name a line of this text; any other exception fails the property. */
function tableError(text: string, o: Outcome<FieldModel>): CoefficientTableError {
  if (o.ok) throw new Error("the damaged table was accepted");
  if (!(o.error instanceof CoefficientTableError)) throw o.error;
  const e = o.error;
  const last = lineCount(text);
  expect(Number.isInteger(e.lineNumber)).toBe(true);
  expect(e.lineNumber, e.message).toBeGreaterThanOrEqual(1);
  expect(e.lineNumber, e.message).toBeLessThanOrEqual(last);
  expect(e.message.startsWith(`line ${e.lineNumber}: `)).toBe(true);
  return e;
}

/**
 * A reading of the rows independent of the parser's structures: for each coefficient row of the
 * text, its values in column order. The model must hold exactly these numbers.
 */
function expectModelMatchesText(text: string, model: FieldModel): void {
  const lines = text.split(/\r?\n/);
  const header = lines.findIndex((l) => l.trim().startsWith("g/h"));
  let rows = 0;
  const wrong: string[] = [];
  for (const line of lines.slice(header + 1)) {
    const tokens = line.trim().split(/\s+/);
    if (tokens[0] !== "g" && tokens[0] !== "h") continue;
    rows++;
    const [kind, n, m] = [tokens[0], Number(tokens[1]), Number(tokens[2])];
    const k = coefficientIndex(n, m);
    tokens.slice(3).forEach((t, c) => {
      const set = c < model.epochs.length ? model.epochs[c] : model.secularVariation!;
      const got = (kind === "g" ? set.g : set.h)[k];
      if (!Object.is(got, Number(t))) wrong.push(`${kind} ${n} ${m} column ${c}: ${got} for "${t}"`);
    });
  }
  expect(wrong).toEqual([]);
  const expectedRows = Array.from({ length: model.arrayDegree }, (_, i) => 2 * (i + 1) + 1).reduce((a, b) => a + b, 0);
  expect(rows).toBe(expectedRows);
}

const sameArray = (a: Float64Array, b: Float64Array) => a.length === b.length && a.every((v, i) => Object.is(v, b[i]));

function expectSameModel(a: FieldModel, b: FieldModel): void {
  expect(a.arrayDegree).toBe(b.arrayDegree);
  expect(a.epochs.map((e) => [e.year, e.maxDegree])).toEqual(b.epochs.map((e) => [e.year, e.maxDegree]));
  const sets = (m: FieldModel) => [...m.epochs, m.secularVariation!];
  const differing = sets(a).filter((s, i) => !sameArray(s.g, sets(b)[i].g) || !sameArray(s.h, sets(b)[i].h)).length;
  expect(differing).toBe(0);
}

const rowLineArb = fc.constantFrom(...ROW_LINES);

describe("IAGA parser on a damaged IGRF-14 table", () => {
  it("the published table itself parses (degree 13, 26 epochs, SV), and the row list covers it", () => {
    expect(BASELINE.arrayDegree).toBe(13);
    expect(BASELINE.epochs).toHaveLength(26);
    expect(ROW_LINES).toHaveLength(195); // Σ (2n + 1), n = 1…13
    expectModelMatchesText(TEXT, BASELINE);
  });

  it("coefficient rows in any order give the same model", () => {
    runProperty(
      "rows shuffled",
      fc.property(fc.array(fc.tuple(rowLineArb, rowLineArb), { minLength: 1, maxLength: 30 }), (swaps) => {
        const lines = [...LINES];
        for (const [a, b] of swaps) [lines[a - 1], lines[b - 1]] = [lines[b - 1], lines[a - 1]];
        const o = parse(lines.join("\n"));
        if (!o.ok) throw o.error;
        expectSameModel(o.value, BASELINE);
      }),
      { numRuns: 200, timeLimitMs: 2000 },
    );
  });

  it("a value that is not a number is refused on its own line", () => {
    const junkArb = fc.oneof(
      fc.constantFrom("x", "--5", "1.2.3", "NaN", "Infinity", "0x1F", "1,5", "e5", "+", "\u2212" + "5", "1e", "5\u0000"),
      fc.stringMatching(/^[A-Za-z_:;"'#%]{1,4}$/),
    );
    runProperty(
      "bad token",
      fc.property(rowLineArb, fc.nat(), junkArb, (line, col, junk) => {
        const lines = [...LINES];
        const tokens = lines[line - 1].trim().split(/\s+/);
        const c = 1 + (col % (tokens.length - 1)); // degree, order or a value column
        tokens[c] = junk;
        lines[line - 1] = tokens.join(" ");
        const text = lines.join("\n");
        expect(tableError(text, parse(text)).lineNumber).toBe(line);
      }),
      { numRuns: 300, timeLimitMs: 2000 },
    );
  });

  // A numeral beyond the double range ("1e999", 400 nines) matches the number pattern; it must be
  // refused rather than stored as ±Infinity (found by this property, fixed in the parser).
  it("a value beyond the double range is refused on its own line", () => {
    runProperty(
      "overflowing value",
      fc.property(rowLineArb, fc.nat(), fc.constantFrom("1e999", "-2.5E+400", "9".repeat(400), "1e309"), (line, col, big) => {
        const lines = [...LINES];
        const tokens = lines[line - 1].trim().split(/\s+/);
        tokens[3 + (col % (tokens.length - 3))] = big;
        lines[line - 1] = tokens.join(" ");
        const text = lines.join("\n");
        expect(tableError(text, parse(text)).lineNumber).toBe(line);
      }),
      { numRuns: 50, timeLimitMs: 1000, minRuns: 1 },
      { endOnFailure: true },
    );
  });

  it("a row given twice is refused on the second copy, naming the first", () => {
    runProperty(
      "duplicate row",
      fc.property(rowLineArb, fc.constantFrom(...ROW_LINES, LINES.length), (line, insertBefore) => {
        const lines = [...LINES];
        const at = Math.max(insertBefore, line + 1); // the copy goes after the original
        lines.splice(at - 1, 0, lines[line - 1]);
        const text = lines.join("\n");
        const e = tableError(text, parse(text));
        expect(e.lineNumber).toBe(at);
        expect(e.message).toContain(`already given on line ${line}`);
      }),
      { numRuns: 200, timeLimitMs: 2000 },
    );
  });

  it("a row missing is refused, naming the coefficient", () => {
    runProperty(
      "deleted row",
      fc.property(rowLineArb, (line) => {
        const lines = [...LINES];
        const [kind, n, m] = lines[line - 1].trim().split(/\s+/);
        lines.splice(line - 1, 1);
        const text = lines.join("\n");
        const e = tableError(text, parse(text));
        expect(e.message).toContain(`${kind} ${n} ${m}`);
      }),
      { numRuns: 200, timeLimitMs: 2000 },
    );
  });

  it("any damage (truncate, flip, inject NUL/BOM/CR, move lines): exactly the text's values, or an error on a line of the file", () => {
    runProperty(
      "any damage",
      fc.property(damagesArb, fc.boolean(), (damages, crlf) => {
        const base = crlf ? TEXT.replace(/\n/g, "\r\n") : TEXT;
        const text = applyDamages(base, damages);
        const o = parse(text);
        if (o.ok) {
          expectModelMatchesText(text, o.value);
          const notFinite = [...o.value.epochs, o.value.secularVariation!].flatMap((e) => [...e.g, ...e.h].filter((v) => !Number.isFinite(v)));
          expect(notFinite, "coefficients that are not finite").toEqual([]);
        } else tableError(text, o);
      }),
      { numRuns: 400, timeLimitMs: 3000 },
    );
  });
});

describe("IAGA parser: line named for a table without a header", () => {
  // "no header line" once named the line after a final line break ("\n" → line 2); found by
  // this property, fixed in the parser.
  it("names a line within the file", () => {
    runProperty(
      "no header, final line break",
      fc.property(fc.array(fc.constantFrom("# comment", "", "   "), { maxLength: 5 }), fc.constantFrom("\n", "\r\n"), (lines, eol) => {
        const text = lines.join(eol) + eol;
        const e = parse(text);
        if (e.ok || !(e.error instanceof CoefficientTableError)) throw new Error("expected a CoefficientTableError");
        expect(e.error.lineNumber).toBeLessThanOrEqual(lineCount(text));
      }),
      { numRuns: 50, timeLimitMs: 1000, minRuns: 1 },
      { endOnFailure: true },
    );
  });
});

describe("IAGA parser on random input", () => {
  const tableishArb = fc
    .array(
      fc.oneof(
        fc.constantFrom("g/h n m", "c/s deg ord", "IGRF", "DGRF", "SV", "2025-30", "2020.0", "2025.0", "g", "h", "1", "0", "-29350.0", "12.6"),
        fc.constantFrom(" ", "  ", "\n", "\r\n", "#", "\u0000", "\uFEFF", "\t"),
        fc.string({ maxLength: 3, unit: "binary" }),
      ),
      { maxLength: 80 },
    )
    .map((parts) => parts.join(""));

  it("random bytes and table-like text: a model matching the text, or an error on a line of it", () => {
    runProperty(
      "random input",
      fc.property(fc.oneof(bytesAsTextArb, tableishArb, fc.string({ unit: "binary", maxLength: 500 })), (text) => {
        const o = parse(text);
        if (o.ok) expectModelMatchesText(text, o.value);
        else tableError(text, o);
      }),
      { numRuns: 500, timeLimitMs: 2500 },
    );
  });
});
