/**
 * The day workspace in a real browser, as the demo processor: the demo base and rover logs of
 * BRM-26 on 2026-05-04 are uploaded through the log API in setup (global setup seeds only people
 * and surveys); then the day page shows the drift curve and a line profile, the datum is changed,
 * the correction rerun, the new run appears, and CSV and GeoJSON download. Screenshots at 1280
 * and 375 px widths land in tests/e2e/screenshots/.
 */
import fs from "node:fs";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { DEMO_SIGN_INS } from "../../seeds/demo-users";
import { DEMO_DAYS } from "../../seeds/demo-logs/scenario";
import { generateBaseLog, generateRoverLog } from "../../seeds/demo-logs/generate";
import { loadReferenceModel } from "../../src/lib/reference-model";
import { launchBrowser, newContext, screenshot, signIn } from "./support/browser";

const baseUrl = inject("baseUrl");
const DAY = DEMO_DAYS.find((d) => d.surveyCode === "BRM-26" && d.date === "2026-05-04")!;
const processor = DEMO_SIGN_INS.find((u) => u.email.startsWith("processor@"))!;
const crew = DEMO_SIGN_INS.find((u) => u.email.startsWith("crew@"))!;
const reviewer = DEMO_SIGN_INS.find((u) => u.email.startsWith("reviewer@"))!;
let browser: Browser;
let surveyId: string;

async function apiCookie(): Promise<string> {
  const res = await fetch(`${baseUrl}/api/v1/auth/sign-in`, {
    method: "POST",
    headers: { "content-type": "application/json", origin: baseUrl },
    body: JSON.stringify({ email: processor.email, password: processor.password }),
  });
  expect(res.status).toBe(200);
  return (res.headers.get("set-cookie") ?? "").split(";")[0];
}

async function uploadLog(cookie: string, text: string, fileName: string, fields: Record<string, string>) {
  const fd = new FormData();
  for (const [k, v] of Object.entries(fields)) fd.append(k, v);
  fd.append("file", new Blob([text], { type: "text/csv" }), fileName);
  const res = await fetch(`${baseUrl}/api/v1/surveys/${surveyId}/logs`, { method: "POST", body: fd, headers: { cookie, origin: baseUrl } });
  const body = await res.json();
  expect(res.status, JSON.stringify(body).slice(0, 400)).toBe(201);
}

beforeAll(async () => {
  browser = await launchBrowser();
  const context = await newContext(browser, baseUrl);
  const page = await context.newPage();
  await signIn(page, processor.email, processor.password);
  await page.goto("/surveys");
  const href = await page.getByRole("link", { name: /BRM-26|Brennock/ }).first().getAttribute("href");
  surveyId = href!.split("/")[2];
  await context.close();

  const cookie = await apiCookie();
  const model = loadReferenceModel("igrf");
  const base = generateBaseLog(DAY, model);
  const rover = generateRoverLog(DAY, model);
  await uploadLog(cookie, base.text, base.fileName, {
    kind: "base", instrument: DAY.base.instrument, sensorType: DAY.base.sensor, operator: DAY.base.operator, baseSiteName: DAY.base.site.name,
    baseLatitudeDeg: String(DAY.base.site.latitudeDeg), baseLongitudeDeg: String(DAY.base.site.longitudeDeg), baseHeightM: String(DAY.base.site.heightM),
    timeBasis: base.timeBasis,
  });
  await uploadLog(cookie, rover.text, rover.fileName, { kind: "rover", instrument: DAY.rover.instrument, sensorType: DAY.rover.sensor, operator: DAY.rover.operator, timeBasis: rover.timeBasis });
}, 120_000);

afterAll(async () => {
  await browser?.close();
});

async function waitForRunDone(page: Page, number: number) {
  const item = page.getByTestId(`run-${number}`);
  await item.waitFor({ timeout: 30_000 });
  await item.getByText("Done").waitFor({ timeout: 60_000 });
}

async function chartHasLine(page: Page, testId: string) {
  const path = page.getByTestId(testId).locator("path.recharts-curve").first();
  await path.waitFor({ timeout: 30_000 });
  const d = (await path.getAttribute("d")) ?? "";
  expect(d.length, `${testId} draws a line`).toBeGreaterThan(200);
}

describe("day workspace as a processor", () => {
  it("opens a day, sees the drift curve and a profile, changes the datum, reruns, downloads CSV and GeoJSON", async () => {
    const context = await newContext(browser, baseUrl, 1280);
    const page = await context.newPage();
    await signIn(page, processor.email, processor.password);
    await page.goto(`/surveys/${surveyId}`);
    await page.getByRole("link", { name: /^Days/ }).first().click();
    await page.getByRole("link", { name: DAY.date }).click();
    await page.waitForURL(`**/days/${DAY.date}`);
    await chartHasLine(page, "drift-chart");
    await chartHasLine(page, "profile-chart");

    await page.getByRole("button", { name: "Run the correction" }).click();
    await waitForRunDone(page, 1);
    await page.getByTestId("plan-view").locator(".recharts-scatter-symbol").first().waitFor({ timeout: 30_000 });
    await chartHasLine(page, "profile-chart");
    await screenshot(page, "day-1280-run1");

    await page.getByRole("combobox", { name: "Datum", exact: true }).selectOption("value");
    await page.getByLabel("Datum value (nT)").fill("49500");
    await page.getByRole("button", { name: "Save datum" }).click();
    await page.getByText("Datum saved for the survey").waitFor();
    await page.getByRole("button", { name: "Run again with current settings" }).click();
    await waitForRunDone(page, 2);
    const run2 = page.getByTestId("run-2");
    await expect(run2.innerText()).resolves.toMatch(/fixed 49\s?500\.0 nT/);

    await page.getByLabel(/Compare run 2 with/).selectOption("1");
    const cmp = page.getByTestId("run-comparison");
    await cmp.waitFor();
    expect(await cmp.innerText()).toMatch(/Parameters\s+datum/);

    const [csvDownload] = await Promise.all([page.waitForEvent("download"), run2.getByRole("link", { name: "CSV" }).click()]);
    const csv = fs.readFileSync((await csvDownload.path())!, "utf8");
    expect(csv.startsWith("# Fieldtide corrected readings")).toBe(true);
    expect(csv).toMatch(/# run: 2 by Priya Lantern/);
    expect(csv).toMatch(/# datum: fixed value 49500\.000 nT/);
    const rows = csv.split("\n").filter((l) => l && !l.startsWith("#"));
    expect(rows[0]).toBe("time,lat,lon,height_m,line,raw_nT,base_nT,diurnal_nT,corrected_nT,reference_nT,residual_nT,flags");
    expect(rows.length).toBeGreaterThan(1000);

    const [geoDownload] = await Promise.all([page.waitForEvent("download"), run2.getByRole("link", { name: "GeoJSON" }).click()]);
    const geo = JSON.parse(fs.readFileSync((await geoDownload.path())!, "utf8"));
    expect(geo.type).toBe("FeatureCollection");
    expect(geo.features[0].geometry.type).toBe("Point");
    expect(geo.features[0].geometry.coordinates[0]).toBeCloseTo(DAY.rover.gridOrigin.longitudeDeg, 1);
    await screenshot(page, "day-1280-run2");
    await context.close();
  }, 240_000);

  it("reads at phone width, and the report page prints the caution", async () => {
    const context = await newContext(browser, baseUrl, 375);
    const page = await context.newPage();
    await signIn(page, processor.email, processor.password);
    await page.goto(`/surveys/${surveyId}/days/${DAY.date}`);
    await chartHasLine(page, "drift-chart");
    await chartHasLine(page, "profile-chart");
    await page.getByTestId("plan-view").locator(".recharts-scatter-symbol").first().waitFor({ timeout: 30_000 });
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
    expect(overflow, "no sideways scrolling at 375 px").toBeLessThanOrEqual(1);
    await screenshot(page, "day-375");
    await page.goto(`/surveys/${surveyId}/days/${DAY.date}/report`);
    await chartHasLine(page, "drift-chart");
    expect(await page.locator("main").innerText()).toMatch(/no clearance for digging/);
    await screenshot(page, "day-report-375");
    await context.close();
  }, 120_000);

  it("crew sees the day and its charts but no run button and no downloads; a reviewer of another survey gets not found", async () => {
    const context = await newContext(browser, baseUrl, 1280);
    const page = await context.newPage();
    await signIn(page, crew.email, crew.password);
    await page.goto(`/surveys/${surveyId}/days/${DAY.date}`);
    await chartHasLine(page, "drift-chart");
    await page.getByTestId("run-2").waitFor();
    expect(await page.getByRole("button", { name: /Run (the correction|again)/ }).count()).toBe(0);
    expect(await page.getByRole("link", { name: "CSV" }).count()).toBe(0);
    const direct = await page.request.get(`/api/v1/surveys/${surveyId}/days/${DAY.date}/runs/2/corrected.csv`);
    expect(direct.status()).toBe(403);
    await context.close();

    const other = await newContext(browser, baseUrl, 1280);
    const otherPage = await other.newPage();
    await signIn(otherPage, reviewer.email, reviewer.password); // reviewer is on SDK-26 only
    const res = await otherPage.goto(`/surveys/${surveyId}/days/${DAY.date}`);
    expect(res?.status()).toBe(404);
    const api = await otherPage.request.get(`/api/v1/surveys/${surveyId}/days/${DAY.date}/series?kind=base`);
    expect(api.status()).toBe(404);
    await other.close();
  }, 120_000);
});
