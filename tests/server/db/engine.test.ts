/**
 * What differs between the engines, checked on whichever one the suite runs on (`npm test`:
 * SQLite, `npm run test:pg`: PostgreSQL): readings go in through the bulk path and come back
 * exactly (text needing COPY escapes, a literal "\N", full double precision, times past 2^31 ms),
 * and check-then-write paths hold when two requests race.
 */
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { setupTestDatabase } from "../../support/test-db";

const testDb = setupTestDatabase();
process.env.UPLOAD_DIR = path.join(testDb.dir, "uploads");

const { importLogStream } = await import("@/src/server/logs/import-service");
const { LogImportRefusedError } = await import("@/src/server/logs/errors");
const { getDb } = await import("@/src/server/db/client");
const { engineOf, selectReadingRows } = await import("@/src/server/db/engine");
const { makeUser, makeSurvey, addMember } = await import("../../support/fixtures");
const { streamOf, roverCsv } = await import("../logs/helpers");

type Actor = Awaited<ReturnType<typeof makeUser>>;
let crew: Actor;
let surveyId: string;

beforeAll(async () => {
  crew = await makeUser();
  surveyId = await makeSurvey();
  await addMember(surveyId, crew.userId, "crew");
});

describe(`engine adapter (${testDb.engine})`, () => {
  it("is the engine the suite asked for", () => {
    expect(engineOf(getDb())).toBe(testDb.engine);
  });

  it("stores and returns readings exactly: escapes, a literal \\N, 17 significant digits, ms times past 2^31", async () => {
    // quoted cells keep tabs, backslashes and a text "\N", which COPY's text format would otherwise read as NULL
    const rows = [
      ["2026-05-04T09:00:00.001Z", "53.612345678901234", "-1.9312345678901234", "318.25", '"L\\1"', '"a\tb"', "49512.123456789012"],
      ["2026-05-04T09:00:01.002Z", "53.6", "-1.93", "318.5", '"\\N"', '"say ""hi"""', "49512.5"],
      ["2026-05-04T09:00:02.003Z", "", "", "", "", "", "49513.25"],
    ];
    const text = ["timestamp,latitude,longitude,elevation_m,line,station,tmi_nT", ...rows.map((r) => r.join(","))].join("\n") + "\n";
    const result = await importLogStream(crew, surveyId, streamOf(text), { kind: "rover", fileName: "escapes.csv", instrument: "R-esc" });
    expect(result.log.readingCount).toBe(3);
    const stored = await selectReadingRows(getDb(), result.log.id);
    expect(stored).toEqual([
      [Date.UTC(2026, 4, 4, 9, 0, 0, 1), 49512.123456789012, 53.612345678901234, -1.9312345678901234, 318.25, "L\\1", "a\tb", 2],
      [Date.UTC(2026, 4, 4, 9, 0, 1, 2), 49512.5, 53.6, -1.93, 318.5, "\\N", 'say "hi"', 3],
      [Date.UTC(2026, 4, 4, 9, 0, 2, 3), 49513.25, null, null, null, null, null, 4],
    ]);
    expect(Date.UTC(2026, 4, 4)).toBeGreaterThan(2 ** 31); // the times need 8-byte integers
    const meta = await getDb()("field_logs").where({ id: result.log.id }).first("first_time_ms", "last_time_ms");
    expect(meta).toEqual({ first_time_ms: Date.UTC(2026, 4, 4, 9, 0, 0, 1), last_time_ms: Date.UTC(2026, 4, 4, 9, 0, 2, 3) });
  });

  it("two uploads of the same file at once: one is imported, the other refused as a duplicate", async () => {
    const text = roverCsv(20_000, { startIso: "2026-05-05T09:00:00Z" });
    const fields = (name: string) => ({ kind: "rover", fileName: name, instrument: "R-race" });
    const outcomes = await Promise.allSettled([
      importLogStream(crew, surveyId, streamOf(text), fields("first.csv")),
      importLogStream(crew, surveyId, streamOf(text), fields("second.csv")),
    ]);
    const imported = outcomes.filter((o) => o.status === "fulfilled");
    const refused = outcomes.filter((o): o is PromiseRejectedResult => o.status === "rejected");
    expect(imported).toHaveLength(1);
    expect(refused).toHaveLength(1);
    expect(refused[0].reason).toBeInstanceOf(LogImportRefusedError);
    expect(refused[0].reason.details.reason).toBe("duplicate");
    const logs = await getDb()("field_logs").where({ survey_id: surveyId, instrument: "R-race" }).select("reading_count");
    expect(logs).toEqual([{ reading_count: 20_000 }]);
  });
});

describe.skipIf(testDb.engine !== "sqlite")("SQLite: a COMMIT that fails", () => {
  it("does not leave the one connection inside the transaction: the next write is committed", async () => {
    const db = getDb();
    // a deferred foreign key fails only at COMMIT
    await db.raw("CREATE TABLE commit_breaker (survey_id TEXT REFERENCES surveys(id) DEFERRABLE INITIALLY DEFERRED)");
    try {
      const err = await db.transaction(async (trx) => {
        await trx("commit_breaker").insert({ survey_id: "no-such-survey" });
      }).catch((e: unknown) => e);
      expect(String(err)).toMatch(/FOREIGN KEY constraint failed/);
      await db("surveys").where({ id: surveyId }).update({ notes: "written after the failed commit" });
      // a second connection sees only committed data
      const { default: Database } = await import("better-sqlite3");
      const other = new Database(testDb.file, { readonly: true });
      try {
        expect((other.prepare("SELECT notes FROM surveys WHERE id = ?").get(surveyId) as { notes: string }).notes).toBe("written after the failed commit");
        expect((other.prepare("SELECT COUNT(*) AS n FROM commit_breaker").get() as { n: number }).n).toBe(0);
      } finally {
        other.close();
      }
    } finally {
      await db.raw("DROP TABLE IF EXISTS commit_breaker");
    }
  });
});
