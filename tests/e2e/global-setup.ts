/**
 * Builds the app (unless E2E_SKIP_BUILD=1), creates a fresh database (a SQLite file in a temp
 * folder, or a fresh PostgreSQL database when FIELDTIDE_TEST_PG_URL names a server:
 * `npm run test:e2e:pg`), migrates and seeds the demo, starts the app with the local fake SMTP
 * server, and hands the URL and the database to the tests.
 */
import { randomUUID } from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import pg from "pg";
import type { TestProject } from "vitest/node";
import type { DatabaseConfig } from "../../src/server/env";
import { freePort, runStep, startBuiltApp, type RunningApp } from "../../scripts/lib/app-process";

declare module "vitest" {
  export interface ProvidedContext {
    baseUrl: string;
    dataDir: string;
    database: DatabaseConfig;
  }
}

let app: RunningApp | undefined;

async function onAdmin(adminUrl: string, sql: string): Promise<void> {
  const client = new pg.Client({ connectionString: adminUrl });
  await client.connect();
  try {
    await client.query(sql);
  } finally {
    await client.end();
  }
}

export default async function setup(project: TestProject) {
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), "fieldtide-e2e-"));
  const port = await freePort();
  const smtpPort = await freePort();
  const adminUrl = process.env.FIELDTIDE_TEST_PG_URL;
  const pgName = `fieldtide_e2e_${randomUUID().replace(/-/g, "").slice(0, 12)}`;
  let database: DatabaseConfig = { engine: "sqlite", file: path.join(dataDir, "e2e.sqlite") };
  if (adminUrl) {
    await onAdmin(adminUrl, `CREATE DATABASE ${pgName}`);
    const u = new URL(adminUrl);
    u.pathname = `/${pgName}`;
    database = { engine: "postgres", url: u.toString() };
  }
  const env = {
    DATABASE_FILE: path.join(dataDir, "e2e.sqlite"),
    DATABASE_URL: database.engine === "postgres" ? database.url : "",
    UPLOAD_DIR: path.join(dataDir, "uploads"),
    FAKE_SMTP: "1",
    SMTP_URL: `smtp://127.0.0.1:${smtpPort}`,
    APP_URL: `http://localhost:${port}`,
  };
  if (process.env.E2E_SKIP_BUILD !== "1") {
    await runStep(process.execPath, ["node_modules/next/dist/bin/next", "build"], env);
  }
  await runStep("npx", ["tsx", "scripts/db.ts", "migrate"], env);
  await runStep("npx", ["tsx", "scripts/db.ts", "seed"], env);
  app = await startBuiltApp({ port, env, quiet: true });
  project.provide("baseUrl", app.url);
  project.provide("dataDir", dataDir);
  project.provide("database", database);
  return async () => {
    await app?.stop();
    if (adminUrl) await onAdmin(adminUrl, `DROP DATABASE IF EXISTS ${pgName} WITH (FORCE)`);
    fs.rmSync(dataDir, { recursive: true, force: true });
  };
}
