/**
 * Row counts and content checksums of a table that come out the same on SQLite and PostgreSQL
 * when the rows are the same, whatever order either engine returns them in: each row's values
 * (numbers, text, null, bytes as hex) are hashed with SHA-256 as JSON, and the digests are
 * added lane by lane (4 × 64 bit, mod 2^64): a multiset hash, so order does not matter but
 * every value of every row, and how many times a row occurs, does.
 */
import { createHash } from "node:crypto";
import type { Knex } from "knex";
import { forEachTablePage, type Cell } from "./table-rows";

export type TableChecksum = { table: string; rows: number; checksum: string };

const MASK_64 = (1n << 64n) - 1n;

const canonical = (v: Cell) => (Buffer.isBuffer(v) ? { hex: v.toString("hex") } : v);

export async function checksumTable(db: Knex, table: string, columns: string[], byLog?: number[]): Promise<TableChecksum> {
  const lanes = [0n, 0n, 0n, 0n];
  let rows = 0;
  const onPage = (page: Cell[][]) => {
    for (const row of page) {
      const digest = createHash("sha256").update(JSON.stringify(row.map(canonical))).digest();
      for (let k = 0; k < 4; k++) lanes[k] = (lanes[k] + digest.readBigUInt64BE(k * 8)) & MASK_64;
      rows++;
    }
  };
  if (byLog) for (const logId of byLog) await forEachTablePage(db, table, columns, onPage, { column: "log_id", value: logId });
  else await forEachTablePage(db, table, columns, onPage);
  return { table, rows, checksum: lanes.map((l) => l.toString(16).padStart(16, "0")).join("") };
}
