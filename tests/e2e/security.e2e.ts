/**
 * Every page of the app (found by scanning app/**\/page.tsx) is opened in a real browser and must
 * pass the Content-Security-Policy: no `securitypolicyviolation` event, no CSP console message, no
 * page error. Its response carries the policy (nonce scripts, frame-ancestors 'none') and nosniff.
 * Route parameters are filled from the demo database: a survey with a day uploaded and corrected
 * here, its log, a captured mail; token pages get an unknown token (they still render).
 */
import fs from "node:fs";
import path from "node:path";
import { createDb } from "@/src/server/db/create-db";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { DEMO_SIGN_INS } from "../../seeds/demo-users";
import { BASE_POSITION, DAY, baseCsv, roverCsv } from "../server/days/day-fixtures";
import { launchBrowser, newContext, signIn } from "./support/browser";

const baseUrl = inject("baseUrl");
const ROOT = path.resolve(import.meta.dirname, "..", "..");
const admin = DEMO_SIGN_INS.find((u) => u.email.startsWith("admin@"))!;

function pagePaths(): string[] {
  const walk = (dir: string): string[] =>
    fs.readdirSync(dir, { withFileTypes: true }).flatMap((d) => (d.isDirectory() ? walk(path.join(dir, d.name)) : d.name === "page.tsx" ? [path.join(dir, d.name)] : []));
  return walk(path.join(ROOT, "app")).map(
    (f) => "/" + path.relative(path.join(ROOT, "app"), path.dirname(f)).split(path.sep).filter((s) => s && !/^\(.*\)$/.test(s)).join("/"),
  );
}

let browser: Browser;
let params: Record<string, string> = {};

async function apiCookie(): Promise<string> {
  const res = await fetch(`${baseUrl}/api/v1/auth/sign-in`, {
    method: "POST",
    headers: { "content-type": "application/json", origin: baseUrl },
    body: JSON.stringify({ email: admin.email, password: admin.password }),
  });
  expect(res.status).toBe(200);
  return (res.headers.get("set-cookie") ?? "").split(";")[0];
}

async function upload(cookie: string, surveyId: string, fields: Record<string, string>, text: string, name: string): Promise<number> {
  const fd = new FormData();
  for (const [k, v] of Object.entries(fields)) fd.append(k, v);
  fd.append("file", new Blob([text], { type: "text/csv" }), name);
  const res = await fetch(`${baseUrl}/api/v1/surveys/${surveyId}/logs`, { method: "POST", headers: { cookie, origin: baseUrl }, body: fd });
  const body = await res.json();
  expect([201, 409], JSON.stringify(body)).toContain(res.status);
  return body.log?.id ?? body.error?.existingLogId;
}

beforeAll(async () => {
  browser = await launchBrowser();
  const db = createDb(inject("database"));
  const surveyId = ((await db("surveys").where({ code: "SDK-26" }).first("id")) as { id: string }).id;
  const cookie = await apiCookie();
  await upload(cookie, surveyId, { kind: "base", baseSiteName: "CSP gate", baseLatitudeDeg: String(BASE_POSITION.latDeg), baseLongitudeDeg: String(BASE_POSITION.lonDeg) }, baseCsv(), "csp-base.csv");
  await upload(cookie, surveyId, { kind: "rover", acceptGoodRows: "true" }, roverCsv({ lines: 2, perLine: 150 }), "csp-rover.csv");
  const run = await fetch(`${baseUrl}/api/v1/surveys/${surveyId}/days/${DAY}/runs`, { method: "POST", headers: { cookie, origin: baseUrl } });
  expect([202, 409]).toContain(run.status);
  for (let i = 0; i < 120; i++) {
    const runs = (await (await fetch(`${baseUrl}/api/v1/surveys/${surveyId}/days/${DAY}/runs`, { headers: { cookie } })).json()).runs as { status: string }[];
    if (runs.every((r) => r.status !== "queued" && r.status !== "running")) break;
    await new Promise((r) => setTimeout(r, 250));
  }
  const logRow = (await db("field_logs").where({ survey_id: surveyId }).orderBy("id", "desc").first("id")) as { id: number };
  const latestMail = async () => (await db("captured_mail").orderBy("id", "desc").first("id")) as { id: number } | undefined;
  let mail = await latestMail();
  if (!mail) {
    const context = await newContext(browser, baseUrl);
    const page = await context.newPage();
    await page.goto("/forgot-password");
    await page.getByLabel("E-mail").fill(admin.email);
    await page.getByRole("button").first().click();
    await page.waitForTimeout(1000);
    await context.close();
    mail = await latestMail();
  }
  await db.destroy();
  params = { surveyId, date: DAY, logId: String(logRow.id), mailId: String(mail?.id ?? 1), token: "no-such-token-0000000000000000" };
});

afterAll(async () => {
  await browser?.close();
});

type Visit = { violations: string[]; status: number; csp: string; nosniff: string | null };

async function visit(page: Page, url: string): Promise<Visit> {
  const violations: string[] = [];
  const onConsole = (msg: { text(): string }) => {
    if (/content.security.policy|refused to (load|execute|apply)/i.test(msg.text())) violations.push(`console: ${msg.text()}`);
  };
  const onError = (err: Error) => violations.push(`pageerror: ${err.message}`);
  page.on("console", onConsole);
  page.on("pageerror", onError);
  const res = await page.goto(url, { waitUntil: "load" });
  await page.waitForLoadState("networkidle").catch(() => undefined);
  const events = await page.evaluate(() => (window as unknown as { __csp?: string[] }).__csp ?? []);
  page.off("console", onConsole);
  page.off("pageerror", onError);
  return {
    violations: [...violations, ...events],
    status: res?.status() ?? 0,
    csp: (await res?.headerValue("content-security-policy")) ?? "",
    nosniff: (await res?.headerValue("x-content-type-options")) ?? null,
  };
}

async function contextWithListener(): Promise<BrowserContext> {
  const context = await newContext(browser, baseUrl);
  await context.addInitScript(() => {
    const w = window as unknown as { __csp: string[] };
    w.__csp = [];
    document.addEventListener("securitypolicyviolation", (e) => w.__csp.push(`violation: ${e.violatedDirective} ${e.blockedURI}`));
  });
  return context;
}

describe("every page passes the Content-Security-Policy", () => {
  it("finds the pages and fills their parameters", () => {
    const pages = pagePaths();
    expect(pages.length).toBeGreaterThanOrEqual(15);
    const unfilled = pages.flatMap((p) => [...p.matchAll(/\[(\w+)\]/g)].map((m) => m[1])).filter((k) => !(k in params));
    expect(unfilled).toEqual([]);
  });

  let report: Record<string, Visit> = {};
  /** zod 4 probes `new Function("")` (caught) unless z.config({ jitless: true }); a strict CSP reports it as an eval violation. */
  const isZodEvalProbe = (v: string) => v === "violation: script-src eval";

  it("signed in as admin (and signed out for the sign-in pages): no violation, policy and nosniff on every page", async () => {
    const signedOut = await contextWithListener();
    const signedIn = await contextWithListener();
    const page = await signedIn.newPage();
    await signIn(page, admin.email, admin.password);
    const outPage = await signedOut.newPage();
    report = {};
    for (const pattern of pagePaths()) {
      const url = pattern.replace(/\[(\w+)\]/g, (_, k: string) => encodeURIComponent(params[k]));
      const isAuthPage = /^\/(sign-in|forgot-password|reset-password|invitations)/.test(pattern);
      report[pattern] = await visit(isAuthPage ? outPage : page, url);
    }
    const bad = Object.entries(report)
      .map(([k, v]) => [k, { ...v, violations: v.violations.filter((x) => !isZodEvalProbe(x)) }] as const)
      .filter(([, v]) => v.violations.length > 0 || v.status >= 500 || !/nonce-/.test(v.csp) || !/frame-ancestors 'none'/.test(v.csp) || v.nosniff !== "nosniff");
    expect(Object.fromEntries(bad)).toEqual({});
    await signedIn.close();
    await signedOut.close();
  });

  // Pages whose forms parse with zod in the browser once reported zod's eval probe; the schema
  // modules now set jitless first (src/lib/zod-jitless.ts).
  it("no page reports zod's eval probe", () => {
    expect(Object.entries(report).filter(([, v]) => v.violations.some(isZodEvalProbe)).map(([k]) => k)).toEqual([]);
  });
});
