/**
 * A lead invites a new member; the invitation crosses the local fake SMTP server, is read
 * in the admin's mailbox, and accepted in a fresh browser context that lands on the survey.
 */
import { afterAll, beforeAll, expect, inject, it } from "vitest";
import type { Browser } from "playwright-core";
import { DEMO_SIGN_INS } from "../../seeds/demo-users";
import { launchBrowser, newContext, screenshot, signIn } from "./support/browser";

const baseUrl = inject("baseUrl");
let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

const byPrefix = (p: string) => DEMO_SIGN_INS.find((u) => u.email.startsWith(`${p}@`))!;

it("crew cannot invite; lead invites; the invitee joins from the mailed link", async () => {
  // Crew member: sees the survey and its members but has no invite form.
  const crewContext = await newContext(browser, baseUrl);
  const crewPage = await crewContext.newPage();
  await signIn(crewPage, byPrefix("crew").email, byPrefix("crew").password);
  await crewPage.goto("/surveys");
  await crewPage.getByRole("link", { name: /BRM-26|Brennock/ }).first().click();
  await crewPage.waitForURL(/\/surveys\/[^/]+$/);
  const surveyPath = new URL(crewPage.url()).pathname;
  await crewPage.goto(`${surveyPath}/members`);
  await crewPage.getByRole("heading").first().waitFor();
  expect(await crewPage.getByRole("button", { name: "Send invitation" }).count()).toBe(0);
  await crewContext.close();

  // Lead invites a new person as processor.
  const invitee = `new.processor.${Date.now()}@copperwren.example`;
  const leadContext = await newContext(browser, baseUrl);
  const leadPage = await leadContext.newPage();
  await signIn(leadPage, byPrefix("lead").email, byPrefix("lead").password);
  await leadPage.goto(`${surveyPath}/members`);
  await leadPage.getByLabel("E-mail").fill(invitee);
  await leadPage.getByLabel("Role").selectOption("processor");
  await leadPage.getByRole("button", { name: "Send invitation" }).click();
  await leadPage.getByText(invitee).first().waitFor({ state: "visible" });
  await screenshot(leadPage, "members-after-invite");
  await leadContext.close();

  // Admin reads the captured mail and takes the link.
  const adminContext = await newContext(browser, baseUrl);
  const adminPage = await adminContext.newPage();
  await signIn(adminPage, byPrefix("admin").email, byPrefix("admin").password);
  await adminPage.goto("/admin/mailbox");
  await adminPage.getByRole("listitem").filter({ hasText: invitee }).getByRole("link").first().click();
  await adminPage.waitForURL(/\/admin\/mailbox\/[^/]+$/);
  const link = await adminPage.locator('a[href*="/invitations/"]').first().getAttribute("href");
  expect(link).toBeTruthy();
  await screenshot(adminPage, "mailbox-invitation");
  await adminContext.close();

  // Fresh context: accept, set a password, land on the survey.
  const freshContext = await newContext(browser, baseUrl);
  const freshPage = await freshContext.newPage();
  await freshPage.goto(link!);
  await freshPage.getByLabel("Your name").fill("Noor Haddleston");
  await freshPage.getByLabel("New password").fill("a-long-new-password");
  await freshPage.getByLabel("Confirm password").fill("a-long-new-password");
  await freshPage.getByRole("button", { name: "Join survey" }).click();
  await freshPage.waitForURL(new RegExp(`${surveyPath}$`));
  await freshPage.getByRole("heading", { name: /Brennock Moor/ }).first().waitFor({ state: "visible" });
  await screenshot(freshPage, "invitee-lands-on-survey");

  // The link is single use.
  const reuse = await freshContext.newPage();
  await reuse.goto(link!);
  await reuse.getByText(/already (been )?used/i).first().waitFor({ state: "visible" });
  await freshContext.close();
});
