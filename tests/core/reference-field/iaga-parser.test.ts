import { describe, expect, it } from "vitest";
import { CoefficientTableError, parseIagaCoefficients } from "@/src/core/reference-field";
import { coefficientIndex } from "@/src/core/reference-field/model";
import { igrfText } from "./reference-files";

/** Lines of the published table (shared/reference/igrf14coeffs.txt, IAGA 2024, doi:10.5281/zenodo.14012302). */
const text = igrfText();
const lines = text.split(/\r?\n/);
const headerLine = lines.findIndex((l) => l.startsWith("g/h")) + 1;
const firstRowLine = headerLine + 1;

function replaceLine(lineNumber: number, replacement: string | null): string {
  const copy = [...lines];
  if (replacement === null) copy.splice(lineNumber - 1, 1);
  else copy[lineNumber - 1] = replacement;
  return copy.join("\n");
}

function errorOf(table: string): CoefficientTableError {
  try {
    parseIagaCoefficients(table);
  } catch (err) {
    if (err instanceof CoefficientTableError) return err;
    throw err;
  }
  throw new Error("table was accepted");
}

describe("IAGA table parser on the published IGRF-14 table", () => {
  const model = parseIagaCoefficients(text);

  it("finds the 26 five-yearly epochs 1900.0–2025.0 and the 2025–30 secular variation", () => {
    expect(model.epochs.map((e) => e.year)).toEqual(Array.from({ length: 26 }, (_, i) => 1900 + 5 * i));
    expect(model.validFromYear).toBe(1900);
    expect(model.validToYear).toBe(2030);
    expect(model.secularVariation?.maxDegree).toBe(8); // IGRF-14: SV to degree 8
  });

  it("reads degree 10 up to 1995 and degree 13 from 2000 (IGRF-14 description)", () => {
    for (const e of model.epochs) expect(e.maxDegree, String(e.year)).toBe(e.year < 2000 ? 10 : 13);
  });

  it("names the model from the table's comment line", () => {
    expect(model.name).toBe("IGRF-14");
    expect(model.version).toBe("14");
  });

  it("places each row's values in its column (row g 1 0 of the table: −31543 in 1900, −29350.0 in 2025, SV 12.6)", () => {
    const k = coefficientIndex(1, 0);
    expect(model.epochs[0].g[k]).toBe(-31543);
    expect(model.epochs[25].g[k]).toBe(-29350.0);
    expect(model.secularVariation?.g[k]).toBe(12.6);
    expect(model.epochs[25].h[coefficientIndex(1, 1)]).toBe(4545.5); // row h 1 1, 2025
  });
});

describe("IAGA table parser rejects malformed tables, naming the line", () => {
  it("a truncated row", () => {
    const line = firstRowLine + 40;
    const err = errorOf(replaceLine(line, lines[line - 1].slice(0, 60)));
    expect(err.lineNumber).toBe(line);
    expect(err.message).toMatch(new RegExp(`^line ${line}: expected \\d+ columns`));
  });

  it("a table cut off in the middle of its last row", () => {
    const cut = text.trimEnd();
    const err = errorOf(cut.slice(0, cut.length - 30));
    expect(err.lineNumber).toBe(cut.split("\n").length);
  });

  it("a non-numeric value", () => {
    const line = firstRowLine + 10;
    const err = errorOf(replaceLine(line, lines[line - 1].replace(/ (-?\d+\.?\d*) *$/, " 12x.4")));
    expect(err.lineNumber).toBe(line);
    expect(err.message).toMatch(/"12x\.4" is not a number/);
  });

  it("a row with an extra column", () => {
    const line = firstRowLine + 3;
    const err = errorOf(replaceLine(line, `${lines[line - 1]} 7.0`));
    expect(err.lineNumber).toBe(line);
    expect(err.message).toMatch(/columns/);
  });

  it("a missing header line", () => {
    const err = errorOf(replaceLine(headerLine, null));
    expect(err.lineNumber).toBe(headerLine); // the first coefficient row moves up to this line
    expect(err.message).toMatch(/header/);
  });

  it("a text with no table at all", () => {
    expect(errorOf("# only a comment\n").message).toMatch(/no header/);
  });

  it("a duplicated coefficient row", () => {
    const err = errorOf(replaceLine(firstRowLine + 1, lines[firstRowLine - 1]));
    expect(err.lineNumber).toBe(firstRowLine + 1);
    expect(err.message).toMatch(/already given on line/);
  });

  it("a missing coefficient row", () => {
    const err = errorOf(replaceLine(firstRowLine + 20, null));
    expect(err.message).toMatch(/without coefficient/);
  });

  it("an order larger than the degree and h with m = 0", () => {
    const row = lines[firstRowLine - 1];
    expect(errorOf(replaceLine(firstRowLine, row.replace(/^g\s+1\s+0/, "g  1  2"))).lineNumber).toBe(firstRowLine);
    expect(errorOf(replaceLine(firstRowLine, row.replace(/^g/, "h"))).message).toMatch(/m = 1/);
  });

  it("epochs out of order in the header", () => {
    const err = errorOf(replaceLine(headerLine, lines[headerLine - 1].replace("1905.0", "1895.0")));
    expect(err.lineNumber).toBe(headerLine);
    expect(err.message).toMatch(/increase/);
  });
});

describe("IAGA table parser on a small constructed table", () => {
  const small = [
    "# constructed two-epoch table",
    "c/s deg ord IGRF IGRF SV",
    "g/h n m 2000.0 2005.0 2005-10",
    "g 1 0 -30000 -29990 2.0",
    "g 1 1 -1500 -1490 1.0",
    "h 1 1 5000 4990 -2.0",
  ].join("\n");

  it("accepts it with a default name and validity to the end of the SV span", () => {
    const model = parseIagaCoefficients(small, { name: "test field" });
    expect(model.name).toBe("test field");
    expect(model.validFromYear).toBe(2000);
    expect(model.validToYear).toBe(2010);
    expect(model.arrayDegree).toBe(1);
  });

  it("rejects a model-type line whose columns do not match the header", () => {
    const err = errorOf(small.replace("IGRF IGRF SV", "IGRF SV"));
    expect(err.lineNumber).toBe(2);
  });
});
