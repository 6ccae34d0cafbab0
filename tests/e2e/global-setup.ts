/**
 * Builds the app (unless E2E_SKIP_BUILD=1), creates a fresh database (a SQLite file in a temp
 * folder, or a fresh PostgreSQL database when FIELDTIDE_TEST_PG_URL names a server:
 * `npm run test:e2e:pg`), migrates and seeds the demo, starts the app with the local fake SMTP
 * server, and hands the URL and the database to the tests.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import type { TestProject } from "vitest/node";
import type { DatabaseConfig } from "../../src/server/env";
import { freePort, runStep, startBuiltApp, type RunningApp } from "../../scripts/lib/app-process";
import { createPgDatabase, dropPgDatabase, newPgDatabaseName, pgDatabaseUrl } from "../../scripts/lib/pg-database";

declare module "vitest" {
  export interface ProvidedContext {
    baseUrl: string;
    dataDir: string;
    database: DatabaseConfig;
  }
}

let app: RunningApp | undefined;

export default async function setup(project: TestProject) {
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), "fieldtide-e2e-"));
  const port = await freePort();
  const smtpPort = await freePort();
  const adminUrl = process.env.FIELDTIDE_TEST_PG_URL;
  const pgName = newPgDatabaseName("fieldtide_e2e");
  let database: DatabaseConfig = { engine: "sqlite", file: path.join(dataDir, "e2e.sqlite") };
  if (adminUrl) {
    await createPgDatabase(adminUrl, pgName);
    database = { engine: "postgres", url: pgDatabaseUrl(adminUrl, pgName) };
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
    if (adminUrl) await dropPgDatabase(adminUrl, pgName);
    fs.rmSync(dataDir, { recursive: true, force: true });
  };
}
