/**
 * Paths and loaders of the published reference data, resolved at test time:
 * the IGRF-14 table from FIELDTIDE_IGRF_FILE, else ../shared/reference/igrf14coeffs.txt from the
 * project root; the IGRF check points beside it in shared/reference; WMM2025 data and NOAA test
 * values from the geomagnetism package.
 */
import fs from "node:fs";
import path from "node:path";
import Papa from "papaparse";
import { modelFromWmmJson, parseIagaCoefficients, type FieldModel } from "@/src/core/reference-field";
import { projectRoot, resolveIgrfFile } from "@/src/lib/reference-model";

export const IGRF_FILE = resolveIgrfFile();
export const IGRF_CHECK_POINTS_FILE = path.resolve(projectRoot(), "../shared/reference/igrf14-check-points.csv");
export const WMM_FILE = path.resolve(projectRoot(), "node_modules/geomagnetism/data/wmm-2025.json");
export const WMM_TEST_VALUES_FILE = path.resolve(projectRoot(), "node_modules/geomagnetism/test/values.csv");

export function igrfText(): string {
  return fs.readFileSync(IGRF_FILE, "utf8");
}

export function igrfModel(): FieldModel {
  return parseIagaCoefficients(igrfText());
}

export function wmmModel(): FieldModel {
  return modelFromWmmJson(JSON.parse(fs.readFileSync(WMM_FILE, "utf8")));
}

/** Rows of a CSV with a header, as text keyed by column name. */
export function readCsv(file: string): Record<string, string>[] {
  const parsed = Papa.parse<Record<string, string>>(fs.readFileSync(file, "utf8"), {
    header: true,
    skipEmptyLines: true,
  });
  if (parsed.errors.length > 0) throw new Error(`${file}: ${parsed.errors[0].message}`);
  return parsed.data;
}
