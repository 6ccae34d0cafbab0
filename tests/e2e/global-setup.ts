/**
 * Builds the app (unless E2E_SKIP_BUILD=1), creates a fresh database in a temp folder,
 * migrates and seeds the demo, starts the app with the local fake SMTP server, and hands
 * the URL to the tests.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import type { TestProject } from "vitest/node";
import { freePort, runStep, startBuiltApp, type RunningApp } from "../../scripts/lib/app-process";

declare module "vitest" {
  export interface ProvidedContext {
    baseUrl: string;
    dataDir: string;
  }
}

let app: RunningApp | undefined;

export default async function setup(project: TestProject) {
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), "fieldtide-e2e-"));
  const port = await freePort();
  const smtpPort = await freePort();
  const env = {
    DATABASE_FILE: path.join(dataDir, "e2e.sqlite"),
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
  return async () => {
    await app?.stop();
    fs.rmSync(dataDir, { recursive: true, force: true });
  };
}
