/**
 * QA review in a real browser, on the demo survey BRM-26 and its storm day 2026-05-06 (the demo's
 * generated logs, with their own noise seed, uploaded through the log API by the crew member in setup). BRM-26 has no reviewer in the demo,
 * so the lead invites one (Ines Calder) through the members page and the mailed link.
 *
 * A processor submits the day → the reviewer's mail is in the admin's fake mailbox → the reviewer
 * opens its link and sends the day back with two lines to re-walk → the crew's mail shows the
 * comment and the lines → the day's history shows every step. Only reviewers see the decision form;
 * the demo reviewer of SDK-26 does not see BRM-26 days in her queue, and the new reviewer does.
 */
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { DEMO_SIGN_INS } from "../../seeds/demo-users";
import { DEMO_DAYS } from "../../seeds/demo-logs/scenario";
import { generateBaseLog, generateRoverLog } from "../../seeds/demo-logs/generate";
import { loadReferenceModel } from "../../src/lib/reference-model";
import { launchBrowser, newContext, screenshot, signIn } from "./support/browser";

const baseUrl = inject("baseUrl");
// The demo storm day with its own noise seed: upload.e2e.ts uploads the demo's own 2026-05-06 base file
// to the same survey, and identical bytes would be refused as a duplicate in whichever test runs second.
const DEMO_DAY = DEMO_DAYS.find((d) => d.surveyCode === "BRM-26" && d.date === "2026-05-06")!;
const DAY = { ...DEMO_DAY, seed: DEMO_DAY.seed + 5000 };
const who = (p: string) => DEMO_SIGN_INS.find((u) => u.email.startsWith(`${p}@`))!;
const [processor, crew, lead, admin, sdkReviewer] = ["processor", "crew", "lead", "admin", "reviewer"].map(who);
const newReviewer = { email: `ines.calder.${Date.now()}@copperwren.example`, name: "Ines Calder", password: "a-long-reviewer-password" };
const COMMENT = "Storm onset at 11:40 local shows on lines 182 and 183; walk them again on a quiet day.";
let browser: Browser;
let surveyId: string;
let reviewerContext: BrowserContext;

async function uploadAsCrew(text: string, fileName: string, fields: Record<string, string>) {
  const signInRes = await fetch(`${baseUrl}/api/v1/auth/sign-in`, {
    method: "POST",
    headers: { "content-type": "application/json", origin: baseUrl },
    body: JSON.stringify({ email: crew.email, password: crew.password }),
  });
  expect(signInRes.status).toBe(200);
  const cookie = (signInRes.headers.get("set-cookie") ?? "").split(";")[0];
  const fd = new FormData();
  for (const [k, v] of Object.entries(fields)) fd.append(k, v);
  fd.append("file", new Blob([text], { type: "text/csv" }), fileName);
  const res = await fetch(`${baseUrl}/api/v1/surveys/${surveyId}/logs`, { method: "POST", body: fd, headers: { cookie, origin: baseUrl } });
  expect(res.status, (await res.clone().text()).slice(0, 300)).toBe(201);
}

/** The newest captured mail to `to` whose list entry mentions `subject`: its text, read on the admin's mailbox page. */
async function mailFor(page: Page, to: string, subject: RegExp): Promise<{ text: string; dayLink: string | null }> {
  await page.goto("/admin/mailbox");
  const item = page.getByRole("listitem").filter({ hasText: to }).filter({ hasText: subject }).first();
  await item.waitFor({ timeout: 15_000 });
  await item.getByRole("link").first().click();
  await page.waitForURL(/\/admin\/mailbox\/[^/]+$/);
  const text = await page.locator("main").innerText();
  const dayLink = await page.locator(`a[href*="/days/${DAY.date}"]`).first().getAttribute("href").catch(() => null);
  return { text, dayLink };
}

beforeAll(async () => {
  browser = await launchBrowser();
  const ctx = await newContext(browser, baseUrl);
  const page = await ctx.newPage();
  await signIn(page, crew.email, crew.password);
  await page.goto("/surveys");
  surveyId = (await page.getByRole("link", { name: /BRM-26|Brennock/ }).first().getAttribute("href"))!.split("/")[2];
  await ctx.close();

  const model = loadReferenceModel("igrf");
  const base = generateBaseLog(DAY, model);
  const rover = generateRoverLog(DAY, model);
  await uploadAsCrew(base.text, base.fileName, {
    kind: "base", instrument: DAY.base.instrument, sensorType: DAY.base.sensor, operator: DAY.base.operator, baseSiteName: DAY.base.site.name,
    baseLatitudeDeg: String(DAY.base.site.latitudeDeg), baseLongitudeDeg: String(DAY.base.site.longitudeDeg), baseHeightM: String(DAY.base.site.heightM),
    timeBasis: base.timeBasis,
  });
  await uploadAsCrew(rover.text, rover.fileName, { kind: "rover", instrument: DAY.rover.instrument, sensorType: DAY.rover.sensor, operator: DAY.rover.operator, timeBasis: rover.timeBasis });

  // The lead invites a QA reviewer to BRM-26; the invitee joins from the mailed link.
  const leadCtx = await newContext(browser, baseUrl);
  const leadPage = await leadCtx.newPage();
  await signIn(leadPage, lead.email, lead.password);
  await leadPage.goto(`/surveys/${surveyId}/members`);
  await leadPage.getByLabel("E-mail").fill(newReviewer.email);
  await leadPage.getByLabel("Role").selectOption("reviewer");
  await leadPage.getByRole("button", { name: "Send invitation" }).click();
  await leadPage.getByText(newReviewer.email).first().waitFor();
  await leadCtx.close();
  const adminCtx = await newContext(browser, baseUrl);
  const adminPage = await adminCtx.newPage();
  await signIn(adminPage, admin.email, admin.password);
  await adminPage.goto("/admin/mailbox");
  await adminPage.getByRole("listitem").filter({ hasText: newReviewer.email }).getByRole("link").first().click();
  const invitation = await adminPage.locator('a[href*="/invitations/"]').first().getAttribute("href");
  await adminCtx.close();
  reviewerContext = await newContext(browser, baseUrl);
  const rp = await reviewerContext.newPage();
  await rp.goto(invitation!);
  await rp.getByLabel("Your name").fill(newReviewer.name);
  await rp.getByLabel("New password").fill(newReviewer.password);
  await rp.getByLabel("Confirm password").fill(newReviewer.password);
  await rp.getByRole("button", { name: "Join survey" }).click();
  await rp.waitForURL(new RegExp(`/surveys/${surveyId}$`));
  await rp.close();
}, 240_000);

afterAll(async () => {
  await reviewerContext?.close();
  await browser?.close();
});

describe("QA review of a storm day", () => {
  it("processor submits; the reviewer is mailed, opens the link and sends two lines back; the crew is mailed; the history shows every step", async () => {
    // Processor: the day is in processing with a suggested verdict; no decision form for a processor.
    const pctx = await newContext(browser, baseUrl);
    const pp = await pctx.newPage();
    await signIn(pp, processor.email, processor.password);
    await pp.goto(`/surveys/${surveyId}/days/${DAY.date}`);
    const panel = pp.getByTestId("review-panel");
    await panel.getByText("In processing").waitFor();
    const header = await pp.locator("main").innerText();
    expect(header).toMatch(/Suggested: storm/);
    await panel.getByLabel(/Note for the reviewer/).fill("Base shows the afternoon storm; please judge the lines after 11:40.");
    await panel.getByRole("button", { name: "Submit for review" }).click();
    await panel.getByText(new RegExp(`Submitted for review\\. Mailed ${newReviewer.email.replace(/\./g, "\\.")}`)).waitFor();
    await panel.getByText("Awaiting review").first().waitFor();
    expect(await pp.getByRole("button", { name: /Accept day|Send back/ }).count()).toBe(0);
    await pctx.close();

    // The lead does not decide either.
    const lctx = await newContext(browser, baseUrl);
    const lp = await lctx.newPage();
    await signIn(lp, lead.email, lead.password);
    await lp.goto(`/surveys/${surveyId}/days/${DAY.date}`);
    await lp.getByTestId("review-panel").getByText("Awaiting review").first().waitFor();
    expect(await lp.getByRole("button", { name: /Accept day|Send back/ }).count()).toBe(0);
    await lctx.close();

    // The reviewer's mail in the fake mailbox, with the day's link.
    const actx = await newContext(browser, baseUrl);
    const ap = await actx.newPage();
    await signIn(ap, admin.email, admin.password);
    const awaiting = await mailFor(ap, newReviewer.email, /awaits review/);
    expect(awaiting.text).toMatch(/Priya Lantern submitted 2026-05-06 of BRM-26/);
    expect(awaiting.text).toMatch(/Suggested verdict: (Storm|Disturbed)/);
    expect(awaiting.dayLink).toContain(`/surveys/${surveyId}/days/${DAY.date}`);

    // The reviewer opens the link and sends lines 182 and 183 back.
    const rp = await reviewerContext.newPage();
    await rp.goto(awaiting.dayLink!);
    const rpanel = rp.getByTestId("review-panel");
    await rpanel.getByText("Awaiting review").first().waitFor();
    await rpanel.getByLabel("Re-survey needed").check();
    await rpanel.getByLabel("Listed lines").check();
    await rpanel.getByRole("button", { name: "Send back for re-survey" }).click();
    await rpanel.getByText(/Say why the day must be walked again/).waitFor(); // a re-survey needs a comment
    expect(await rpanel.getByLabel("Re-survey needed").isChecked(), "the refused form keeps the reviewer's choice").toBe(true);
    await rpanel.getByLabel("Lines to re-walk").fill("182, 183");
    await rpanel.getByLabel("Comment for the crew").fill(COMMENT);
    await rpanel.getByRole("button", { name: "Send back for re-survey" }).click();
    await rpanel.getByText(/Sent back for re-survey\. Mailed/).waitFor();
    await rpanel.getByText("Re-walk lines 182, 183").waitFor();
    await screenshot(rp, "review-sent-back");
    await rp.close();

    // The crew's mail shows the comment and the lines.
    const toCrew = await mailFor(ap, crew.email, /re-survey needed/);
    expect(toCrew.text).toContain(COMMENT);
    expect(toCrew.text).toMatch(/Lines to re-walk:\s+- 182\s+- 183/);
    expect(toCrew.text).toMatch(/Ines Calder \(QA reviewer\) sent the day back/);
    await actx.close();

    // The crew sees the state and every step in the day's history.
    const cctx = await newContext(browser, baseUrl);
    const cp = await cctx.newPage();
    await signIn(cp, crew.email, crew.password);
    await cp.goto(`/surveys/${surveyId}/days/${DAY.date}`);
    const history = cp.getByTestId("review-history");
    await history.waitFor();
    const steps = await history.getByRole("listitem").allInnerTexts();
    expect(steps.some((s) => /^Suggested verdict storm/.test(s))).toBe(true);
    const submitted = steps.findIndex((s) => s.startsWith("Submitted for review") && s.includes("Priya Lantern"));
    const sentBack = steps.findIndex((s) => s.startsWith("Sent back: re-survey needed: lines 182, 183") && s.includes(COMMENT) && s.includes("Ines Calder"));
    expect(submitted).toBeGreaterThanOrEqual(0);
    expect(sentBack).toBeGreaterThan(submitted);
    expect(await cp.getByRole("button", { name: /Submit|Accept day|Send back/ }).count()).toBe(0);
    await cp.getByText("Re-survey needed").first().waitFor();
    await cctx.close();
  }, 240_000);

  it("the review queue: the new reviewer sees the BRM-26 day; the reviewer of SDK-26 sees no BRM-26 day and no BRM-26 page", async () => {
    const rp = await reviewerContext.newPage();
    await rp.goto("/review");
    await rp.getByLabel("Filter by state").selectOption("resurvey_needed");
    const row = rp.getByTestId(`queue-BRM-26-${DAY.date}`);
    await row.waitFor();
    expect(await row.innerText()).toMatch(/Re-survey needed/);
    await rp.getByLabel("Filter by state").selectOption("");
    expect(await rp.getByTestId("review-queue").innerText()).not.toMatch(/SDK-26/);
    await screenshot(rp, "review-queue");
    await rp.goto(`/surveys/${surveyId}/calendar`);
    await rp.getByTestId(`calendar-${DAY.date}`).getByText("Re-survey needed").waitFor();
    const cell = await rp.getByTestId(`calendar-${DAY.date}`).innerText();
    expect(cell).toMatch(/QA: storm/);
    expect(cell, "worst metric with its limit").toMatch(/(range|chord|change|noise|gap|spikes|Kp) [\d\u202f.]+( nT| s)? \(limit [\d.]+/);
    await screenshot(rp, "review-calendar");
    await rp.close();
    const phone = await newContext(browser, baseUrl, 375);
    await phone.addCookies(await reviewerContext.cookies());
    const pp = await phone.newPage();
    for (const url of [`/surveys/${surveyId}/calendar`, "/review", `/surveys/${surveyId}/days/${DAY.date}`]) {
      await pp.goto(url);
      await pp.locator("main").waitFor();
      const overflow = await pp.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
      expect(overflow, `no sideways scrolling at 375 px on ${url}`).toBeLessThanOrEqual(1);
    }
    await screenshot(pp, "review-day-375");
    await phone.close();

    const sctx = await newContext(browser, baseUrl);
    const sp = await sctx.newPage();
    await signIn(sp, sdkReviewer.email, sdkReviewer.password);
    await sp.goto("/review");
    await sp.getByRole("heading", { name: "Review queue" }).waitFor();
    if ((await sp.getByLabel("Filter by state").count()) > 0) await sp.getByLabel("Filter by state").selectOption(""); // no table when she has no days
    expect(await sp.locator("main").innerText()).not.toMatch(/BRM-26/);
    const res = await sp.goto(`/surveys/${surveyId}/days/${DAY.date}`);
    expect(res?.status()).toBe(404);
    await sctx.close();
  }, 120_000);

  it("the crew turns one kind of review mail off on the profile page, and it stays off", async () => {
    const cctx = await newContext(browser, baseUrl);
    const cp = await cctx.newPage();
    await signIn(cp, crew.email, crew.password);
    await cp.goto("/profile");
    const accepted = cp.getByRole("checkbox", { name: /A day was accepted/ });
    expect(await accepted.isChecked()).toBe(true);
    await accepted.uncheck();
    await cp.getByRole("button", { name: "Save mail choices" }).click();
    await cp.getByText("Mail choices saved.").waitFor();
    await cp.reload();
    expect(await cp.getByRole("checkbox", { name: /A day was accepted/ }).isChecked()).toBe(false);
    expect(await cp.getByRole("checkbox", { name: /sent back for re-survey/ }).isChecked()).toBe(true);
    await cctx.close();
  }, 60_000);

  it("the lead reads the audit trail with the review steps", async () => {
    const lctx = await newContext(browser, baseUrl);
    const lp = await lctx.newPage();
    await signIn(lp, lead.email, lead.password);
    await lp.goto(`/surveys/${surveyId}/audit?action=day.`);
    const table = await lp.getByTestId("audit-table").innerText();
    expect(table).toMatch(/Day submitted for review/);
    expect(table).toMatch(/Day sent back for re-survey/);
    expect(table).toMatch(/Ines Calder/);
    await lctx.close();
  }, 60_000);
});
