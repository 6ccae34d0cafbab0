/**
 * Starts the real fake SMTP server on an OS-chosen port (port 0) and points SMTP_URL at it.
 * Call with top-level await BEFORE anything reads the environment; stops after the file.
 */
import { afterAll } from "vitest";
import { startFakeSmtpServer } from "@/src/server/mail/fake-smtp";

export async function startTestSmtp(): Promise<{ port: number }> {
  const server = await startFakeSmtpServer({ host: "127.0.0.1", port: 0 });
  process.env.SMTP_URL = `smtp://127.0.0.1:${server.port}`;
  afterAll(() => server.close());
  return { port: server.port };
}

/** The newest captured message to `email`, straight from the table. */
export async function lastMailTo(email: string): Promise<{ subject: string; text_body: string | null; to_header: string; envelope_to: string } | undefined> {
  const { getDb } = await import("@/src/server/db/client");
  return getDb()("captured_mail").where("envelope_to", "like", `%${email}%`).orderBy("id", "desc").first();
}

/** The token at the end of a `${APP_URL}/<prefix>/<token>` link in a mail body. */
export function tokenFromMail(text: string | null | undefined, prefix: string): string {
  const m = new RegExp(`/${prefix}/([A-Za-z0-9_-]+)`).exec(text ?? "");
  if (!m) throw new Error(`no /${prefix}/ link in mail: ${text}`);
  return m[1];
}
