/** Health answers 503 (and no details) when the database cannot be opened. */
import { describe, expect, it } from "vitest";

// A path under a regular file: the directory cannot be created, so the database cannot open.
process.env.DATABASE_FILE = "/dev/null/fieldtide/unreachable.sqlite";

const health = await import("@/app/api/health/route");

describe("GET /api/health with the database down", () => {
  it("returns 503 and reachable: false", async () => {
    const res = await health.GET();
    expect(res.status).toBe(503);
    const body = await res.json();
    expect(body).toMatchObject({ status: "error", database: { reachable: false } });
    expect(JSON.stringify(body)).not.toMatch(/dev\/null|ENOTDIR|sqlite/i);
  });
});
