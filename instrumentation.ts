/**
 * Next's boot hook (Node.js server only):
 * - stops with a one-line message when the environment is invalid (src/server/env.ts);
 * - removes staged uploads left by a process that died mid-import (they never became originals),
 *   and stored originals that no log row names (src/server/storage/boot-sweep.ts);
 * - with FAKE_SMTP=1 starts the local fake SMTP server once, on SMTP_URL's host and port, so
 *   invitation and reset mail lands in /admin/mailbox.
 */
export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const bootMs = Date.now();
  const { exitOnInvalidEnv } = await import("./src/server/boot-env-check");
  exitOnInvalidEnv();
  const { sweepStorageAtBoot } = await import("./src/server/storage/boot-sweep");
  await sweepStorageAtBoot(bootMs);
  if (process.env.FAKE_SMTP !== "1") return;
  const { startFakeSmtpFromEnv } = await import("./src/server/mail/fake-smtp");
  await startFakeSmtpFromEnv();
}
