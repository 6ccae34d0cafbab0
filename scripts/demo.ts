/**
 * `npm run demo`: database → migrations → demo seed → demo field logs → production build → app + local fake
 * SMTP server on loopback; prints the URL and the demo sign-ins, runs until Ctrl-C.
 * `STORAGE_BACKEND=s3 npm run demo` without S3_ENDPOINT also starts the local fake S3 server on
 * 127.0.0.1:DEMO_S3_PORT (default 9300, objects under data/fake-s3) and keeps the originals there.
 */
import path from "node:path";
import { describeDatabase } from "../src/server/db/engine";
import { PROJECT_ROOT, runStep, startBuiltApp } from "./lib/app-process";
import { DEMO_SIGN_INS } from "../seeds/demo-users";
import { startFakeS3Server, type FakeS3Server } from "../src/server/storage/fake-s3/server";

const port = Number(process.env.PORT ?? 3000);
const smtpPort = Number(process.env.DEMO_SMTP_PORT ?? 2525);
const databaseFile = process.env.DATABASE_FILE ?? path.join(PROJECT_ROOT, "data", "fieldtide.sqlite");
const env: Record<string, string> = {
  DATABASE_FILE: databaseFile,
  FAKE_SMTP: "1",
  SMTP_URL: `smtp://127.0.0.1:${smtpPort}`,
  APP_URL: process.env.APP_URL ?? `http://localhost:${port}`,
};

/** The demo's own bucket (invented credentials, loopback only). */
const DEMO_S3 = { bucket: "fieldtide-demo", region: "us-east-1", accessKeyId: "FIELDTIDEDEMO", secretAccessKey: "fieldtide-demo-secret" };

/** With STORAGE_BACKEND=s3 and no S3_ENDPOINT of its own, the demo keeps originals in a local fake bucket. */
async function startDemoBucket(): Promise<FakeS3Server | null> {
  if (process.env.STORAGE_BACKEND !== "s3" || process.env.S3_ENDPOINT) return null;
  const s3 = await startFakeS3Server({
    dir: path.join(PROJECT_ROOT, "data", "fake-s3"),
    port: Number(process.env.DEMO_S3_PORT ?? 9300),
    buckets: [DEMO_S3.bucket],
    credentials: DEMO_S3,
  });
  Object.assign(env, {
    STORAGE_BACKEND: "s3",
    S3_ENDPOINT: s3.endpoint,
    S3_REGION: DEMO_S3.region,
    S3_BUCKET: DEMO_S3.bucket,
    S3_ACCESS_KEY_ID: DEMO_S3.accessKeyId,
    S3_SECRET_ACCESS_KEY: DEMO_S3.secretAccessKey,
  });
  return s3;
}

async function main() {
  const bucket = await startDemoBucket();
  console.log(`\n[demo] database ${process.env.DATABASE_URL ? describeDatabase({ engine: "postgres", url: process.env.DATABASE_URL }) : databaseFile}`);
  if (bucket) console.log(`[demo] originals in the local fake S3 bucket ${DEMO_S3.bucket} at ${bucket.endpoint} (objects under data/fake-s3)`);
  await runStep("npx", ["tsx", "scripts/db.ts", "migrate"], env);
  await runStep("npx", ["tsx", "scripts/db.ts", "seed"], env);
  console.log("[demo] demo field logs (generated, then imported as the survey's crew; files already there are skipped)");
  await runStep(process.execPath, ["--conditions=react-server", "--import", "tsx", "scripts/load-demo-logs.ts"], env);
  if (process.env.DEMO_SKIP_BUILD !== "1") {
    console.log("[demo] building the app (next build)…");
    await runStep(process.execPath, ["node_modules/next/dist/bin/next", "build"], env);
  }
  const app = await startBuiltApp({ port, env });
  const width = Math.max(...DEMO_SIGN_INS.map((u) => u.email.length));
  console.log(
    [
      "",
      `Fieldtide demo is running at ${env.APP_URL}`,
      `Local fake SMTP server on 127.0.0.1:${smtpPort}; captured mail at ${env.APP_URL}/admin/mailbox (admin).`,
      ...(bucket ? [`Original log files in the local fake S3 bucket ${DEMO_S3.bucket} at ${bucket.endpoint}.`] : []),
      "",
      "Demo sign-ins (invented people of the invented Copperwren Geophysics):",
      ...DEMO_SIGN_INS.map((u) => `  ${u.email.padEnd(width)}  ${u.password.padEnd(20)}  ${u.summary}`),
      "",
      "Ctrl-C stops it.",
    ].join("\n"),
  );
  const stop = async () => {
    await app.stop();
    await bucket?.close();
    process.exit(0);
  };
  process.on("SIGINT", stop);
  process.on("SIGTERM", stop);
  app.child.on("exit", (code) => process.exit(code ?? 1));
}

main().catch((err: unknown) => {
  console.error(`[demo] ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
