/** Mail crosses real SMTP (nodemailer → smtp-server on 127.0.0.1:port 0) into captured_mail. */
import { describe, expect, it } from "vitest";
import { setupTestDatabase } from "../support/test-db";
import { startTestSmtp } from "../support/smtp";

const smtp = await startTestSmtp();
setupTestDatabase({ MAIL_FROM: "Fieldtide Test <robot@fieldtide.invalid>" });

const { sendMail } = await import("@/src/server/mail/mailer");
const mailbox = await import("@/src/server/mail/mailbox");
const { parseMail, decodeHeaderValue } = await import("@/src/server/mail/mime");
const { startFakeSmtpServer } = await import("@/src/server/mail/fake-smtp");
const { NotFoundError } = await import("@/src/server/errors");
const { makeUser } = await import("../support/fixtures");

describe("mail over SMTP", () => {
  it("stores a plain-text message sent by the real mailer", async () => {
    expect(smtp.port).toBeGreaterThan(0);
    const body = "Line one.\nA long line ".repeat(20) + "\nLast line with = and tab\t.";
    await sendMail({ to: "someone@test.example", subject: "Plain check", text: body });
    const admin = await makeUser({ isAdmin: true });
    const [latest] = await mailbox.listCapturedMail(admin);
    expect(latest).toMatchObject({ subject: "Plain check", to: "someone@test.example", from: "Fieldtide Test <robot@fieldtide.invalid>" });
    const full = await mailbox.getCapturedMail(admin, String(latest.id));
    expect(full.text?.trimEnd()).toBe(body);
    expect(full.text).not.toContain("\r");
    expect(full.envelopeTo).toEqual(["someone@test.example"]);
    expect(full.envelopeFrom).toBe("robot@fieldtide.invalid");
    expect(full.raw).toMatch(/^[\s\S]*Subject: Plain check/);
    expect(full.html).toBeNull();
  });

  it("decodes non-ASCII subjects and multipart text + html", async () => {
    const subject = "Datum für Südwall – 48 800 nT ±2";
    const text = "Grüße aus dem Feld: ΔF = −12.5 nT";
    await sendMail({ to: "Zoë <zoe@test.example>", subject, text, html: `<p>${text}</p>` });
    const admin = await makeUser({ isAdmin: true });
    const [latest] = await mailbox.listCapturedMail(admin);
    const full = await mailbox.getCapturedMail(admin, latest.id);
    expect(full.subject).toBe(subject);
    expect(full.to).toBe("Zoë <zoe@test.example>");
    expect(full.text?.trim()).toBe(text);
    expect(full.html?.trim()).toBe(`<p>${text}</p>`);
  });

  it("unknown or malformed mail ids are NotFoundError", async () => {
    const admin = await makeUser({ isAdmin: true });
    await expect(mailbox.getCapturedMail(admin, "999999")).rejects.toBeInstanceOf(NotFoundError);
    await expect(mailbox.getCapturedMail(admin, "1; drop table")).rejects.toBeInstanceOf(NotFoundError);
  });

  it("refuses to listen on a non-loopback address", async () => {
    await expect(startFakeSmtpServer({ host: "0.0.0.0", port: 0 })).rejects.toThrow(/loopback/);
  });
});

describe("MIME reader on hand-written messages", () => {
  // RFC 2047 section 8 examples: "=?ISO-8859-1?Q?Keld_J=F8rn_Simonsen?=" → "Keld Jørn Simonsen",
  // and adjacent encoded words separated by white space join without the space ("=?ISO-8859-1?Q?a?= =?ISO-8859-1?Q?b?=" → "ab").
  it("decodes the RFC 2047 examples", () => {
    expect(decodeHeaderValue("=?ISO-8859-1?Q?Keld_J=F8rn_Simonsen?= <keld@dkuug.dk>")).toBe("Keld Jørn Simonsen <keld@dkuug.dk>");
    expect(decodeHeaderValue("=?ISO-8859-1?Q?a?= =?ISO-8859-1?Q?b?=")).toBe("ab");
    expect(decodeHeaderValue("(=?ISO-8859-1?Q?a?= b)")).toBe("(a b)");
  });

  it("reads quoted-printable soft breaks and base64 parts in a multipart message", () => {
    const raw = [
      "From: a@test.example",
      "To: b@test.example",
      "Subject: folded",
      "  subject",
      'Content-Type: multipart/alternative; boundary="XYZ"',
      "",
      "preamble",
      "--XYZ",
      "Content-Type: text/plain; charset=utf-8",
      "Content-Transfer-Encoding: quoted-printable",
      "",
      "soft=",
      "break =C3=A9",
      "--XYZ",
      "Content-Type: text/html; charset=utf-8",
      "Content-Transfer-Encoding: base64",
      "",
      Buffer.from("<b>é</b>").toString("base64"),
      "--XYZ--",
      "",
    ].join("\r\n");
    const mail = parseMail(Buffer.from(raw, "latin1"));
    expect(mail.subject).toBe("folded subject");
    expect(mail.text).toBe("softbreak é");
    expect(mail.html?.trim()).toBe("<b>é</b>");
  });
});
