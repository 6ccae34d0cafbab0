/**
 * `npm run -s cli -- igrf --in points.csv --out out.csv [--model igrf|wmm] [--igrf-file PATH]
 *  [--degree-convention full|lower]`
 *
 * Reference field at the points of a CSV with columns date,latitude_deg,longitude_deg,height_m
 * (date ISO 8601, UTC unless an offset is written; a bare date is 00:00 UTC; height above the WGS84
 * ellipsoid). Writes the input columns plus north_nT,east_nT,down_nT,horizontal_nT,total_nT,
 * inclination_deg,declination_deg,model. An input column with one of those names is kept as
 * input_<name>. Nothing is written unless every row succeeds.
 */
import fs from "node:fs";
import path from "node:path";
import { parseArgs } from "node:util";
import Papa from "papaparse";
import { z } from "zod";
import {
  CoefficientTableError,
  ModelFormatError,
  OutsideModelValidityError,
  synthesizeField,
  withDegreeConvention,
  type FieldModel,
  type FieldVector,
} from "../../core/reference-field";
import { TimestampError, createTimestampReader } from "../../core/time";
import { loadReferenceModel, ReferenceModelFileError } from "../../lib/reference-model";
import { CliError } from "../cli-error";

const USAGE =
  "usage: igrf --in points.csv [--out out.csv] [--model igrf|wmm] [--igrf-file PATH] [--degree-convention full|lower]";

const INPUT_COLUMNS = ["date", "latitude_deg", "longitude_deg", "height_m"] as const;
const OUTPUT_COLUMNS = [
  "north_nT",
  "east_nT",
  "down_nT",
  "horizontal_nT",
  "total_nT",
  "inclination_deg",
  "declination_deg",
  "model",
] as const;
/** Decimals written: 0.01 nT for components, 0.0001° for angles. */
const NT_DECIMALS = 2;
const DEG_DECIMALS = 4;
const NUMBER_PATTERN = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

const OptionsSchema = z.object({
  in: z.string({ error: "--in is required" }).min(1, "--in is required"),
  out: z.string().min(1).optional(),
  model: z.enum(["igrf", "wmm"], { error: "--model must be igrf or wmm" }).default("igrf"),
  "igrf-file": z.string().min(1).optional(),
  "degree-convention": z
    .enum(["full", "lower"], { error: "--degree-convention must be full or lower" })
    .default("full"),
});
type Options = z.infer<typeof OptionsSchema>;

function readOptions(argv: string[]): Options {
  let values: Record<string, unknown>;
  try {
    values = parseArgs({
      args: argv,
      options: {
        in: { type: "string" },
        out: { type: "string" },
        model: { type: "string" },
        "igrf-file": { type: "string" },
        "degree-convention": { type: "string" },
      },
      strict: true,
      allowPositionals: false,
    }).values;
  } catch (err) {
    throw new CliError(`${err instanceof Error ? err.message : String(err)}; ${USAGE}`);
  }
  const parsed = OptionsSchema.safeParse(values);
  if (!parsed.success) throw new CliError(`${parsed.error.issues[0].message}; ${USAGE}`);
  return parsed.data;
}

function loadModel(options: Options): FieldModel {
  try {
    const model = loadReferenceModel(options.model, { igrfFile: options["igrf-file"] });
    return options["degree-convention"] === "lower" ? withDegreeConvention(model, "lower-of-bracketing") : model;
  } catch (err) {
    if (err instanceof ReferenceModelFileError) throw new CliError(err.message);
    if (err instanceof CoefficientTableError || err instanceof ModelFormatError) {
      throw new CliError(`bad coefficient file: ${err.message}`);
    }
    throw err;
  }
}

function readInput(file: string): { fields: string[]; rows: Record<string, string>[] } {
  let text: string;
  try {
    text = fs.readFileSync(file, "utf8");
  } catch {
    throw new CliError(`cannot read input file ${file}`);
  }
  const parsed = Papa.parse<Record<string, string>>(text.replace(/^\uFEFF/, ""), {
    header: true,
    skipEmptyLines: "greedy",
    transformHeader: (h) => h.trim(),
  });
  const fields = parsed.meta.fields ?? [];
  const missing = INPUT_COLUMNS.filter((c) => !fields.includes(c));
  if (missing.length > 0) {
    throw new CliError(`${file}: missing column${missing.length > 1 ? "s" : ""} ${missing.join(", ")} (need ${INPUT_COLUMNS.join(",")})`);
  }
  const fieldError = parsed.errors.find((e) => e.type === "FieldMismatch" || e.type === "Quotes");
  if (fieldError) {
    throw new CliError(`${file}: row ${(fieldError.row ?? 0) + 1}: ${fieldError.message}`);
  }
  if (parsed.data.length === 0) throw new CliError(`${file}: no data rows`);
  return { fields, rows: parsed.data };
}

function numberAt(row: Record<string, string>, column: string, rowNumber: number): number {
  const text = (row[column] ?? "").trim();
  if (!NUMBER_PATTERN.test(text)) throw new CliError(`row ${rowNumber}: ${column} "${text}" is not a number`);
  return Number(text);
}

function formatVector(field: FieldVector, modelLabel: string): string[] {
  return [
    field.northNt.toFixed(NT_DECIMALS),
    field.eastNt.toFixed(NT_DECIMALS),
    field.downNt.toFixed(NT_DECIMALS),
    field.horizontalNt.toFixed(NT_DECIMALS),
    field.totalNt.toFixed(NT_DECIMALS),
    field.inclinationDeg.toFixed(DEG_DECIMALS),
    field.declinationDeg.toFixed(DEG_DECIMALS),
    modelLabel,
  ];
}

/** Write atomically: a temporary file beside the target, renamed into place. */
function writeOutput(file: string, text: string): void {
  const target = path.resolve(file);
  const temporary = `${target}.${process.pid}.tmp`;
  try {
    fs.writeFileSync(temporary, text, "utf8");
    fs.renameSync(temporary, target);
  } catch (err) {
    fs.rmSync(temporary, { force: true });
    throw new CliError(`cannot write ${file}: ${err instanceof Error ? err.message : String(err)}`);
  }
}

export async function run(argv: string[]): Promise<void> {
  const options = readOptions(argv);
  const { fields, rows } = readInput(options.in);
  const model = loadModel(options);
  const modelLabel = model.degreeConvention === "full" ? model.name : `${model.name} (degree-truncated)`;
  const readTime = createTimestampReader();

  const outputFields = OUTPUT_COLUMNS as readonly string[];
  const header = [...fields.map((f) => (outputFields.includes(f) ? `input_${f}` : f)), ...OUTPUT_COLUMNS];
  const records: string[][] = rows.map((row, index) => {
    const rowNumber = index + 1;
    const dateText = (row.date ?? "").trim();
    let timeMs: number;
    try {
      timeMs = readTime.parse(dateText);
    } catch (err) {
      if (err instanceof TimestampError) throw new CliError(`row ${rowNumber}: date: ${err.message}`);
      throw err;
    }
    const latitudeDeg = numberAt(row, "latitude_deg", rowNumber);
    const longitudeDeg = numberAt(row, "longitude_deg", rowNumber);
    const heightM = numberAt(row, "height_m", rowNumber);
    if (latitudeDeg < -90 || latitudeDeg > 90) throw new CliError(`row ${rowNumber}: latitude_deg ${latitudeDeg} is not within -90 to 90`);
    if (longitudeDeg < -360 || longitudeDeg > 360) throw new CliError(`row ${rowNumber}: longitude_deg ${longitudeDeg} is not within -360 to 360`);
    let field: FieldVector;
    try {
      field = synthesizeField(model, { latitudeDeg, longitudeDeg, heightM, timeMs });
    } catch (err) {
      if (err instanceof OutsideModelValidityError) throw new CliError(`row ${rowNumber}: ${dateText}: ${err.message}`);
      throw err;
    }
    return [...fields.map((f) => row[f] ?? ""), ...formatVector(field, modelLabel)];
  });

  const csv = Papa.unparse({ fields: header, data: records }, { newline: "\n" }) + "\n";
  if (options.out) writeOutput(options.out, csv);
  else process.stdout.write(csv);
}
