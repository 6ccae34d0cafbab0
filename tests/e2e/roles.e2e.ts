/**
 * Each demo role signs in and sees exactly its surveys; the JSON sign-in and health
 * endpoints answer as documented.
 */
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
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

function demo(emailPrefix: string) {
  const user = DEMO_SIGN_INS.find((u) => u.email.startsWith(`${emailPrefix}@`));
  if (!user) throw new Error(`no demo user ${emailPrefix}`);
  return user;
}

// Which active surveys each demo user must see (seeds/01_demo.ts); admin sees all.
const EXPECTED: Record<string, string[]> = {
  admin: ["BRM-26", "SDK-26"],
  lead: ["BRM-26", "SDK-26"],
  processor: ["BRM-26", "SDK-26"],
  crew: ["BRM-26"],
  reviewer: ["SDK-26"],
};
const ALL_CODES = ["BRM-26", "SDK-26", "OLD-25"];

describe("each demo role sees exactly its surveys", () => {
  for (const [role, codes] of Object.entries(EXPECTED)) {
    it(`${role}`, async () => {
      const context = await newContext(browser, baseUrl);
      const page = await context.newPage();
      const user = demo(role);
      await signIn(page, user.email, user.password);
      await page.goto("/surveys");
      await page.getByText("Loading surveys").waitFor({ state: "hidden" }); // the list streams in after the page shell
      const body = await page.locator("main").innerText();
      for (const code of ALL_CODES) {
        if (codes.includes(code)) expect(body, `${role} should see ${code}`).toContain(code);
        else expect(body, `${role} must not see ${code}`).not.toContain(code);
      }
      await screenshot(page, `surveys-${role}`);
      await context.close();
    });
  }

  it("a crew member opening a foreign survey by URL gets not found", async () => {
    const api = await fetch(`${baseUrl}/api/v1/auth/sign-in`, {
      method: "POST",
      headers: { "content-type": "application/json", origin: baseUrl },
      body: JSON.stringify({ email: demo("reviewer").email, password: demo("reviewer").password }),
    });
    expect(api.status).toBe(200);
    const context = await newContext(browser, baseUrl);
    const page = await context.newPage();
    await signIn(page, demo("reviewer").email, demo("reviewer").password);
    await page.goto("/surveys");
    const link = page.getByRole("link", { name: /SDK-26|Saltwick/ }).first();
    const href = await link.getAttribute("href");
    expect(href).toMatch(/^\/surveys\/[^/]+$/);
    await context.close();

    const crew = await newContext(browser, baseUrl);
    const crewPage = await crew.newPage();
    await signIn(crewPage, demo("crew").email, demo("crew").password);
    const response = await crewPage.goto(href!);
    expect(response?.status()).toBe(404);
    expect(await crewPage.locator("body").innerText()).not.toContain("Saltwick");
    await crew.close();
  });
});

describe("JSON endpoints", () => {
  it("health reports version, database and migration level", async () => {
    const res = await fetch(`${baseUrl}/api/health`);
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.version).toMatch(/^\d+\.\d+\.\d+/);
    expect(body.database.reachable).toBe(true);
    expect(body.database.migration.pending).toBe(0);
  });

  it("sign-in refuses a wrong password and accepts the right one with a session cookie", async () => {
    const user = demo("crew");
    const wrong = await fetch(`${baseUrl}/api/v1/auth/sign-in`, {
      method: "POST",
      headers: { "content-type": "application/json", origin: baseUrl },
      body: JSON.stringify({ email: user.email, password: "not-the-password" }),
    });
    expect(wrong.status).toBe(401);
    const right = await fetch(`${baseUrl}/api/v1/auth/sign-in`, {
      method: "POST",
      headers: { "content-type": "application/json", origin: baseUrl },
      body: JSON.stringify({ email: user.email, password: user.password }),
    });
    expect(right.status).toBe(200);
    expect((await right.json()).user.email).toBe(user.email);
    const cookie = right.headers.get("set-cookie") ?? "";
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
  });
});
