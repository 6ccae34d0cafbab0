import "server-only";
/** Outgoing mail through nodemailer to SMTP_URL. Throws MailDeliveryError when not accepted. */
import nodemailer from "nodemailer";
import { getEnv } from "../env";
import { MailDeliveryError } from "../errors";

export type OutgoingMail = { to: string; subject: string; text: string; html?: string };

export async function sendMail(mail: OutgoingMail): Promise<{ messageId: string }> {
  const env = getEnv();
  const transport = nodemailer.createTransport(env.smtpUrl, {
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 20_000,
  } as Parameters<typeof nodemailer.createTransport>[1]);
  try {
    const info = await transport.sendMail({ from: env.mailFrom, to: mail.to, subject: mail.subject, text: mail.text, html: mail.html });
    return { messageId: info.messageId };
  } catch (err) {
    console.error(`mail to ${mail.to} not sent: ${err instanceof Error ? err.message : String(err)}`);
    throw new MailDeliveryError();
  } finally {
    transport.close();
  }
}
