import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";

const ROOT = path.resolve(import.meta.dirname, "../..");
let dir = "";

function cli(args: string[]) {
  const r = spawnSync("npx", ["tsx", "src/cli/index.ts", ...args], { cwd: ROOT, encoding: "utf8", timeout: 60_000 });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

beforeAll(() => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "fieldtide-qa-"));
});
afterAll(() => {
  fs.rmSync(dir, { recursive: true, force: true });
});

describe("qa", () => {
  it("prints metrics, windows and a verdict as JSON for a record with a step and a gap (known by construction)", () => {
    // 1 Hz whitespace log, local time Asia/Kolkata (UTC+05:30): flat 48 300 nT, +200 nT step at 1800 s, no data 2500–2800 s.
    const lines = ["Date      Time        TMI"];
    const t0 = Date.UTC(2026, 4, 4, 6, 0, 0) + 5.5 * 3_600_000; // wall time
    for (let s = 0; s <= 3600; s++) {
      if (s > 2500 && s < 2800) continue;
      const wall = new Date(t0 + s * 1000).toISOString();
      lines.push(`${wall.slice(0, 10)}  ${wall.slice(11, 19)}  ${s < 1800 ? "48300.0" : "48500.0"}`);
    }
    const file = path.join(dir, "base.txt");
    fs.writeFileSync(file, lines.join("\n") + "\n");
    const r = cli(["qa", "--base", file, "--window-s", "60", "--chord-nt", "3", "--timezone", "Asia/Kolkata"]);
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.qa.startUtc).toBe("2026-05-04T06:00:00.000Z");
    expect(out.qa.samplingIntervalS).toBe(1);
    expect(out.qa.gaps.count).toBe(1);
    expect(out.qa.gaps.longestS).toBe(300);
    expect(out.qa.change.maxChangeNt).toBe(200);
    expect(out.qa.chord.maxDeviationNt).toBeGreaterThan(190);
    expect(out.qa.verdict.level).toBe("storm");
    expect(out.qa.windows.some((w: { metric: string }) => w.metric === "chord")).toBe(true);
    expect(out.qa.noise.formula).toMatch(/\/ 16/);
  });

  it("refuses a bad window with a one-line error", () => {
    const file = path.join(dir, "tiny.csv");
    fs.writeFileSync(file, "time,field\n2026-05-04T08:00:00Z,48300\n2026-05-04T08:00:01Z,48300\n");
    const r = cli(["qa", "--base", file, "--window-s", "0"]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/--window-s must be a positive number/);
  });
});

describe("qa with times of day alone", () => {
  it("reads them on the --date given, in the zone given", () => {
    const file = path.join(dir, "tod.csv");
    fs.writeFileSync(file, "Time,nT\n09:00:00,48300\n09:00:01,48301\n09:00:02,48300.5\n09:00:03,48300\n");
    const r = cli(["qa", "--base", file, "--date", "2026-05-04", "--timezone", "Europe/Berlin"]);
    expect(r.code).toBe(0);
    expect(JSON.parse(r.stdout).qa.startUtc).toBe("2026-05-04T07:00:00.000Z"); // CEST = UTC+2
  });
});
