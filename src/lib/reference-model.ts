/**
 * Loading the reference-field models from disk (Node only): the IGRF coefficient table, read at run
 * time and never bundled, and WMM2025 from the `geomagnetism` package. Used by the CLI, server and bench.
 */
import fs from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { modelFromWmmJson, parseIagaCoefficients, type FieldModel } from "../core/reference-field";

export type ReferenceModelKind = "igrf" | "wmm";

/** Where the IGRF table is expected, relative to the project root (see README of shared/reference). */
const DEFAULT_IGRF_RELATIVE_PATH = "../shared/reference/igrf14coeffs.txt";
const WMM_RELATIVE_PATH = "node_modules/geomagnetism/data/wmm-2025.json";
const IGRF_SOURCE = "the IGRF-14 table is published by IAGA at doi:10.5281/zenodo.14012302";

/** A model file that is missing or unreadable; the message says where to get it. */
export class ReferenceModelFileError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "ReferenceModelFileError";
  }
}

function hasProjectManifest(dir: string): boolean {
  const manifest = path.join(dir, "package.json");
  try {
    // Build output folders carry a package.json with only "type"; the project's own has a name.
    const parsed = JSON.parse(fs.readFileSync(manifest, "utf8")) as { name?: unknown };
    return typeof parsed.name === "string";
  } catch {
    return false;
  }
}

function findUp(start: string): string | null {
  let dir = path.resolve(start);
  for (;;) {
    if (!dir.split(path.sep).includes("node_modules") && hasProjectManifest(dir)) return dir;
    const parent = path.dirname(dir);
    if (parent === dir) return null;
    dir = parent;
  }
}

function moduleDirectory(): string | null {
  try {
    return path.dirname(fileURLToPath(import.meta.url));
  } catch {
    return null;
  }
}

let projectRootCache: string | null = null;

/** Directory holding the project's package.json, from this module's location or else the working directory. */
export function projectRoot(): string {
  if (projectRootCache) return projectRootCache;
  const here = moduleDirectory();
  const root = (here && findUp(here)) ?? findUp(process.cwd()) ?? process.cwd();
  projectRootCache = root;
  return root;
}

/** IGRF table path: the explicit one, else FIELDTIDE_IGRF_FILE, else ../shared/reference/igrf14coeffs.txt from the project root. */
export function resolveIgrfFile(explicit?: string): string {
  if (explicit && explicit.trim() !== "") return path.resolve(explicit);
  const fromEnv = process.env.FIELDTIDE_IGRF_FILE;
  if (fromEnv && fromEnv.trim() !== "") return path.resolve(fromEnv);
  return path.resolve(projectRoot(), DEFAULT_IGRF_RELATIVE_PATH);
}

/** Path of the WMM2025 coefficients shipped with the `geomagnetism` package. */
export function resolveWmmFile(): string {
  return path.resolve(projectRoot(), WMM_RELATIVE_PATH);
}

const cache = new Map<string, { mtimeMs: number; size: number; model: FieldModel }>();

function readModelFile(file: string, kind: ReferenceModelKind): { text: string; mtimeMs: number; size: number } {
  let stat: fs.Stats;
  try {
    stat = fs.statSync(file);
  } catch {
    throw new ReferenceModelFileError(
      kind === "igrf"
        ? `IGRF coefficient file not found at ${file}; give its path with --igrf-file or FIELDTIDE_IGRF_FILE (${IGRF_SOURCE})`
        : `WMM2025 coefficients not found at ${file}; they ship with the npm package geomagnetism (run npm ci)`,
    );
  }
  if (!stat.isFile()) throw new ReferenceModelFileError(`${file} is not a file`);
  return { text: fs.readFileSync(file, "utf8"), mtimeMs: stat.mtimeMs, size: stat.size };
}

/**
 * Load IGRF (from the resolved table) or WMM2025, cached per path and reloaded when the file changes.
 * Throws ReferenceModelFileError for a missing file and CoefficientTableError / ModelFormatError for a bad one.
 */
export function loadReferenceModel(kind: ReferenceModelKind, opts: { igrfFile?: string } = {}): FieldModel {
  const file = kind === "igrf" ? resolveIgrfFile(opts.igrfFile) : resolveWmmFile();
  const cached = cache.get(file);
  if (cached) {
    try {
      const stat = fs.statSync(file);
      if (stat.mtimeMs === cached.mtimeMs && stat.size === cached.size) return cached.model;
    } catch {
      // fall through: readModelFile reports the missing file
    }
  }
  const { text, mtimeMs, size } = readModelFile(file, kind);
  let model: FieldModel;
  if (kind === "igrf") {
    model = parseIagaCoefficients(text);
  } else {
    let json: unknown;
    try {
      json = JSON.parse(text);
    } catch {
      throw new ReferenceModelFileError(`${file} is not valid JSON`);
    }
    model = modelFromWmmJson(json);
  }
  cache.set(file, { mtimeMs, size, model });
  return model;
}
