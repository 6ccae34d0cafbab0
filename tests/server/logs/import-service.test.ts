/**
 * The import service against a real SQLite file (migrations run) and a real UPLOAD_DIR in a temp
 * folder: every refusal leaves the tables and the upload folder exactly as they were.
 */
import { createHash } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { Readable } from "node:stream";
import { beforeAll, describe, expect, it } from "vitest";
import { setupTestDatabase } from "../../support/test-db";

const testDb = setupTestDatabase();
process.env.UPLOAD_DIR = path.join(testDb.dir, "uploads");

const { importLogStream } = await import("@/src/server/logs/import-service");
const { LogImportRefusedError } = await import("@/src/server/logs/errors");
const { FileTooLargeError } = await import("@/src/server/storage/errors");
const { MAX_UPLOAD_BYTES, storedPath } = await import("@/src/server/storage/original-files");
const { NotFoundError, ForbiddenError, ValidationError } = await import("@/src/server/errors");
const { getDb } = await import("@/src/server/db/client");
const { makeUser, makeSurvey, addMember } = await import("../../support/fixtures");
const { snapshot, streamOf, roverCsv } = await import("./helpers");

type Actor = Awaited<ReturnType<typeof makeUser>>;
let crew: Actor;
let surveyId: string;
let londonSurveyId: string;

beforeAll(async () => {
  crew = await makeUser({ name: "Crew Member" });
  surveyId = await makeSurvey();
  await addMember(surveyId, crew.userId, "crew");
  londonSurveyId = await makeSurvey();
  await getDb()("surveys").where({ id: londonSurveyId }).update({ time_zone: "Europe/London" });
  await addMember(londonSurveyId, crew.userId, "crew");
});

const rover = (fileName: string, extra: Record<string, unknown> = {}) => ({ kind: "rover", fileName, instrument: `R-${fileName}`, ...extra });

async function importText(text: string | Buffer, fields: Record<string, unknown>, sid = surveyId) {
  return importLogStream(crew, sid, streamOf(text), fields);
}

/** Runs an import that must be refused; returns the error and checks nothing changed. */
async function expectRefused(text: string | Buffer, fields: Record<string, unknown>) {
  const before = await snapshot();
  const err = await importText(text, fields).catch((e: unknown) => e);
  expect(err).toBeInstanceOf(LogImportRefusedError);
  expect(await snapshot()).toEqual(before);
  return err as InstanceType<typeof LogImportRefusedError>;
}

describe("a good log", () => {
  it("lands whole: readings with UTC ms, position, line, station and source line; the original verbatim with its SHA-256", async () => {
    const text = roverCsv(5);
    const before = await snapshot();
    const result = await importText(text, rover("good.csv"));
    expect(result.log).toMatchObject({ readingCount: 5, rowCount: 5, rejectedCount: 0, issueCount: 0, days: ["2026-05-04"] });
    expect(result.log.firstTimeMs).toBe(Date.UTC(2026, 4, 4, 9, 0, 0));
    expect(result.log.lastTimeMs).toBe(Date.UTC(2026, 4, 4, 9, 0, 4));
    const after = await snapshot();
    expect(after.log_readings - before.log_readings).toBe(5);
    expect(after.field_logs - before.field_logs).toBe(1);
    expect(after.originals - before.originals).toBe(1);
    expect(after.tempFiles).toBe(0);

    const rows = await getDb()("log_readings").where({ log_id: result.log.id }).orderBy("time_ms");
    expect(rows[0]).toMatchObject({ time_ms: Date.UTC(2026, 4, 4, 9), field_nt: 49_500, latitude_deg: 53.6, longitude_deg: -1.93, height_m: 318.2, line: "100", station: "0", source_line: 2 });
    expect(rows[4].source_line).toBe(6);

    const log = await getDb()("field_logs").where({ id: result.log.id }).first();
    const sha = createHash("sha256").update(text).digest("hex");
    expect(log.sha256).toBe(sha);
    expect(log.size_bytes).toBe(Buffer.byteLength(text));
    expect(log.storage_key).not.toContain("good.csv");
    expect(fs.readFileSync(storedPath(log.storage_key), "utf8")).toBe(text);
  });

  it("reads a BOM, CRLF line ends and trailing blank lines", async () => {
    const text = "\uFEFF" + roverCsv(4, { startIso: "2026-05-04T10:00:00Z", eol: "\r\n" }) + "\r\n\r\n\n";
    const result = await importText(text, rover("bom-crlf.csv"));
    expect(result.log.readingCount).toBe(4);
    const rows = await getDb()("log_readings").where({ log_id: result.log.id }).orderBy("time_ms");
    expect(rows.map((r: { field_nt: number }) => r.field_nt)).toEqual([49_500, 49_500.25, 49_500.5, 49_500.75]);
    // the original keeps its BOM and CRLF bytes
    const key = (await getDb()("field_logs").where({ id: result.log.id }).first()).storage_key;
    expect(fs.readFileSync(storedPath(key))).toEqual(Buffer.from(text, "utf8"));
  });

  it("local time of a Europe/London survey: BST is UTC+1 in May, and readings get local survey days", async () => {
    // UK summer time runs from the last Sunday of March to the last Sunday of October
    // (Summer Time Order 2002, EU Directive 2000/84/EC): UTC+1 on 4 May 2026.
    const text = "Date,Time,Field (nT)\n2026-05-04,23:59:58,48310.0\n2026-05-05,00:00:03,48310.5\n";
    const result = await importText(text, { kind: "base", fileName: "base-local.csv", timeBasis: "local", baseSiteName: "Gatehouse paddock" }, londonSurveyId);
    expect(result.log.firstTimeMs).toBe(Date.UTC(2026, 4, 4, 22, 59, 58));
    expect(result.log.lastTimeMs).toBe(Date.UTC(2026, 4, 4, 23, 0, 3));
    // Both readings are 4 May in UTC but the second is 5 May on the survey's calendar.
    expect(result.log.days).toEqual(["2026-05-04", "2026-05-05"]);
    const days = await getDb()("log_days").where({ log_id: result.log.id }).orderBy("day");
    expect(days.map((d: { day: string; reading_count: number }) => [d.day, d.reading_count])).toEqual([["2026-05-04", 1], ["2026-05-05", 1]]);
  });

  it("GPS time basis: GPS − UTC = 18 s in 2026 (IERS Bulletin C: TAI − UTC = 37 s since 2017-01-01; GPS = TAI − 19 s)", async () => {
    const text = "UTC;Lat;Lon;Alt (m);Line;Mag\n2026-06-15 00:00:18.000;-32.94;138.62;236.0;10;56000.1\n";
    const result = await importText(text, rover("gps.csv", { timeBasis: "gps" }));
    expect(result.log.firstTimeMs).toBe(Date.UTC(2026, 5, 15, 0, 0, 0));
    expect(result.delimiter).toBe("semicolon");
  });

  it("a file that is not UTF-8 is read as Windows-1252 and says so", async () => {
    const bytes = Buffer.from("# Basis Höhe 312 m\ntime,station,field\n2026-05-04T13:00:00Z,Süd-1,48000.5\n", "latin1");
    expect(bytes.includes(0xf6)).toBe(true); // ö as one Latin-1 byte: invalid UTF-8
    const result = await importText(bytes, rover("latin1.csv"));
    expect(result.warnings.join(" ")).toMatch(/Windows-1252/);
    const row = await getDb()("log_readings").where({ log_id: result.log.id }).first();
    expect(row).toMatchObject({ station: "Süd-1", field_nt: 48_000.5, source_line: 3 });
  });

  it("a clock offset is added to every logged time (a clock 2 s slow needs +2 s)", async () => {
    const result = await importText(roverCsv(1, { startIso: "2026-05-04T11:00:00Z" }), rover("offset.csv", { clockOffsetS: "2" }));
    expect(result.log.firstTimeMs).toBe(Date.UTC(2026, 4, 4, 11, 0, 2));
  });
});

describe("refused files leave no trace", () => {
  it("an empty file", async () => {
    const err = await expectRefused("", rover("empty.csv"));
    expect(err.details.reason).toBe("empty");
    expect(err.message).toMatch(/empty/);
  });

  it("a binary file", async () => {
    const bytes = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0x00, 0x00, 0x00, 0x0d, 0x49, 0x48, 0x44, 0x52]);
    const err = await expectRefused(bytes, rover("photo.csv"));
    expect(err.details.reason).toBe("binary");
    expect(err.message).toMatch(/not a text log/);
  });

  it("a wrong delimiter (semicolon file read as comma) says which delimiter the header seems to use", async () => {
    const text = "time;field\n2026-05-04T09:00:00Z;48000\n";
    const err = await expectRefused(text, rover("semi.csv", { delimiter: "comma" }));
    expect(err.details.reason).toBe("unreadable");
    expect(err.message).toMatch(/no total-field column/);
    expect(err.message).toMatch(/semicolons/);
  });

  it("a missing field column", async () => {
    const err = await expectRefused("time,lat,lon\n2026-05-04T09:00:00Z,53.6,-1.9\n", rover("nofield.csv"));
    expect(err.details.reason).toBe("unreadable");
    expect(err.message).toMatch(/no total-field column/);
  });

  it("non-numeric values, listing line, column, value and reason", async () => {
    const text = roverCsv(3).replace(/,49500\.25\n/, ",49k5O0\n");
    const err = await expectRefused(text, rover("nonnum.csv"));
    expect(err.details.reason).toBe("bad_rows");
    expect(err.details.problems).toEqual([
      expect.objectContaining({ kind: "rejected", line: 3, column: "tmi_nT", value: "49k5O0", reason: "non_numeric_field" }),
    ]);
  });

  it("impossible timestamps (30 February, 25:00)", async () => {
    const text = "time,field\n2026-02-28T23:59:59Z,48000\n2026-02-30T00:00:00Z,48000\n2026-03-01T25:00:00Z,48000\n";
    const err = await expectRefused(text, rover("impossible.csv"));
    expect(err.details.problems!.map((p) => [p.line, p.reason])).toEqual([
      [3, "impossible_timestamp"],
      [4, "impossible_timestamp"],
    ]);
  });

  it("times going backwards", async () => {
    const text = "time,field\n2026-05-04T09:00:05Z,48000\n2026-05-04T09:00:06Z,48000\n2026-05-04T09:00:02Z,48000\n";
    const err = await expectRefused(text, rover("backwards.csv"));
    expect(err.details.problems).toEqual([expect.objectContaining({ kind: "issue", line: 4, reason: "time_backwards" })]);
    expect(err.message).toMatch(/backwards/);
  });

  it("duplicated timestamps", async () => {
    const text = "time,field\n2026-05-04T09:00:05Z,48000\n2026-05-04T09:00:05Z,48001\n";
    const err = await expectRefused(text, rover("dupe-times.csv"));
    expect(err.details.problems).toEqual([expect.objectContaining({ kind: "issue", line: 3, reason: "duplicate_time" })]);
  });

  it("values outside 10 000–120 000 nT and positions out of range are reported", async () => {
    const text = "time,lat,lon,field\n2026-05-04T09:00:00Z,53.6,-1.9,9999\n2026-05-04T09:00:01Z,93.1,-1.9,48000\n2026-05-04T09:00:02Z,53.6,-181,48000\n2026-05-04T09:00:03Z,53.6,-1.9,48000\n";
    const err = await expectRefused(text, rover("ranges.csv"));
    expect(err.details.problems!.map((p) => p.reason)).toEqual(["field_out_of_range", "latitude_out_of_range", "longitude_out_of_range"]);
  });

  it("a header only", async () => {
    const err = await expectRefused("timestamp,tmi_nT\n", rover("header-only.csv"));
    expect(err.details.reason).toBe("header_only");
  });

  it("a file of 200 MiB + 1 byte is refused while streaming, and the temp file is removed", async () => {
    const before = await snapshot();
    const chunk = Buffer.alloc(1024 * 1024, "a");
    async function* big() {
      for (let i = 0; i < 200; i++) yield chunk;
      yield Buffer.from("b");
    }
    expect(MAX_UPLOAD_BYTES).toBe(200 * 1024 * 1024);
    const err = await importLogStream(crew, surveyId, Readable.from(big()), rover("huge.csv")).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(FileTooLargeError);
    expect((err as Error).message).toMatch(/larger than 200 MB/);
    expect(await snapshot()).toEqual(before);
  });

  it("bad options are refused with field errors before reading the file", async () => {
    const err = await importText(roverCsv(1), { kind: "base", fileName: "b.csv", clockOffsetS: "soon" }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(ValidationError);
    expect(Object.keys((err as InstanceType<typeof ValidationError>).fieldErrors)).toEqual(["clockOffsetS"]);
    const noSite = await importText(roverCsv(1), { kind: "base", fileName: "b.csv" }).catch((e: unknown) => e);
    expect((noSite as InstanceType<typeof ValidationError>).fieldErrors).toEqual({ baseSiteName: ["Name the base station site."] });
  });
});

describe("accepting the good rows", () => {
  it("stores the good readings and keeps the refused lines with their reasons on the log", async () => {
    const text = "time,field\n2026-05-04T12:00:00Z,48000\n2026-05-04T12:00:01Z,abc\n2026-05-04T12:00:02Z,48002\n2026-05-04T12:00:02Z,48003\n";
    const result = await importText(text, rover("accept.csv", { acceptGoodRows: "true" }));
    expect(result.log).toMatchObject({ rowCount: 4, readingCount: 3, rejectedCount: 1, issueCount: 1 });
    const problems = await getDb()("log_problems").where({ log_id: result.log.id }).orderBy("line");
    expect(problems.map((p: { line: number; kind: string; reason: string; value: string }) => [p.line, p.kind, p.reason, p.value])).toEqual([
      [3, "rejected", "non_numeric_field", "abc"],
      [5, "issue", "duplicate_time", "2026-05-04T12:00:02Z"],
    ]);
  });
});

describe("duplicates and overlaps", () => {
  it("the same bytes again in the same survey are refused with a link to the log already there", async () => {
    const text = roverCsv(3, { startIso: "2026-05-06T09:00:00Z" });
    const first = await importText(text, rover("first.csv"));
    const err = await expectRefused(text, rover("renamed-copy.csv"));
    expect(err.details.reason).toBe("duplicate");
    expect(err.status).toBe(409);
    expect(err.details.existingLog).toEqual({ id: first.log.id, originalName: "first.csv", url: `/surveys/${surveyId}/logs/${first.log.id}` });
  });

  it("a log overlapping in time with another log of the same instrument gets a warning", async () => {
    const a = await importText(roverCsv(10, { startIso: "2026-05-07T09:00:00Z" }), { kind: "rover", fileName: "a.csv", instrument: "ROVER-9" });
    expect(a.overlaps).toEqual([]);
    const b = await importText(roverCsv(10, { startIso: "2026-05-07T09:00:05Z", fieldAt: () => 50_000 }), { kind: "rover", fileName: "b.csv", instrument: "ROVER-9" });
    expect(b.overlaps.map((o) => o.id)).toEqual([a.log.id]);
    expect(b.warnings.join(" ")).toMatch(/overlaps in time with “a.csv”/);
    const stored = await getDb()("field_logs").where({ id: b.log.id }).first();
    expect(JSON.parse(stored.warnings).join(" ")).toMatch(/overlaps in time with “a.csv”/);
    const c = await importText(roverCsv(10, { startIso: "2026-05-07T09:00:05Z", fieldAt: () => 50_001 }), { kind: "rover", fileName: "c.csv", instrument: "ROVER-10" });
    expect(c.overlaps).toEqual([]);
  });
});

describe("import profiles", () => {
  it("a saved mapping is applied automatically to the next file with the same header row", async () => {
    const header = "Zeit,Breite,Laenge,Messwert\n";
    const row = (s: number, f: number) => `2026-05-08T09:00:0${s}Z,53.6,-1.9,${f}\n`;
    const mapping = JSON.stringify({ time: "Zeit", lat: "Breite", lon: "Laenge", field: "Messwert" });
    // Without a mapping the header cannot be read.
    await expectRefused(header + row(0, 48000), rover("odd0.csv"));
    const first = await importText(header + row(1, 48001), rover("odd1.csv", { mapping, saveProfileAs: "Field laptop export" }));
    expect(first.profile).toMatchObject({ name: "Field laptop export", saved: true, applied: false });
    const second = await importText(header + row(2, 48002), rover("odd2.csv"));
    expect(second.profile).toMatchObject({ name: "Field laptop export", applied: true });
    expect(second.mapping).toMatchObject({ time: "Zeit", field: "Messwert", lat: "Breite", lon: "Laenge" });
  });
});

describe("an import killed mid-way", () => {
  const big = roverCsv(120_000, { startIso: "2026-05-09T06:00:00Z" });

  it("aborted (client gone) after the first 50 000 rows: tables and upload folder unchanged", async () => {
    const before = await snapshot();
    const controller = new AbortController();
    let progressCalls = 0;
    const err = await importLogStream(crew, surveyId, streamOf(big), rover("aborted.csv"), {
      signal: controller.signal,
      onProgress: () => {
        progressCalls++;
        controller.abort(new Error("client went away"));
      },
    }).catch((e: unknown) => e);
    expect(progressCalls).toBe(1);
    expect((err as Error).message).toBe("client went away");
    expect(await snapshot()).toEqual(before);
  });

  it("a throw inside the transaction after rows were inserted: rolled back, original absent", async () => {
    const before = await snapshot();
    let insertedWhenThrown = -1;
    const err = await importLogStream(crew, surveyId, streamOf(big), rover("thrown.csv"), {
      onProgress: (rows) => {
        insertedWhenThrown = rows;
        throw new Error("disk on fire");
      },
    }).catch((e: unknown) => e);
    expect((err as Error).message).toBe("disk on fire");
    expect(insertedWhenThrown).toBeGreaterThanOrEqual(50_000);
    expect(await snapshot()).toEqual(before);
    // the same file then imports completely
    const ok = await importLogStream(crew, surveyId, streamOf(big), rover("thrown.csv"));
    expect(ok.log.readingCount).toBe(120_000);
    expect((await snapshot()).log_readings - before.log_readings).toBe(120_000);
  });
});

describe("who may upload", () => {
  it("a crew member of another survey gets not found; a reviewer on the survey gets forbidden; nothing is written", async () => {
    const outsider = await makeUser();
    const other = await makeSurvey();
    await addMember(other, outsider.userId, "crew");
    const reviewer = await makeUser();
    await addMember(surveyId, reviewer.userId, "reviewer");
    const before = await snapshot();
    await expect(importLogStream(outsider, surveyId, streamOf(roverCsv(2)), rover("x.csv"))).rejects.toBeInstanceOf(NotFoundError);
    await expect(importLogStream(reviewer, surveyId, streamOf(roverCsv(2)), rover("y.csv"))).rejects.toBeInstanceOf(ForbiddenError);
    expect(await snapshot()).toEqual(before);
  });
});
