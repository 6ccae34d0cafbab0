/**
 * Next's boot hook. With FAKE_SMTP=1 the Node.js server starts the local fake SMTP server once,
 * on SMTP_URL's host and port, so invitation and reset mail lands in /admin/mailbox.
 */
export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME !== "nodejs" || process.env.FAKE_SMTP !== "1") return;
  const { startFakeSmtpFromEnv } = await import("./src/server/mail/fake-smtp");
  await startFakeSmtpFromEnv();
}
