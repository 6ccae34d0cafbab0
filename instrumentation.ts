/**
 * Next's boot hook (Node.js server only):
 * - removes staged uploads left by a process that died mid-import (they never became originals);
 * - with FAKE_SMTP=1 starts the local fake SMTP server once, on SMTP_URL's host and port, so
 *   invitation and reset mail lands in /admin/mailbox.
 */
export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const bootMs = Date.now();
  const [{ getEnv }, { sweepStagedUploads }] = await Promise.all([import("./src/server/env"), import("./src/server/storage/layout")]);
  const removed = sweepStagedUploads(getEnv().uploadDir, bootMs);
  if (removed > 0) console.log(`storage: removed ${removed} staged upload(s) left by an interrupted import`);
  if (process.env.FAKE_SMTP !== "1") return;
  const { startFakeSmtpFromEnv } = await import("./src/server/mail/fake-smtp");
  await startFakeSmtpFromEnv();
}
