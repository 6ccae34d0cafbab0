import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterEach, describe, expect, it } from "vitest";
import { CoefficientTableError } from "@/src/core/reference-field";
import {
  ReferenceModelFileError,
  loadReferenceModel,
  projectRoot,
  resolveIgrfFile,
} from "@/src/lib/reference-model";
import { IGRF_FILE } from "./reference-files";

const savedEnv = process.env.FIELDTIDE_IGRF_FILE;
afterEach(() => {
  if (savedEnv === undefined) delete process.env.FIELDTIDE_IGRF_FILE;
  else process.env.FIELDTIDE_IGRF_FILE = savedEnv;
});

describe("resolveIgrfFile", () => {
  it("finds the project root as the folder of the project's package.json", () => {
    const manifest = JSON.parse(fs.readFileSync(path.join(projectRoot(), "package.json"), "utf8")) as { name: string };
    expect(manifest.name).toBe("fieldtide");
  });

  it("prefers an explicit path, then FIELDTIDE_IGRF_FILE, then ../shared/reference beside the project", () => {
    process.env.FIELDTIDE_IGRF_FILE = "/data/env-igrf.txt";
    expect(resolveIgrfFile("/data/explicit.txt")).toBe("/data/explicit.txt");
    expect(resolveIgrfFile()).toBe("/data/env-igrf.txt");
    delete process.env.FIELDTIDE_IGRF_FILE;
    expect(resolveIgrfFile()).toBe(path.resolve(projectRoot(), "../shared/reference/igrf14coeffs.txt"));
  });
});

describe("loadReferenceModel", () => {
  it("loads IGRF-14 and WMM2025 and caches each per path", () => {
    const igrf = loadReferenceModel("igrf", { igrfFile: IGRF_FILE });
    expect(igrf.name).toBe("IGRF-14");
    expect(loadReferenceModel("igrf", { igrfFile: IGRF_FILE })).toBe(igrf);
    const wmm = loadReferenceModel("wmm");
    expect(wmm.name).toBe("WMM2025");
    expect(loadReferenceModel("wmm")).toBe(wmm);
  });

  it("says where to get a missing IGRF table", () => {
    const missing = path.join(os.tmpdir(), "fieldtide-no-such-igrf.txt");
    expect(() => loadReferenceModel("igrf", { igrfFile: missing })).toThrow(ReferenceModelFileError);
    expect(() => loadReferenceModel("igrf", { igrfFile: missing })).toThrow(/doi:10\.5281\/zenodo\.14012302/);
  });

  it("reports a malformed table with its line", () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "fieldtide-igrf-"));
    const file = path.join(dir, "broken.txt");
    fs.writeFileSync(file, "# header lost\ng 1 0 -29000\n");
    try {
      expect(() => loadReferenceModel("igrf", { igrfFile: file })).toThrow(CoefficientTableError);
      expect(() => loadReferenceModel("igrf", { igrfFile: file })).toThrow(/^line 2:/);
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });
});
