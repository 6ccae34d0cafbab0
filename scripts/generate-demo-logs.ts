/**
 * Writes the demo scenario's base and rover logs (invented data) to data/demo-logs/ (or the
 * folder given as the first argument), with a manifest of each file's upload options.
 */
import fs from "node:fs";
import path from "node:path";
import { loadReferenceModel, ReferenceModelFileError } from "../src/lib/reference-model";
import { DEMO_DAYS } from "../seeds/demo-logs/scenario";
import { generateBaseLog, generateRoverLog } from "../seeds/demo-logs/generate";
import { PROJECT_ROOT } from "./lib/app-process";

const outDir = path.resolve(process.argv[2] ?? path.join(PROJECT_ROOT, "data", "demo-logs"));
fs.mkdirSync(outDir, { recursive: true });
// The main field of the invented days: IGRF-14 when its table is at hand, else WMM2025 (shipped
// in the geomagnetism package), so that the demo also runs where the IGRF file is not installed.
function demoModel() {
  try {
    return loadReferenceModel("igrf");
  } catch (err) {
    if (!(err instanceof ReferenceModelFileError)) throw err;
    console.log("IGRF table not found; the demo logs' main field comes from WMM2025");
    return loadReferenceModel("wmm");
  }
}
const model = demoModel();
const manifest = [];
for (const day of DEMO_DAYS) {
  for (const log of [generateBaseLog(day, model), generateRoverLog(day, model)]) {
    fs.writeFileSync(path.join(outDir, log.fileName), log.text);
    const meta = log.kind === "base" ? day.base : day.rover;
    manifest.push({
      file: log.fileName,
      surveyCode: day.surveyCode,
      date: day.date,
      kind: log.kind,
      rows: log.rows,
      timeBasis: log.timeBasis,
      instrument: meta.instrument,
      sensor: meta.sensor,
      operator: meta.operator,
      ...(log.kind === "base" ? { baseSite: day.base.site } : {}),
    });
    console.log(`${log.fileName}: ${log.rows} rows`);
  }
}
fs.writeFileSync(path.join(outDir, "manifest.json"), JSON.stringify(manifest, null, 2) + "\n");
console.log(`wrote ${manifest.length} logs to ${outDir}`);
