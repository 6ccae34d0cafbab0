/**
 * `npm run demo`: database → migrations → demo seed → demo field logs → production build → app + local fake
 * SMTP server on loopback; prints the URL and the demo sign-ins, runs until Ctrl-C.
 */
import path from "node:path";
import { describeDatabase } from "../src/server/db/engine";
import { PROJECT_ROOT, runStep, startBuiltApp } from "./lib/app-process";
import { DEMO_SIGN_INS } from "../seeds/demo-users";

const port = Number(process.env.PORT ?? 3000);
const smtpPort = Number(process.env.DEMO_SMTP_PORT ?? 2525);
const databaseFile = process.env.DATABASE_FILE ?? path.join(PROJECT_ROOT, "data", "fieldtide.sqlite");
const env = {
  DATABASE_FILE: databaseFile,
  FAKE_SMTP: "1",
  SMTP_URL: `smtp://127.0.0.1:${smtpPort}`,
  APP_URL: process.env.APP_URL ?? `http://localhost:${port}`,
};

async function main() {
  console.log(`\n[demo] database ${process.env.DATABASE_URL ? describeDatabase({ engine: "postgres", url: process.env.DATABASE_URL }) : databaseFile}`);
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
      "",
      "Demo sign-ins (invented people of the invented Copperwren Geophysics):",
      ...DEMO_SIGN_INS.map((u) => `  ${u.email.padEnd(width)}  ${u.password.padEnd(20)}  ${u.summary}`),
      "",
      "Ctrl-C stops it.",
    ].join("\n"),
  );
  const stop = async () => {
    await app.stop();
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
