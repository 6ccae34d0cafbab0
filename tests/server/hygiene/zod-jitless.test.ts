/**
 * Every app or server module that imports zod imports src/lib/zod-jitless first: zod 4 otherwise
 * probes `new Function` when it builds an object schema, and in the browser our CSP (no
 * 'unsafe-eval') reports that probe as a violation on any page whose client code uses the schema.
 */
import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";

const ROOT = path.resolve(import.meta.dirname, "..", "..", "..");
const FOLDERS = ["app", "src/server", "src/lib", "src/ui"];

function sourceFiles(dir: string): string[] {
  const out: string[] = [];
  for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) out.push(...sourceFiles(full));
    else if (/\.(ts|tsx)$/.test(entry.name)) out.push(full);
  }
  return out;
}

describe("zod runs jitless wherever a page can reach it", () => {
  it("each module importing zod imports the jitless setup before it", () => {
    const offenders: string[] = [];
    let checked = 0;
    for (const folder of FOLDERS) {
      for (const file of sourceFiles(path.join(ROOT, folder))) {
        if (file.endsWith(path.join("src", "lib", "zod-jitless.ts"))) continue;
        const text = fs.readFileSync(file, "utf8");
        const zodAt = text.search(/from "zod(\/[^"]*)?";/);
        if (zodAt < 0) continue;
        checked++;
        const setupAt = text.indexOf('import "@/src/lib/zod-jitless";');
        if (setupAt < 0 || setupAt > zodAt) offenders.push(path.relative(ROOT, file));
      }
    }
    expect(checked).toBeGreaterThan(5);
    expect(offenders).toEqual([]);
  });
});
