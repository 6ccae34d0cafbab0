/** When the SMTP server cannot be reached, an invitation is not kept and the error says so. */
import net from "node:net";
import { describe, expect, it } from "vitest";
import { setupTestDatabase } from "../support/test-db";

// A port that was free a moment ago and has nothing listening now.
const closedPort = await new Promise<number>((resolve) => {
  const s = net.createServer().listen(0, "127.0.0.1", () => {
    const { port } = s.address() as net.AddressInfo;
    s.close(() => resolve(port));
  });
});
setupTestDatabase({ SMTP_URL: `smtp://127.0.0.1:${closedPort}` });

const inv = await import("@/src/server/invitations/service");
const reset = await import("@/src/server/auth/password-reset");
const { MailDeliveryError } = await import("@/src/server/errors");
const { toErrorResponse } = await import("@/src/server/http/respond");
const { makeUser, makeSurvey, addMember, countRows } = await import("../support/fixtures");

describe("mail server down", () => {
  it("inviteToSurvey fails with a clear mail error and writes nothing", async () => {
    const surveyId = await makeSurvey();
    const lead = await makeUser();
    await addMember(surveyId, lead.userId, "lead");
    const before = [await countRows("invitations"), await countRows("audit_events")];
    const err = await inv.inviteToSurvey(lead, surveyId, { email: "x@test.example", role: "crew" }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(MailDeliveryError);
    expect((err as Error).message).toMatch(/could not be sent/);
    expect([await countRows("invitations"), await countRows("audit_events")]).toEqual(before);
    const res = toErrorResponse(err);
    expect(res.status).toBe(503);
    expect(await res.json()).toEqual({ error: { code: "mail_failed", message: (err as Error).message } });
  });

  it("a reset request for a real account keeps no token when the mail fails", async () => {
    const user = await makeUser();
    await expect(reset.requestPasswordReset({ email: user.email })).resolves.toBeUndefined();
    expect(await countRows("password_resets")).toBe(0);
  });
});
