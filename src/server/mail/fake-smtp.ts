/**
 * Local fake SMTP server for development, demos and tests: accepts every message on a
 * loopback address (no TLS, authentication optional) and stores it in captured_mail, where
 * admins read it under /admin/mailbox. Never a real mail relay.
 * No `server-only`: started from instrumentation.ts.
 */
import type { AddressInfo } from "node:net";
import { SMTPServer } from "smtp-server";
import type { Knex } from "knex";
import { getDb } from "../db/client";
import { getEnv } from "../env";
import { parseMail } from "./mime";

const LOOPBACK = new Set(["127.0.0.1", "localhost", "::1"]);
const MAX_MESSAGE_BYTES = 10 * 1024 * 1024;

export type FakeSmtpServer = { host: string; port: number; close(): Promise<void> };

export async function storeCapturedMail(
  db: Knex,
  raw: Buffer,
  envelope: { from: string; to: string[] },
): Promise<number> {
  const parsed = parseMail(raw);
  const [row] = await db("captured_mail")
    .insert({
      message_id: parsed.messageId,
      envelope_from: envelope.from,
      envelope_to: JSON.stringify(envelope.to),
      from_header: parsed.from,
      to_header: parsed.to,
      subject: parsed.subject,
      text_body: parsed.text,
      html_body: parsed.html,
      raw: raw.toString("utf8"),
      received_at: new Date().toISOString(),
    })
    .returning("id");
  return typeof row === "object" ? (row as { id: number }).id : (row as number);
}

export async function startFakeSmtpServer(opts: { host?: string; port: number; db?: () => Knex }): Promise<FakeSmtpServer> {
  const host = opts.host ?? "127.0.0.1";
  if (!LOOPBACK.has(host)) throw new Error(`The fake SMTP server only listens on loopback, not ${host}`);
  const db = opts.db ?? getDb;
  const server = new SMTPServer({
    secure: false,
    authOptional: true,
    disabledCommands: ["STARTTLS", "AUTH"],
    size: MAX_MESSAGE_BYTES,
    logger: false,
    banner: "Fieldtide fake SMTP (messages are captured, never delivered)",
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on("data", (c: Buffer) => chunks.push(c));
      stream.on("error", callback);
      stream.on("end", () => {
        if ((stream as unknown as { sizeExceeded?: boolean }).sizeExceeded) {
          callback(Object.assign(new Error("Message too large"), { responseCode: 552 }));
          return;
        }
        const envelope = {
          from: session.envelope.mailFrom ? session.envelope.mailFrom.address : "",
          to: session.envelope.rcptTo.map((r) => r.address),
        };
        storeCapturedMail(db(), Buffer.concat(chunks), envelope).then(
          () => callback(),
          (err: unknown) => {
            console.error("fake SMTP: could not store message", err);
            callback(Object.assign(new Error("Could not store message"), { responseCode: 451 }));
          },
        );
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(opts.port, host, () => {
      server.off("error", reject);
      resolve();
    });
  });
  server.on("error", (err) => console.error("fake SMTP:", err.message));
  const port = ((server.server as unknown as { address(): AddressInfo }).address()).port;
  return {
    host,
    port,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

const globalForSmtp = globalThis as unknown as { __fieldtideFakeSmtp?: Promise<FakeSmtpServer | null> };

/** Starts the fake server once per process on SMTP_URL's host and port (FAKE_SMTP=1 at boot). */
export function startFakeSmtpFromEnv(): Promise<FakeSmtpServer | null> {
  globalForSmtp.__fieldtideFakeSmtp ??= (async () => {
    const url = new URL(getEnv().smtpUrl);
    const host = url.hostname.replace(/^\[(.*)\]$/, "$1");
    const port = Number(url.port || 25);
    try {
      const server = await startFakeSmtpServer({ host, port });
      console.log(`fake SMTP: capturing mail on ${host}:${server.port} (read it under /admin/mailbox)`);
      return server;
    } catch (err) {
      console.error(`fake SMTP: not started on ${host}:${port}: ${err instanceof Error ? err.message : String(err)}`);
      return null;
    }
  })();
  return globalForSmtp.__fieldtideFakeSmtp;
}
