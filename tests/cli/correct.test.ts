import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { synthesizeField } from "@/src/core/reference-field";
import { loadReferenceModel } from "@/src/lib/reference-model";

const ROOT = path.resolve(import.meta.dirname, "../..");
let dir = "";

function cli(args: string[]) {
  const r = spawnSync("npx", ["tsx", "src/cli/index.ts", ...args], { cwd: ROOT, encoding: "utf8", timeout: 60_000 });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

function write(name: string, text: string): string {
  const file = path.join(dir, name);
  fs.writeFileSync(file, text);
  return file;
}

function readCsv(file: string): Record<string, string>[] {
  const [head, ...rows] = fs.readFileSync(file, "utf8").trimEnd().split("\n");
  const cols = head.split(",");
  return rows.map((r) => Object.fromEntries(r.split(",").map((v, i) => [cols[i], v])));
}

beforeAll(() => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "fieldtide-correct-"));
});
afterAll(() => {
  fs.rmSync(dir, { recursive: true, force: true });
});

/** Base record on the GPS time scale: 48 300 nT + 0.01 nT/s from 08:00:00 UTC (08:00:18 GPS, IERS Bulletin C: GPS − UTC = 18 s). */
function gpsBase(): string {
  const lines = ["GPS Time\tMag\tLat[deg]\tLon[deg]\tElev (m)"];
  const t0 = Date.UTC(2026, 4, 4, 8, 0, 18);
  for (let s = 0; s <= 3600; s += 10) {
    const label = new Date(t0 + s * 1000).toISOString().slice(0, 19).replace("T", " ");
    lines.push(`${label}\t${(48_300 + 0.01 * s).toFixed(2)}\t51.5\t-1.2\t80`);
  }
  return lines.join("\r\n") + "\r\n";
}

describe("correct", () => {
  it("reads GPS-basis base and local-time rover logs with unusual headers", () => {
    const base = write("base-gps.tsv", gpsBase());
    // rover in Europe/Berlin summer time (UTC+2): 10:15:00 local = 08:15:00 UTC (EU rule, Directive 2000/84/EC)
    const rover = write(
      "rover-local.csv",
      "Date;Time;F (nT);Lat[deg];Long;Alt (m);Line\n" +
        "2026/05/04;10:15:00;48400,0;51.5001;-1.2001;81;L 1\n" +
        "2026/05/04;10:15:01;bad;51.5001;-1.2001;81;L 1\n" +
        "2026/05/04;07:59:00;48400,0;51.5001;-1.2001;81;L 1\n" +
        "2026/05/04;10:15:02;48401,0;;;;L 1\n",
    );
    const out = path.join(dir, "out-gps.csv");
    const r = cli([
      "correct", "--base", base, "--rover", rover, "--out", out, "--datum", "48300", "--reference", "igrf",
      "--base-time-basis", "gps", "--rover-timezone", "Europe/Berlin",
    ]);
    expect(r.stderr).toMatch(/rejected line 3, column "F \(nT\)".*non_numeric_field/);
    expect(r.code).toBe(0);
    const head = fs.readFileSync(out, "utf8").split("\n")[0];
    expect(head).toBe("time,lat,lon,height_m,line,raw_nT,base_nT,diurnal_nT,corrected_nT,reference_nT,residual_nT,flags");
    const rows = readCsv(out);
    expect(rows.map((x) => x.time)).toEqual(["2026-05-04T08:15:00.000Z", "2026-05-04T05:59:00.000Z", "2026-05-04T08:15:02.000Z"]);
    // base at 08:15:00 UTC = 48300 + 0.01 × 900 = 48309 → diurnal 9 → corrected 48391 (18 s GPS shift would give 48390.82)
    expect(rows[0].base_nT).toBe("48309.000");
    expect(rows[0].corrected_nT).toBe("48391.000");
    expect(rows[0].lat).toBe("51.5001000");
    expect(rows[0].line).toBe("L 1");
    // reference: the model's own synthesis at the reading (fast grid agrees within 0.01 nT)
    const model = loadReferenceModel("igrf");
    const direct = synthesizeField(model, { latitudeDeg: 51.5001, longitudeDeg: -1.2001, heightM: 81, timeMs: Date.UTC(2026, 4, 4, 8, 15) }).totalNt;
    expect(Math.abs(Number(rows[0].reference_nT) - direct)).toBeLessThan(0.01);
    expect(Number(rows[0].residual_nT)).toBeCloseTo(48391 - Number(rows[0].reference_nT), 3);
    expect(rows[1].flags).toBe("no_base_cover");
    expect(rows[1].corrected_nT).toBe("");
    expect(rows[2].flags).toBe("no_position");
    expect(rows[2].reference_nT).toBe("");
    expect(rows[2].corrected_nT).toBe("48391.980");
  });

  it("corrects a looped survey from its base reoccupations (constructed example, DOMAIN.md)", () => {
    const rover = write(
      "loop.csv",
      "time,station,field\n2026-05-04T08:00:00Z,BS1,48310.0\n2026-05-04T09:15:00Z,17,48405.0\n2026-05-04T10:00:00Z,BS1,48322.0\n",
    );
    const out = path.join(dir, "out-loop.csv");
    const r = cli(["correct", "--loop-station", "BS1", "--rover", rover, "--out", out, "--datum", "48310", "--reference", "none"]);
    expect(r.code).toBe(0);
    const rows = readCsv(out);
    expect(rows[1].corrected_nT).toBe("48397.500");
    expect(rows[0].flags).toBe("base_occupation");
    expect(rows[1].flags).toBe(""); // no reference model → no position needed
  });

  it("writes nothing and says why when no reading can be corrected", () => {
    const base = write("base-utc.csv", "time,field\n2026-05-04T08:00:00Z,48300\n2026-05-04T09:00:00Z,48301\n");
    const rover = write("rover-late.csv", "time,field\n2026-05-04 12:00:00,48300\n");
    const out = path.join(dir, "never.csv");
    const r = cli(["correct", "--base", base, "--rover", rover, "--out", out, "--reference", "none"]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/no rover reading could be corrected.*timezone/);
    expect(fs.existsSync(out)).toBe(false);
    expect(fs.readdirSync(dir).some((f) => f.includes(".tmp"))).toBe(false);
  });

  it("flags readings outside the model's validity and keeps their diurnal correction", () => {
    // IGRF-14 is valid 1900.0–2030.0 (IAGA 2024, doi:10.5281/zenodo.14012302): 2031 is outside.
    const base = write("base-2031.csv", "time,field\n2031-05-04T08:00:00Z,48300\n2031-05-04T08:01:00Z,48306\n");
    const rover = write("rover-2031.csv", "time,field,lat,lon\n2031-05-04T08:00:30Z,48400,51.5,-1.2\n");
    const out = path.join(dir, "out-2031.csv");
    const r = cli(["correct", "--base", base, "--rover", rover, "--out", out, "--datum", "48300"]);
    expect(r.code).toBe(0);
    const [row] = readCsv(out);
    expect(row.flags).toBe("outside_model_validity");
    expect(row.corrected_nT).toBe("48397.000");
    expect(row.reference_nT).toBe("");
    const ref = cli(["correct", "--base", base, "--rover", rover, "--out", out + "2", "--datum", "reference"]);
    expect(ref.code).toBe(2);
    expect(ref.stderr).toMatch(/needs the base position: give --base-lat/);
  });

  it("gives one-line errors for bad options and logs without a field column", () => {
    const base = write("b.csv", "time,field\n2026-05-04T08:00:00Z,48300\n");
    const bad = cli(["correct", "--base", base, "--rover", base, "--out", path.join(dir, "x.csv"), "--method", "cubic"]);
    expect(bad.code).toBe(2);
    expect(bad.stderr.trim().split("\n")).toHaveLength(1);
    expect(bad.stderr).toMatch(/--method must be linear, spline or nearest/);
    const nofield = write("nofield.csv", "time,lat,lon\n2026-05-04T08:00:00Z,1,2\n");
    const r = cli(["correct", "--base", base, "--rover", nofield, "--out", path.join(dir, "x.csv")]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/no total-field column/);
    expect(r.stderr).not.toMatch(/\n\s+at /); // no stack trace
  });
});
